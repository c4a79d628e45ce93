/**
 * Viscosity–temperature relation — ASTM D341-20 (the Walther–Wright equation).
 *
 *   log₁₀ log₁₀ Z = A − B · log₁₀ T,    T = t + 273.15  [K]
 *   Z = ν + 0.7 + exp(−1.47 − 1.84·ν − 0.51·ν²)                                  (D341-20, every ν)
 *   ν = (Z − 0.7) − exp(−0.7487 − 3.295·(Z − 0.7) + 0.6119·(Z − 0.7)² − 0.3193·(Z − 0.7)³)
 *                                                                    (D341-20's published inverse)
 *
 * with ν the kinematic viscosity [mm²/s] and t the temperature [°C]. A straight line on D341's
 * chart: two measured points fix it; three or more are fitted by least squares in (log T, log log Z).
 *
 * Two forms, selectable and named (argument `form`, or `line.form`):
 * - `'d341-20'` (default everywhere in Blendbench): the full Z above, valid from
 *   {@link D341_MIN_KV} = 0.21 mm²/s upward (the lower end of the range D341 states for these
 *   equations — from memory, no copy of the standard at hand). The exponential term is 7.5e-4 mm²/s
 *   at ν = 2 and below 1e-10 from ν = 5 upward, so for gear oils both forms agree to rounding.
 * - `'walther-simple'`: Z = ν + 0.7, inverse ν = Z − 0.7 (older editions' form, adequate for
 *   ν ≥ {@link WALTHER_MIN_KV} = 2.0 mm²/s; refused below that).
 * The published inverse is an approximation of the exact inverse of Z(ν): it returns ν to within
 * 2e-4 mm²/s at 2 mm²/s and to rounding from about 4 mm²/s upward (tests check it with an independent
 * root finder).
 *
 * What is verified and what is not (no copy of D341-20 was at hand): the constants of Z and of the
 * inverse agree with three independent transcriptions — DWSIM (DanWBR/dwsim, petroleum
 * characterisation, `PropertyMethods`), a public MATLAB script citing ASTM D341-09(2015) Annex A1,
 * Eqs. A1.1–A1.3 (so the single-term Z predates the 2020 edition), and a pipeline-toolbox wiki page on
 * D341. The two-point line, ν at T and T at ν reproduce published worked examples on the same line
 * (olezol.com's D341 calculator, Examples 1 and 2; a D341 spreadsheet's A = 9.5259, B = 3.7449), and
 * below 2 mm²/s the single term follows the earlier editions' six-term series (as carried by DWSIM) to
 * 0.15 % in Z from 0.5 to 3 mm²/s — all in the tests. D341-20's own worked example was not available,
 * and the 0.21 mm²/s lower limit stays from memory.
 *
 * Extrapolation beyond the measured points, below the pour point, or for polymer-thickened oils at
 * low temperature is arithmetic, not a prediction (common practice): {@link assessTemperature} flags
 * results outside the fitted temperatures and outside the −20…150 °C band
 * ({@link D341_TRUSTED_BAND_C}, common practice, no source) wherever they are shown.
 *
 * @see ASTM D341-20, Standard Practice for Viscosity–Temperature Equations and Charts for Liquid
 *   Petroleum or Hydrocarbon Products, §§ on the equations and their inverse (the exponential term
 *   of Z and the inverse polynomial as written above). Wright, W. A., "An Improved
 *   Viscosity–Temperature Chart for Hydrocarbons", Journal of Materials 4 (1969) 19–27 (origin of
 *   the correction term).
 */
import { displayWords, type NumberDisplay } from '../words/display';
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

/** The two named forms of the D341 Z function. */
export type D341Form = 'd341-20' | 'walther-simple';

/** Both forms, the default first. */
export const D341_FORMS: readonly D341Form[] = ['d341-20', 'walther-simple'];

/** Display name of each form. */
export const D341_FORM_LABEL: Record<D341Form, string> = {
  'd341-20': 'ASTM D341-20 (Z = ν + 0.7 + exp(−1.47 − 1.84ν − 0.51ν²))',
  'walther-simple': 'Walther simple form (Z = ν + 0.7, ν ≥ 2 mm²/s)',
};

/** Short name of each form, for a result's method column or a chart caption. */
export const D341_FORM_SHORT: Record<D341Form, string> = {
  'd341-20': 'ASTM D341-20',
  'walther-simple': 'ASTM D341 (Z = ν + 0.7)',
};

