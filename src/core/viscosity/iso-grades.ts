/**
 * ISO viscosity grades — ISO 3448 (VG 2 to VG 1500) and ASTM D2422 (adds VG 2200 and VG 3200).
 *
 * Each grade is a band of kinematic viscosity at 40 °C: mid-point ±10 %, limits inclusive.
 * The limits are kept as the tabulated exact decimals: computing them as `mid × 0.9` in binary
 * floating point puts some edges (e.g. 4.14 for VG 5, 1.98 for VG 2) just outside their grade.
 */
import { BlendbenchInputError, assertViscosity, assertFinite } from '../errors';

/** One ISO viscosity grade: mid-point and inclusive limits of ν40 [mm²/s]. */
export interface IsoGrade {
  /** Grade number, e.g. 320 for ISO VG 320. */
  grade: number;
  /** Mid-point kinematic viscosity at 40 °C [mm²/s]. */
  mid: number;
  /** Minimum ν40 [mm²/s], inclusive. */
  min: number;
  /** Maximum ν40 [mm²/s], inclusive. */
  max: number;
  /** The standard that tabulates the grade. */
  source: 'ISO 3448' | 'ASTM D2422';
}

const iso = (grade: number, mid: number, min: number, max: number): IsoGrade =>
  Object.freeze({ grade, mid, min, max, source: 'ISO 3448' as const });
const astm = (grade: number, mid: number, min: number, max: number): IsoGrade =>
  Object.freeze({ grade, mid, min, max, source: 'ASTM D2422' as const });

/**
 * All grades in ascending order, limits as tabulated (ISO 3448:1992 Table 1; ASTM D2422 Table 1
 * for VG 2200 and 3200).
 */
export const ISO_GRADES: readonly IsoGrade[] = Object.freeze([
  iso(2, 2.2, 1.98, 2.42),
  iso(3, 3.2, 2.88, 3.52),
  iso(5, 4.6, 4.14, 5.06),
  iso(7, 6.8, 6.12, 7.48),
  iso(10, 10, 9.0, 11.0),
  iso(15, 15, 13.5, 16.5),
  iso(22, 22, 19.8, 24.2),
  iso(32, 32, 28.8, 35.2),
  iso(46, 46, 41.4, 50.6),
  iso(68, 68, 61.2, 74.8),
  iso(100, 100, 90.0, 110),
  iso(150, 150, 135, 165),
  iso(220, 220, 198, 242),
  iso(320, 320, 288, 352),
  iso(460, 460, 414, 506),
  iso(680, 680, 612, 748),
  iso(1000, 1000, 900, 1100),
  iso(1500, 1500, 1350, 1650),
  astm(2200, 2200, 1980, 2420),
  astm(3200, 3200, 2880, 3520),
]);

/** The grade numbers, ascending. */
export const ISO_GRADE_NUMBERS: readonly number[] = Object.freeze(ISO_GRADES.map((g) => g.grade));

/**
 * The ISO viscosity grade whose band holds a ν40, or null when ν40 lies between bands (or outside
 * VG 2 … VG 3200).
 *
 * @param kv40 - kinematic viscosity at 40 °C [mm²/s]
 * @returns the grade number (2, 3, 5, 7, 10 … 1500, 2200, 3200), or null
 * @throws InvalidNumberError, NonPositiveViscosityError
 * @example isoViscosityGrade(215) // → 220
 * @example isoViscosityGrade(180) // → null (between VG 150 and VG 220)
 * @see ISO 3448 Table 1; ASTM D2422 Table 1.
 */
export function isoViscosityGrade(kv40: number): number | null {
  assertViscosity('isoViscosityGrade', 'kv40', kv40);
  const g = ISO_GRADES.find((b) => kv40 >= b.min && kv40 <= b.max);
  return g ? g.grade : null;
}

/**
 * The band of a grade.
 *
 * @param grade - grade number, e.g. 320
 * @returns the grade's mid-point and inclusive limits
 * @throws InvalidNumberError; BlendbenchInputError for a number that is not a tabulated grade
 * @example gradeBand(320) // → { grade: 320, mid: 320, min: 288, max: 352, source: 'ISO 3448' }
 * @see ISO 3448 Table 1; ASTM D2422 Table 1.
 */
export function gradeBand(grade: number): IsoGrade {
  assertFinite('gradeBand', 'grade', grade);
  const g = ISO_GRADES.find((b) => b.grade === grade);
  if (!g) {
    throw new BlendbenchInputError(
      'grade',
      grade,
      `gradeBand: grade = ${grade} is not an ISO viscosity grade (${ISO_GRADE_NUMBERS.join(', ')})`,
    );
  }
  return g;
}

