/**
 * Viscosity–temperature relation — ASTM D341 (Walther equation).
 *
 *   log₁₀ log₁₀ Z = A − B · log₁₀ T,    Z = ν + 0.7,    T = t + 273.15  [K]
 *
 * with ν the kinematic viscosity [mm²/s] and t the temperature [°C]. A straight line on D341's
 * chart: two measured points fix it; three or more are fitted by least squares in (log T, log log Z).
 *
 * Valid range: ν ≥ 2.0 mm²/s ({@link WALTHER_MIN_KV}). ASTM D341 adds small exponential correction
 * terms to Z below about 2 mm²/s; Blendbench does NOT implement them, so it refuses (throws
 * {@link ViscosityOutOfRangeError}) measured points below 2.0 mm²/s and any result that would fall
 * below 2.0 mm²/s. Callers plotting a curve can find the hottest usable temperature with
 * `temperatureAtKv(line, WALTHER_MIN_KV)`.
 *
 * Extrapolation below the pour point, or for polymer-thickened oils at low temperature, is not
 * meaningful (common practice): results there are arithmetic, not predictions.
 *
 * @see ASTM D341, Standard Practice for Viscosity–Temperature Equations and Charts for Liquid
 *   Petroleum or Hydrocarbon Products (the Walther equation and its two-point form).
 */
import {
  ViscosityOrderError,
  ViscosityOutOfRangeError,
  BlendbenchInputError,
  InvalidNumberError,
  assertAboveAbsoluteZeroC,
  assertFinite,
  assertKv40Kv100,
  assertViscosity,
} from '../errors';

/** A Walther line: log₁₀ log₁₀(ν + 0.7) = A − B·log₁₀(T / K). */
export interface WaltherLine {
  /** Intercept A [dimensionless]. */
  A: number;
  /** Slope B [dimensionless]; positive for every real oil (viscosity falls as T rises). */
  B: number;
}

/** Lowest viscosity for which the Z = ν + 0.7 form is used without D341's correction terms [mm²/s]. */
export const WALTHER_MIN_KV = 2.0;

/** Offset from °C to kelvin. */
const KELVIN_OFFSET = 273.15;

/** log₁₀ log₁₀(ν + 0.7). */
function loglogZ(kv: number): number {
  return Math.log10(Math.log10(kv + 0.7));
}

function assertWaltherKv(fn: string, field: string, kv: unknown): asserts kv is number {
  assertViscosity(fn, field, kv);
  if (kv < WALTHER_MIN_KV) {
    throw new ViscosityOutOfRangeError(
      field,
      kv,
      `${fn}: ${field} = ${kv} mm²/s is below ${WALTHER_MIN_KV.toFixed(1)} mm²/s, where the ` +
        'ASTM D341 form Z = ν + 0.7 needs correction terms Blendbench does not implement',
    );
  }
}

function assertLine(fn: string, line: WaltherLine): void {
  assertFinite(fn, 'line.A', line?.A);
  assertFinite(fn, 'line.B', line.B);
  if (line.B <= 0) {
    throw new ViscosityOrderError(
      'line.B',
      line.B,
      `${fn}: line.B = ${line.B}; the Walther slope B must be positive (viscosity must fall as temperature rises)`,
    );
  }
}

/** Result check: below 2.0 mm²/s the uncorrected D341 form is outside its stated range. */
function checkResultKv(fn: string, tempC: number, kv: number): number {
  if (!Number.isFinite(kv)) {
    throw new InvalidNumberError(
      'tempC',
      tempC,
      `${fn}: tempC = ${tempC} °C gives a non-finite viscosity; the temperature is too far from the measured points`,
    );
  }
  // Relative slack of 1e-9 so that a line through a measured 2.0 mm²/s point can return that point.
  if (kv < WALTHER_MIN_KV * (1 - 1e-9)) {
    throw new ViscosityOutOfRangeError(
      'tempC',
      tempC,
      `${fn}: at tempC = ${tempC} °C the line gives ${kv} mm²/s, below ${WALTHER_MIN_KV.toFixed(1)} mm²/s ` +
        '(outside the range of the ASTM D341 form used here)',
    );
  }
  return kv;
}