/** The Z function of each form, in plain text (for "show working"). */
export const D341_Z_EQUATION: Record<D341Form, string> = {
  'd341-20': 'Z = ν + 0.7 + exp(−1.47 − 1.84ν − 0.51ν²)',
  'walther-simple': 'Z = ν + 0.7',
};

/** A D341 line: log₁₀ log₁₀ Z(ν) = A − B·log₁₀(T / K). */
export interface WaltherLine {
  /** Intercept A [dimensionless]. */
  A: number;
  /** Slope B [dimensionless]; positive for every real oil (viscosity falls as T rises). */
  B: number;
  /** The Z form the line was fitted with; absent → 'd341-20'. */
  form?: D341Form;
}

/** Lowest viscosity for the simple form Z = ν + 0.7 [mm²/s]. */
export const WALTHER_MIN_KV = 2.0;

/** Lowest viscosity for the full D341-20 form [mm²/s] (range as recalled, see the module note). */
export const D341_MIN_KV = 0.21;

/** The temperature band within which D341 lines of gear oils are shown without a warning [°C]. */
export const D341_TRUSTED_BAND_C = { min: -20, max: 150 } as const;

/** Offset from °C to kelvin. */
const KELVIN_OFFSET = 273.15;

/** Lowest usable viscosity of a form [mm²/s]. */
export function d341MinKv(form: D341Form = 'd341-20'): number {
  return form === 'walther-simple' ? WALTHER_MIN_KV : D341_MIN_KV;
}

/**
 * The D341 function Z(ν).
 *
 *   D341-20:  Z = ν + 0.7 + exp(−1.47 − 1.84ν − 0.51ν²);   simple:  Z = ν + 0.7
 *
 * No input check (hot path; callers check the range).
 *
 * @param kv - ν [mm²/s]
 * @param form - 'd341-20' (default) or 'walther-simple'
 * @returns Z [mm²/s]
 * @example d341Z(2) // → 2.700754
 * @see ASTM D341-20.
 */
export function d341Z(kv: number, form: D341Form = 'd341-20'): number {
  if (form === 'walther-simple') return kv + 0.7;
  return kv + 0.7 + Math.exp(-1.47 - 1.84 * kv - 0.51 * kv * kv);
}

/**
 * The published inverse of Z, as printed in D341-20:
 *   ν ≈ (Z − 0.7) − exp(−0.7487 − 3.295(Z − 0.7) + 0.6119(Z − 0.7)² − 0.3193(Z − 0.7)³)
 * (simple form: ν = Z − 0.7). An approximation: it returns ν to about 1e-4 relative near
 * 2 mm²/s and to rounding from about 5 mm²/s up. No input check.
 *
 * @param z - Z [mm²/s]
 * @param form - 'd341-20' (default) or 'walther-simple'
 * @returns ν [mm²/s]
 * @example kvFromD341ZPublished(2.700754) // → 2.00017 (the published inverse's own error at 2 mm²/s)
 * @see ASTM D341-20.
 */
export function kvFromD341ZPublished(z: number, form: D341Form = 'd341-20'): number {
  const u = z - 0.7;
  // Above u = 10 the term is below 1e-100 (exp of about −290); skipping it also keeps u³ from
  // overflowing to ∞ − ∞ = NaN for very thick extrapolations.
  if (form === 'walther-simple' || u > 10) return u;
  return u - Math.exp(-0.7487 - 3.295 * u + 0.6119 * u * u - 0.3193 * u * u * u);
}

/**
 * The exact inverse of {@link d341Z}: the ν with Z(ν) = z, found from the published inverse
 * ({@link kvFromD341ZPublished}) by Newton steps on Z(ν) − z = 0, where
 *   dZ/dν = 1 − (1.84 + 1.02ν)·exp(−1.47 − 1.84ν − 0.51ν²).
 * The published form is within about 1e-4 of the root, so two steps reach rounding; the
 * forward and inverse then agree exactly, so a blend of identical stocks returns the stock's own
 * viscosity (the published inverse alone would move it by up to 1e-4 relative below 5 mm²/s).
 * No input check.
 *
 * @param z - Z [mm²/s]
 * @param form - 'd341-20' (default) or 'walther-simple'
 * @returns ν [mm²/s]
 * @see ASTM D341-20 (forward equation and published inverse).
 */