/**
 * Whether ν40 lies inside a grade's band, limits inclusive.
 *
 * @param kv40 - kinematic viscosity at 40 °C [mm²/s]
 * @param grade - grade number
 * @returns true if min ≤ ν40 ≤ max
 * @throws InvalidNumberError, NonPositiveViscosityError, BlendbenchInputError (unknown grade)
 * @example isInGrade(198.0, 220) // → true;  isInGrade(197.9, 220) // → false
 * @see ISO 3448.
 */
export function isInGrade(kv40: number, grade: number): boolean {
  assertViscosity('isInGrade', 'kv40', kv40);
  const b = gradeBand(grade);
  return kv40 >= b.min && kv40 <= b.max;
}

/**
 * Deviation of ν40 from a grade's mid-point:  100·(ν40 − mid)/mid. Inside the band it lies within
 * ±10 %.
 *
 * @param kv40 - kinematic viscosity at 40 °C [mm²/s]
 * @param grade - grade number
 * @returns deviation [% of mid-point], negative when thinner than the mid-point
 * @throws InvalidNumberError, NonPositiveViscosityError, BlendbenchInputError (unknown grade)
 * @example deviationFromMidPct(336, 320) // → 5
 */
export function deviationFromMidPct(kv40: number, grade: number): number {
  assertViscosity('deviationFromMidPct', 'kv40', kv40);
  const b = gradeBand(grade);
  return (100 * (kv40 - b.mid)) / b.mid;
}

/**
 * The grade nearest to a ν40: the grade whose band holds it, else the grade whose mid-point is
 * nearest on a logarithmic scale (smallest |ln(ν40/mid)|, as grades are spaced geometrically).
 *
 * @param kv40 - kinematic viscosity at 40 °C [mm²/s]
 * @returns the nearest grade
 * @throws InvalidNumberError, NonPositiveViscosityError
 * @example nearestGrade(180).grade // → 150 (|ln(180/150)| < |ln(180/220)|)
 */
export function nearestGrade(kv40: number): IsoGrade {
  assertViscosity('nearestGrade', 'kv40', kv40);
  const inBand = ISO_GRADES.find((b) => kv40 >= b.min && kv40 <= b.max);
  if (inBand) return inBand;
  let best = ISO_GRADES[0]!;
  for (const g of ISO_GRADES) {
    if (Math.abs(Math.log(kv40 / g.mid)) < Math.abs(Math.log(kv40 / best.mid))) best = g;
  }
  return best;
}

/**
 * Where a ν40 lies among the grades: inside a grade's band, between two neighbouring bands, above
 * the top band (VG 3200, 2880–3520 mm²/s) or below the bottom band (VG 2, 1.98–2.42 mm²/s).
 * Used to word a grade honestly: a stock of 5000 mm²/s is "above VG 3200", not "near 3200".
 *
 * @param kv40 - kinematic viscosity at 40 °C [mm²/s], > 0
 * @returns `{ kind: 'in', grade }`, `{ kind: 'between', lower, upper }`, `{ kind: 'above', grade }`
 *   or `{ kind: 'below', grade }` (grade numbers)
 * @throws InvalidNumberError, NonPositiveViscosityError
 * @example gradePosition(180) // → { kind: 'between', lower: 150, upper: 220 }
 * @example gradePosition(5000) // → { kind: 'above', grade: 3200 }
 * @see ISO 3448 Table 1; ASTM D2422 Table 1.
 */
export function gradePosition(
  kv40: number,
):
  | { kind: 'in'; grade: number }
  | { kind: 'between'; lower: number; upper: number }
  | { kind: 'above'; grade: number }
  | { kind: 'below'; grade: number } {
  assertViscosity('gradePosition', 'kv40', kv40);
  const first = ISO_GRADES[0]!;
  const last = ISO_GRADES[ISO_GRADES.length - 1]!;
  if (kv40 < first.min) return { kind: 'below', grade: first.grade };
  if (kv40 > last.max) return { kind: 'above', grade: last.grade };
  const inBand = ISO_GRADES.find((b) => kv40 >= b.min && kv40 <= b.max);
  if (inBand) return { kind: 'in', grade: inBand.grade };
  const upperIdx = ISO_GRADES.findIndex((b) => b.min > kv40);
  return { kind: 'between', lower: ISO_GRADES[upperIdx - 1]!.grade, upper: ISO_GRADES[upperIdx]!.grade };
}