/**
 * Walther line through two points (ν40, ν100) — ASTM D341 two-point form.
 *
 *   B = (log log Z₁ − log log Z₂)/(log T₂ − log T₁),   A = log log Z₁ + B·log T₁
 *
 * @param kv40 - ν₁, kinematic viscosity at 40 °C [mm²/s], ≥ 2.0
 * @param kv100 - ν₂, kinematic viscosity at 100 °C [mm²/s], ≥ 2.0 and below kv40
 * @returns the line's constants A and B
 * @throws InvalidNumberError, NonPositiveViscosityError, ViscosityOrderError (kv100 ≥ kv40),
 *   ViscosityOutOfRangeError (a viscosity below 2.0 mm²/s)
 * @example waltherLine(73.30, 8.86) // → { A: 9.458393, B: 3.680946 }
 * @see ASTM D341.
 */
export function waltherLine(kv40: number, kv100: number): WaltherLine {
  const fn = 'waltherLine';
  assertKv40Kv100(fn, kv40, kv100);
  assertWaltherKv(fn, 'kv40', kv40);
  assertWaltherKv(fn, 'kv100', kv100);
  return twoPointLine(40, kv40, 100, kv100);
}

function twoPointLine(t1: number, kv1: number, t2: number, kv2: number): WaltherLine {
  const x1 = Math.log10(t1 + KELVIN_OFFSET);
  const x2 = Math.log10(t2 + KELVIN_OFFSET);
  const y1 = loglogZ(kv1);
  const y2 = loglogZ(kv2);
  const B = (y1 - y2) / (x2 - x1);
  const A = y1 + B * x1;
  return { A, B };
}

/**
 * Walther line from measured points: exact through two points, least squares in
 * (x = log₁₀T, y = log₁₀log₁₀Z) for three or more (ordinary least squares of y on x:
 * B = −Sxy/Sxx, A = ȳ + B·x̄).
 *
 * Points at the same temperature are allowed when there are three or more (repeat measurements),
 * but at least two distinct temperatures are needed, and at every pair of distinct temperatures the
 * hotter point must have the lower viscosity.
 *
 * @param points - measured points, each `tempC` [°C] and `kv` [mm²/s] (kv ≥ 2.0)
 * @returns the fitted line
 * @throws InvalidNumberError, NonPositiveViscosityError, BelowAbsoluteZeroError,
 *   ViscosityOutOfRangeError (kv < 2.0), ViscosityOrderError (fewer than two distinct temperatures,
 *   or a hotter point not thinner), BlendbenchInputError (fewer than two points)
 * @example fitWalther([{ tempC: 40, kv: 73.3 }, { tempC: 100, kv: 8.86 }]) // → { A: 9.458393, B: 3.680946 }
 * @see ASTM D341; least squares on the linearised form: common practice (no source).
 */