export function kvFromD341Z(z: number, form: D341Form = 'd341-20'): number {
  let kv = kvFromD341ZPublished(z, form);
  if (form === 'walther-simple' || z - 0.7 > 10) return kv;
  for (let step = 0; step < 3; step++) {
    const e = Math.exp(-1.47 - 1.84 * kv - 0.51 * kv * kv);
    const f = kv + 0.7 + e - z;
    const next = kv - f / (1 - (1.84 + 1.02 * kv) * e);
    if (next === kv) break;
    kv = next;
  }
  return kv;
}

/** log₁₀ log₁₀ Z(ν) — the D341 ordinate. No input check. */
export function d341LogLogZ(kv: number, form: D341Form = 'd341-20'): number {
  return Math.log10(Math.log10(d341Z(kv, form)));
}

/** Inverse of {@link d341LogLogZ}: ν = Z⁻¹(10^(10^y)), exact ({@link kvFromD341Z}). No input check. */
export function kvFromD341LogLogZ(y: number, form: D341Form = 'd341-20'): number {
  return kvFromD341Z(Math.pow(10, Math.pow(10, y)), form);
}

function formOf(line: WaltherLine): D341Form {
  return line.form ?? 'd341-20';
}

function assertForm(fn: string, form: unknown): asserts form is D341Form {
  if (form !== 'd341-20' && form !== 'walther-simple') {
    throw new BlendbenchInputError('form', form, `${fn}: form = ${String(form)} is not a D341 form (d341-20, walther-simple)`);
  }
}

function assertWaltherKv(fn: string, field: string, kv: unknown, form: D341Form): asserts kv is number {
  assertViscosity(fn, field, kv);
  const min = d341MinKv(form);
  if (kv < min) {
    throw new ViscosityOutOfRangeError(
      field,
      kv,
      form === 'walther-simple'
        ? `${fn}: ${field} = ${kv} mm²/s is below ${WALTHER_MIN_KV.toFixed(1)} mm²/s, where the ` +
            'simple ASTM D341 form Z = ν + 0.7 needs the D341-20 correction term'
        : `${fn}: ${field} = ${kv} mm²/s is below ${D341_MIN_KV} mm²/s, outside the range of the ASTM D341-20 equations`,
    );
  }
}

function assertLine(fn: string, line: WaltherLine): void {
  assertFinite(fn, 'line.A', line?.A);
  assertFinite(fn, 'line.B', line.B);
  if (line.form !== undefined) assertForm(fn, line.form);
  if (line.B <= 0) {
    throw new ViscosityOrderError(
      'line.B',
      line.B,
      `${fn}: line.B = ${line.B}; the Walther slope B must be positive (viscosity must fall as temperature rises)`,
    );
  }
}

/** Result check: below the form's lowest viscosity the line is outside its stated range. */
function checkResultKv(fn: string, tempC: number, kv: number, form: D341Form): number {
  if (!Number.isFinite(kv)) {
    throw new InvalidNumberError(
      'tempC',
      tempC,
      `${fn}: tempC = ${tempC} °C gives a non-finite viscosity; the temperature is too far from the measured points`,
    );
  }
  const min = d341MinKv(form);
  // Relative slack of 1e-9 so that a line through a measured point at the limit can return it.
  if (kv < min * (1 - 1e-9)) {
    throw new ViscosityOutOfRangeError(
      'tempC',
      tempC,
      `${fn}: at tempC = ${tempC} °C the line gives ${kv} mm²/s, below ${min} mm²/s ` +
        `(outside the range of the ${form === 'walther-simple' ? 'simple ASTM D341 form' : 'ASTM D341-20 equations'})`,
    );
  }
  return kv;
}

/** ν on a line at T [K], by the line's form. */
function kvOnLine(line: WaltherLine, T: number): number {
  return kvFromD341LogLogZ(line.A - line.B * Math.log10(T), formOf(line));
}

/**
 * Where a temperature result stands against the data it came from: outside the measured (fitted)
 * temperatures it is an extrapolation; outside {@link D341_TRUSTED_BAND_C} (−20…150 °C) it is not
 * to be trusted at all for a gear oil (common practice, no source).
 *
 * @param tempC - the temperature a result refers to [°C]
 * @param fitted - the lowest and highest measured temperature of the line [°C] (40 and 100 for a two-point line)
 * @param display - how the note writes temperatures (the user's separator and unit; default ".", °C)
 * @returns flags and a plain-language note (null when inside the fitted range)
 * @example assessTemperature(560, { minC: 40, maxC: 100 }) // → { extrapolated: true, outsideBand: true, note: '…' }
 */
