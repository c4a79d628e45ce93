import { describe, expect, it } from 'vitest';
import { BlendbenchInputError, InvalidNumberError, NonPositiveViscosityError } from '../../../src/core/errors';
import {
  ISO_GRADES,
  deviationFromMidPct,
  gradeBand,
  isInGrade,
  isoViscosityGrade,
  nearestGrade,
  gradePosition,
} from '../../../src/core/viscosity/iso-grades';
import { expectClose } from '../../helpers/tolerance';

describe('ISO 3448 / ASTM D2422 grades', () => {
  it('G1: VG 220 edges are inclusive', () => {
    // standard, ISO 3448 table (tests/reference/check-values.md G1)
    expect(isInGrade(198.0, 220)).toBe(true);
    expect(isInGrade(197.9, 220)).toBe(false);
    expect(isInGrade(242.0, 220)).toBe(true);
    expect(isInGrade(242.1, 220)).toBe(false);
    expect(isoViscosityGrade(198.0)).toBe(220);
    expect(isoViscosityGrade(197.9)).toBeNull();
    expect(isoViscosityGrade(242.0)).toBe(220);
    expect(isoViscosityGrade(242.1)).toBeNull();
  });

  it('G2: VG 320 edges 288.0 and 352.0 are in', () => {
    // standard, ISO 3448 table (tests/reference/check-values.md G2)
    expect(isInGrade(288.0, 320)).toBe(true);
    expect(isInGrade(352.0, 320)).toBe(true);
    expect(isoViscosityGrade(288.0)).toBe(320);
    expect(isoViscosityGrade(352.0)).toBe(320);
  });

  it('lists VG 2 … 1500 (ISO 3448) and 2200, 3200 (ASTM D2422) with mid-points', () => {
    // standard, ISO 3448 table and ASTM D2422 (tests/reference/check-values.md §4)
    expect(ISO_GRADES.map((g) => g.grade)).toEqual([
      2, 3, 5, 7, 10, 15, 22, 32, 46, 68, 100, 150, 220, 320, 460, 680, 1000, 1500, 2200, 3200,
    ]);
    expect(ISO_GRADES.slice(0, 4).map((g) => g.mid)).toEqual([2.2, 3.2, 4.6, 6.8]);
    for (const g of ISO_GRADES.slice(4)) expect(g.mid).toBe(g.grade);
    expect(gradeBand(2200).source).toBe('ASTM D2422');
    expect(gradeBand(1500).source).toBe('ISO 3448');
  });

  it('tabulated limits are mid ±10 % and every edge is inside its own grade', () => {
    // standard: limits are mid-point ±10 %, inclusive, as exact decimals (check-values.md §4)
    for (const g of ISO_GRADES) {
      expectClose(g.min, g.mid * 0.9, 1e-9);
      expectClose(g.max, g.mid * 1.1, 1e-9);
      expect(isoViscosityGrade(g.min)).toBe(g.grade);
      expect(isoViscosityGrade(g.max)).toBe(g.grade);
      expect(isoViscosityGrade(g.mid)).toBe(g.grade);
    }
    // the two edges check-values.md §4 names as floating-point traps
    expect(isoViscosityGrade(4.14)).toBe(5);
    expect(isoViscosityGrade(1.98)).toBe(2);
  });

  it('between bands and outside the table is null', () => {
    // standard: the bands do not touch, e.g. VG 150 ends at 165, VG 220 starts at 198 (ISO 3448)
    expect(isoViscosityGrade(180)).toBeNull();
    expect(isoViscosityGrade(1.5)).toBeNull();
    expect(isoViscosityGrade(4000)).toBeNull();
  });

  it('deviation from mid-point and nearest grade', () => {
    // 100·(ν − mid)/mid, definition (common practice, no source)
    expectClose(deviationFromMidPct(336, 320), 5, 1e-12);
    expectClose(deviationFromMidPct(198, 220), -10, 1e-12);
    expect(nearestGrade(300).grade).toBe(320);
    expect(nearestGrade(180).grade).toBe(150); // |ln(180/150)| < |ln(180/220)|
    expect(nearestGrade(5000).grade).toBe(3200);
  });

  it('position among the grades: in a band, between bands, above VG 3200, below VG 2', () => {
    // standard: band limits of ISO 3448 Table 1 and ASTM D2422 Table 1 (VG 2 from 1.98, VG 3200 to 3520)
    expect(gradePosition(215)).toEqual({ kind: 'in', grade: 220 });
    expect(gradePosition(3520)).toEqual({ kind: 'in', grade: 3200 });
    expect(gradePosition(180)).toEqual({ kind: 'between', lower: 150, upper: 220 });
    expect(gradePosition(3521)).toEqual({ kind: 'above', grade: 3200 });
    expect(gradePosition(5000)).toEqual({ kind: 'above', grade: 3200 });
    expect(gradePosition(1.97)).toEqual({ kind: 'below', grade: 2 });
    expect(gradePosition(2.5)).toEqual({ kind: 'between', lower: 2, upper: 3 });
    expect(() => gradePosition(0)).toThrow(NonPositiveViscosityError);
  });

  it('errors', () => {
    expect(() => gradeBand(300)).toThrow(BlendbenchInputError);
    expect(() => gradeBand(300)).toThrow(/gradeBand: grade = 300 is not an ISO viscosity grade/);
    expect(() => isInGrade(200, 225)).toThrow(BlendbenchInputError);
    expect(() => isoViscosityGrade(0)).toThrow(NonPositiveViscosityError);
    expect(() => isoViscosityGrade(Number.NaN)).toThrow(InvalidNumberError);
  });
});