export function fitWalther(points: readonly { tempC: number; kv: number }[]): WaltherLine {
  const fn = 'fitWalther';
  if (!Array.isArray(points) || points.length < 2) {
    throw new BlendbenchInputError(
      'points',
      points,
      `${fn}: points has ${Array.isArray(points) ? points.length : 'no'} entries; at least two measured points are needed`,
    );
  }
  points.forEach((p, i) => {
    assertAboveAbsoluteZeroC(fn, `points[${i}].tempC`, p.tempC);
    assertWaltherKv(fn, `points[${i}].kv`, p.kv);
  });
  // Order check over every pair of distinct temperatures.
  for (let i = 0; i < points.length; i++) {
    for (let j = 0; j < points.length; j++) {
      const a = points[i]!;
      const b = points[j]!;
      if (a.tempC < b.tempC && a.kv <= b.kv) {
        throw new ViscosityOrderError(
          `points[${j}].kv`,
          b.kv,
          `${fn}: points[${j}] (${b.kv} mm²/s at ${b.tempC} °C) is not thinner than points[${i}] ` +
            `(${a.kv} mm²/s at ${a.tempC} °C); viscosity must fall as temperature rises`,
        );
      }
    }
  }
  const distinct = new Set(points.map((p) => p.tempC));
  if (distinct.size < 2) {
    throw new ViscosityOrderError(
      'points',
      points,
      `${fn}: all points are at ${points[0]!.tempC} °C; at least two distinct temperatures are needed`,
    );
  }
  if (points.length === 2) {
    const [p, q] = points as [{ tempC: number; kv: number }, { tempC: number; kv: number }];
    return twoPointLine(p.tempC, p.kv, q.tempC, q.kv);
  }
  const xs = points.map((p) => Math.log10(p.tempC + KELVIN_OFFSET));
  const ys = points.map((p) => loglogZ(p.kv));
  const n = points.length;
  const xBar = xs.reduce((s, x) => s + x, 0) / n;
  const yBar = ys.reduce((s, y) => s + y, 0) / n;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    const dx = xs[i]! - xBar;
    sxx += dx * dx;
    sxy += dx * (ys[i]! - yBar);
  }
  const B = -sxy / sxx;
  const A = yBar + B * xBar;
  return { A, B };
}

/**
 * Kinematic viscosity at a temperature on a Walther line:  ν = 10^(10^(A − B·log₁₀T)) − 0.7.
 *
 * @param line - Walther constants A, B (B > 0)
 * @param tempC - t, temperature [°C], above absolute zero
 * @returns ν, kinematic viscosity [mm²/s], ≥ 2.0
 * @throws InvalidNumberError, BelowAbsoluteZeroError, ViscosityOrderError (B ≤ 0),
 *   ViscosityOutOfRangeError (result below 2.0 mm²/s)
 * @example kvAtTemperature(waltherLine(73.30, 8.86), 60) // → 30.0826
 * @see ASTM D341.
 */
export function kvAtTemperature(line: WaltherLine, tempC: number): number {
  const fn = 'kvAtTemperature';
  assertLine(fn, line);
  assertAboveAbsoluteZeroC(fn, 'tempC', tempC);
  const T = tempC + KELVIN_OFFSET;
  const kv = Math.pow(10, Math.pow(10, line.A - line.B * Math.log10(T))) - 0.7;
  return checkResultKv(fn, tempC, kv);
}

/**
 * Temperature at which a Walther line reaches a given viscosity:  log₁₀T = (A − log₁₀log₁₀Z)/B.
 *
 * @param line - Walther constants A, B (B > 0)
 * @param kv - ν, kinematic viscosity [mm²/s], ≥ 2.0
 * @returns t, temperature [°C]
 * @throws InvalidNumberError, NonPositiveViscosityError, ViscosityOrderError (B ≤ 0),
 *   ViscosityOutOfRangeError (kv below 2.0 mm²/s)
 * @example temperatureAtKv(waltherLine(73.30, 8.86), 30.0826) // → 60.0
 * @see ASTM D341.
 */
export function temperatureAtKv(line: WaltherLine, kv: number): number {
  const fn = 'temperatureAtKv';
  assertLine(fn, line);
  assertWaltherKv(fn, 'kv', kv);
  const logT = (line.A - loglogZ(kv)) / line.B;
  return Math.pow(10, logT) - KELVIN_OFFSET;
}

/**
 * Kinematic viscosity at any temperature from ν40 and ν100, by the ASTM D341 two-point line.
 * At exactly 40 °C and 100 °C the inputs are returned as given.
 *
 * @param kv40 - kinematic viscosity at 40 °C [mm²/s], ≥ 2.0
 * @param kv100 - kinematic viscosity at 100 °C [mm²/s], ≥ 2.0 and below kv40
 * @param tempC - temperature [°C], above absolute zero
 * @returns kinematic viscosity at `tempC` [mm²/s]
 * @throws InvalidNumberError, NonPositiveViscosityError, ViscosityOrderError,
 *   ViscosityOutOfRangeError (an input or the result below 2.0 mm²/s), BelowAbsoluteZeroError
 * @example viscosityAtTemperature(220, 19.0, 80) // → 35.60
 * @see ASTM D341.
 */