export function assessTemperature(
  tempC: number,
  fitted: { minC: number; maxC: number } = { minC: 40, maxC: 100 },
  display?: NumberDisplay,
): { extrapolated: boolean; outsideBand: boolean; note: string | null } {
  const extrapolated = !(tempC >= fitted.minC && tempC <= fitted.maxC);
  const outsideBand = !(tempC >= D341_TRUSTED_BAND_C.min && tempC <= D341_TRUSTED_BAND_C.max);
  const w = displayWords(display);
  /** A temperature [°C] in the display unit, to one decimal at most; a range "a–b °F" with one unit. */
  const t = (c: number) => w.sayTemp(Math.round(c * 10) / 10);
  const range = (a: number, b: number, sep: string) => `${w.sayTemp(a).replace(` ${w.tempUnit}`, '')}${sep}${t(b)}`;
  let note: string | null = null;
  if (outsideBand) {
    note =
      `${t(tempC)} lies outside ${range(D341_TRUSTED_BAND_C.min, D341_TRUSTED_BAND_C.max, '…')}: ` +
      `an extrapolation of the ASTM D341 line far beyond the measured ${range(fitted.minC, fitted.maxC, '–')}, not a prediction.`;
  } else if (extrapolated) {
    note = `${t(tempC)} is outside the measured ${range(fitted.minC, fitted.maxC, '–')}: extrapolated along the ASTM D341 line.`;
  }
  return { extrapolated, outsideBand, note };
}

/**
 * D341 line through two points (ν40, ν100) — the ASTM D341 two-point form.
 *
 *   B = (log log Z₁ − log log Z₂)/(log T₂ − log T₁),   A = log log Z₁ + B·log T₁
 *
 * @param kv40 - ν₁, kinematic viscosity at 40 °C [mm²/s], ≥ 0.21 (D341-20) or ≥ 2.0 (simple form)
 * @param kv100 - ν₂, kinematic viscosity at 100 °C [mm²/s], in range and below kv40
 * @param form - 'd341-20' (default) or 'walther-simple'
 * @returns the line's constants A and B, and its form
 * @throws InvalidNumberError, NonPositiveViscosityError, ViscosityOrderError (kv100 ≥ kv40),
 *   ViscosityOutOfRangeError (a viscosity below the form's range)
 * @example waltherLine(73.30, 8.86) // → { A: 9.458393, B: 3.680946, form: 'd341-20' } (check value W1)
 * @see ASTM D341-20.
 */
export function waltherLine(kv40: number, kv100: number, form: D341Form = 'd341-20'): WaltherLine {
  const fn = 'waltherLine';
  assertForm(fn, form);
  assertKv40Kv100(fn, kv40, kv100);
  assertWaltherKv(fn, 'kv40', kv40, form);
  assertWaltherKv(fn, 'kv100', kv100, form);
  return twoPointLine(40, kv40, 100, kv100, form);
}

function twoPointLine(t1: number, kv1: number, t2: number, kv2: number, form: D341Form): WaltherLine {
  const x1 = Math.log10(t1 + KELVIN_OFFSET);
  const x2 = Math.log10(t2 + KELVIN_OFFSET);
  const y1 = d341LogLogZ(kv1, form);
  const y2 = d341LogLogZ(kv2, form);
  const B = (y1 - y2) / (x2 - x1);
  const A = y1 + B * x1;
  return { A, B, form };
}

/**
 * D341 line from measured points: exact through two points, least squares in
 * (x = log₁₀T, y = log₁₀log₁₀Z) for three or more (ordinary least squares of y on x:
 * B = −Sxy/Sxx, A = ȳ + B·x̄).
 *
 * Points at the same temperature are allowed when there are three or more (repeat measurements),
 * but at least two distinct temperatures are needed, and at every pair of distinct temperatures the
 * hotter point must have the lower viscosity.
 *
 * @param points - measured points, each `tempC` [°C] and `kv` [mm²/s] (within the form's range)
 * @param form - 'd341-20' (default) or 'walther-simple'
 * @returns the fitted line
 * @throws InvalidNumberError, NonPositiveViscosityError, BelowAbsoluteZeroError,
 *   ViscosityOutOfRangeError (kv below the form's range), ViscosityOrderError (fewer than two
 *   distinct temperatures, or a hotter point not thinner), BlendbenchInputError (fewer than two points)
 * @example fitWalther([{ tempC: 40, kv: 73.3 }, { tempC: 100, kv: 8.86 }]) // → { A: 9.458393, B: 3.680946, form: 'd341-20' }
 * @see ASTM D341-20; least squares on the linearised form: common practice (no source).
 */
export function fitWalther(points: readonly { tempC: number; kv: number }[], form: D341Form = 'd341-20'): WaltherLine {
  const fn = 'fitWalther';
  assertForm(fn, form);
  if (!Array.isArray(points) || points.length < 2) {
    throw new BlendbenchInputError(
      'points',
      points,
      `${fn}: points has ${Array.isArray(points) ? points.length : 'no'} entries; at least two measured points are needed`,
    );
  }
  points.forEach((p, i) => {
    assertAboveAbsoluteZeroC(fn, `points[${i}].tempC`, p.tempC);
    assertWaltherKv(fn, `points[${i}].kv`, p.kv, form);
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
    return twoPointLine(p.tempC, p.kv, q.tempC, q.kv, form);
  }
  const xs = points.map((p) => Math.log10(p.tempC + KELVIN_OFFSET));
  const ys = points.map((p) => d341LogLogZ(p.kv, form));
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
  return { A, B, form };
}

/**
 * Kinematic viscosity at a temperature on a D341 line:  ν = Z⁻¹(10^(10^(A − B·log₁₀T))), with the
 * line's form (D341-20's published inverse, or ν = Z − 0.7 for the simple form).
 *
 * @param line - D341 constants A, B (B > 0) and form
 * @param tempC - t, temperature [°C], above absolute zero
 * @returns ν, kinematic viscosity [mm²/s], within the form's range
 * @throws InvalidNumberError, BelowAbsoluteZeroError, ViscosityOrderError (B ≤ 0),
 *   ViscosityOutOfRangeError (result below the form's range)
 * @example kvAtTemperature(waltherLine(73.30, 8.86), 60) // → 30.0826 (check value W1)
 * @see ASTM D341-20.
 */
export function kvAtTemperature(line: WaltherLine, tempC: number): number {
  const fn = 'kvAtTemperature';
  assertLine(fn, line);
  assertAboveAbsoluteZeroC(fn, 'tempC', tempC);
  return checkResultKv(fn, tempC, kvOnLine(line, tempC + KELVIN_OFFSET), formOf(line));
}

/**
 * Temperature at which a D341 line reaches a given viscosity:  log₁₀T = (A − log₁₀log₁₀Z(ν))/B.
 * The result can lie far outside the measured temperatures: pass it through {@link assessTemperature}
 * (or use {@link temperatureForViscosityAssessed}) before showing it.
 *
 * @param line - D341 constants A, B (B > 0) and form
 * @param kv - ν, kinematic viscosity [mm²/s], within the form's range
 * @returns t, temperature [°C]
 * @throws InvalidNumberError, NonPositiveViscosityError, ViscosityOrderError (B ≤ 0),
 *   ViscosityOutOfRangeError (kv below the form's range)
 * @example temperatureAtKv(waltherLine(73.30, 8.86), 30.0826) // → 60.0
 * @see ASTM D341-20.
 */
export function temperatureAtKv(line: WaltherLine, kv: number): number {
  const fn = 'temperatureAtKv';
  assertLine(fn, line);
  assertWaltherKv(fn, 'kv', kv, formOf(line));
  const logT = (line.A - d341LogLogZ(kv, formOf(line))) / line.B;
  return Math.pow(10, logT) - KELVIN_OFFSET;
}

/**
 * Kinematic viscosity at any temperature from ν40 and ν100, by the ASTM D341 two-point line.
 * At exactly 40 °C and 100 °C the inputs are returned as given.
 *
 * @param kv40 - kinematic viscosity at 40 °C [mm²/s]
 * @param kv100 - kinematic viscosity at 100 °C [mm²/s], below kv40
 * @param tempC - temperature [°C], above absolute zero
 * @param form - 'd341-20' (default) or 'walther-simple'
 * @returns kinematic viscosity at `tempC` [mm²/s]
 * @throws InvalidNumberError, NonPositiveViscosityError, ViscosityOrderError,
 *   ViscosityOutOfRangeError (an input or the result below the form's range), BelowAbsoluteZeroError
 * @example viscosityAtTemperature(220, 19.0, 80) // → 35.60 (check value W2)
 * @see ASTM D341-20.
 */
export function viscosityAtTemperature(kv40: number, kv100: number, tempC: number, form: D341Form = 'd341-20'): number {
  const fn = 'viscosityAtTemperature';
  assertForm(fn, form);
  assertKv40Kv100(fn, kv40, kv100);
  assertWaltherKv(fn, 'kv40', kv40, form);
  assertWaltherKv(fn, 'kv100', kv100, form);
  assertAboveAbsoluteZeroC(fn, 'tempC', tempC);
  if (tempC === 40) return kv40;
  if (tempC === 100) return kv100;
  const line = twoPointLine(40, kv40, 100, kv100, form);
  return checkResultKv(fn, tempC, kvOnLine(line, tempC + KELVIN_OFFSET), form);
}

/**
 * Temperature at which an oil of given ν40 and ν100 has viscosity `kv`, by the ASTM D341
 * two-point line (e.g. the temperature for 2000 mm²/s, or the hottest temperature keeping 10 mm²/s).
 * See {@link temperatureForViscosityAssessed} for the result with its extrapolation flags.
 *
 * @param kv40 - kinematic viscosity at 40 °C [mm²/s]
 * @param kv100 - kinematic viscosity at 100 °C [mm²/s], below kv40
 * @param kv - the viscosity sought [mm²/s]
 * @param form - 'd341-20' (default) or 'walther-simple'
 * @returns temperature [°C]
 * @throws InvalidNumberError, NonPositiveViscosityError, ViscosityOrderError,
 *   ViscosityOutOfRangeError (a viscosity below the form's range)
 * @example temperatureForViscosity(73.30, 8.86, 30.0826) // → 60.0
 * @see ASTM D341-20.
 */
export function temperatureForViscosity(kv40: number, kv100: number, kv: number, form: D341Form = 'd341-20'): number {
  const fn = 'temperatureForViscosity';
  assertForm(fn, form);
  assertKv40Kv100(fn, kv40, kv100);
  assertWaltherKv(fn, 'kv40', kv40, form);
  assertWaltherKv(fn, 'kv100', kv100, form);
  assertWaltherKv(fn, 'kv', kv, form);
  if (kv === kv40) return 40;
  if (kv === kv100) return 100;
  const line = twoPointLine(40, kv40, 100, kv100, form);
  return Math.pow(10, (line.A - d341LogLogZ(kv, form)) / line.B) - KELVIN_OFFSET;
}

/**
 * {@link temperatureForViscosity} with the extrapolation guard: the result is flagged when it lies
 * outside the measured 40–100 °C and when it lies outside the −20…150 °C band.
 *
 * @param kv40 - ν40 [mm²/s]
 * @param kv100 - ν100 [mm²/s], below kv40
 * @param kv - the viscosity sought [mm²/s]
 * @param form - 'd341-20' (default) or 'walther-simple'
 * @returns `tempC` [°C], `extrapolated`, `outsideBand` and a plain-language `note`
 * @throws as {@link temperatureForViscosity}
 * @example temperatureForViscosityAssessed(900, 91.6, 2) // → { tempC: ≈560, extrapolated: true, outsideBand: true, note: '…' }
 */
export function temperatureForViscosityAssessed(
  kv40: number,
  kv100: number,
  kv: number,
  form: D341Form = 'd341-20',
): { tempC: number; extrapolated: boolean; outsideBand: boolean; note: string | null } {
  const tempC = temperatureForViscosity(kv40, kv100, kv, form);
  return { tempC, ...assessTemperature(tempC) };
}

/**
 * ν40 and ν100 from measured points: a point measured at exactly 40 °C (or 100 °C) is used as
 * measured (the mean if repeated), since ASTM D2270 works from measured values; a missing one is read
 * off the {@link fitWalther} line through all points (D341-20 form).
 *
 * @param points - measured points, `tempC` [°C] and `kv` [mm²/s], at least two distinct temperatures
 * @returns ν40 and ν100 [mm²/s]
 * @throws the errors of {@link fitWalther}; ViscosityOutOfRangeError if a value read off the line
 *   falls below the D341-20 range
 * @example kv40kv100FromPoints([{ tempC: 40, kv: 220 }, { tempC: 100, kv: 19 }]) // → { kv40: 220, kv100: 19 }
 * @see ASTM D341-20; ASTM D2270 (computed from measured ν40 and ν100).
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