export function viscosityAtTemperature(kv40: number, kv100: number, tempC: number): number {
  const fn = 'viscosityAtTemperature';
  assertKv40Kv100(fn, kv40, kv100);
  assertWaltherKv(fn, 'kv40', kv40);
  assertWaltherKv(fn, 'kv100', kv100);
  assertAboveAbsoluteZeroC(fn, 'tempC', tempC);
  if (tempC === 40) return kv40;
  if (tempC === 100) return kv100;
  const line = twoPointLine(40, kv40, 100, kv100);
  const T = tempC + KELVIN_OFFSET;
  const kv = Math.pow(10, Math.pow(10, line.A - line.B * Math.log10(T))) - 0.7;
  return checkResultKv(fn, tempC, kv);
}

/**
 * Temperature at which an oil of given ν40 and ν100 has viscosity `kv`, by the ASTM D341
 * two-point line (e.g. the temperature for 2000 mm²/s, or the hottest temperature keeping 10 mm²/s).
 *
 * @param kv40 - kinematic viscosity at 40 °C [mm²/s], ≥ 2.0
 * @param kv100 - kinematic viscosity at 100 °C [mm²/s], ≥ 2.0 and below kv40
 * @param kv - the viscosity sought [mm²/s], ≥ 2.0
 * @returns temperature [°C]
 * @throws InvalidNumberError, NonPositiveViscosityError, ViscosityOrderError,
 *   ViscosityOutOfRangeError (a viscosity below 2.0 mm²/s)
 * @example temperatureForViscosity(73.30, 8.86, 30.0826) // → 60.0
 * @see ASTM D341.
 */
export function temperatureForViscosity(kv40: number, kv100: number, kv: number): number {
  const fn = 'temperatureForViscosity';
  assertKv40Kv100(fn, kv40, kv100);
  assertWaltherKv(fn, 'kv40', kv40);
  assertWaltherKv(fn, 'kv100', kv100);
  assertWaltherKv(fn, 'kv', kv);
  if (kv === kv40) return 40;
  if (kv === kv100) return 100;
  const line = twoPointLine(40, kv40, 100, kv100);
  return Math.pow(10, (line.A - loglogZ(kv)) / line.B) - KELVIN_OFFSET;
}

/**
 * ν40 and ν100 from measured points: a point measured at exactly 40 °C (or 100 °C) is used as
 * measured (the mean if repeated), since ASTM D2270 works from measured values; a missing one is read
 * off the {@link fitWalther} line through all points.
 *
 * @param points - measured points, `tempC` [°C] and `kv` [mm²/s], at least two distinct temperatures
 * @returns ν40 and ν100 [mm²/s]
 * @throws the errors of {@link fitWalther}; ViscosityOutOfRangeError if a value read off the line
 *   falls below 2.0 mm²/s
 * @example kv40kv100FromPoints([{ tempC: 40, kv: 220 }, { tempC: 100, kv: 19 }]) // → { kv40: 220, kv100: 19 }
 * @see ASTM D341; ASTM D2270 (computed from measured ν40 and ν100).
 */
export function kv40kv100FromPoints(points: readonly { tempC: number; kv: number }[]): {
  kv40: number;
  kv100: number;
} {
  const line = fitWalther(points);
  const measured = (t: number): number | null => {
    const at = points.filter((p) => p.tempC === t);
    return at.length === 0 ? null : at.reduce((s, p) => s + p.kv, 0) / at.length;
  };
  const kv40 = measured(40) ?? kvAtTemperature(line, 40);
  const kv100 = measured(100) ?? kvAtTemperature(line, 100);
  return { kv40, kv100 };
}
