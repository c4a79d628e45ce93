/**
 * How numbers are written in text the core composes (reasons, explanations, printed limits): the
 * user's decimal separator, thousands grouping and temperature unit. Plain data, so it crosses a
 * Web Worker. The app's one number formatter (`src/components/format.ts`) writes with
 * {@link formatFixed} too, so a number reads the same in a table and in a sentence.
 */

/** The user's number habits; every field optional (defaults: ".", no grouping, °C). */
export interface NumberDisplay {
  decimalSeparator?: '.' | ',';
  /** Group thousands of numbers with five or more integer digits (narrow no-break space, or "." with ","). */
  thousandsGrouping?: boolean;
  temperatureUnit?: 'C' | 'F';
}

const NARROW_NBSP = '\u202f';

/**
 * `v` with `digits` decimals in the given style: "." or "," as decimal separator, optional grouping
 * of five or more integer digits, a true minus (U+2212), and no sign on a value that rounds to zero.
 *
 * @example formatFixed(-12345.678, 1, { decimalSeparator: ',', thousandsGrouping: true }) // → '−12.345,7'
 */
export function formatFixed(v: number, digits: number, style: NumberDisplay = {}): string {
  const sep = style.decimalSeparator ?? '.';
  const neg = v < 0 || Object.is(v, -0);
  const abs = Math.abs(v).toFixed(digits);
  let [int = '0', frac] = abs.split('.');
  if (style.thousandsGrouping && int.length > 4) {
    int = int.replace(/\B(?=(\d{3})+(?!\d))/g, sep === ',' ? '.' : NARROW_NBSP);
  }
  const body = frac !== undefined ? `${int}${sep}${frac}` : int;
  // Do not print "-0.0": a rounded zero has no sign.
  return neg && /[1-9]/.test(body) ? `−${body}` : body;
}

/** Decimals that show `v` as stored (0–6). */
export function decimalsOf(v: number): number {
  for (let d = 0; d <= 6; d++) if (Math.abs(Number(v.toFixed(d)) - v) < 1e-9 * Math.max(1, Math.abs(v))) return d;
  return 6;
}

/** A number inside a sentence: up to six significant figures, no trailing zeros, no grouping, a true minus. */
export function sayNumber(v: number, style: NumberDisplay = {}): string {
  if (!Number.isFinite(v)) return String(v);
  const r = Number(v.toPrecision(6));
  return formatFixed(r, decimalsOf(r), { decimalSeparator: style.decimalSeparator ?? '.', thousandsGrouping: false });
}

/** The words of a message: numbers, viscosities, shares and temperatures in one style. */
export interface DisplayWords {
  /** A number with `digits` decimals. */
  num: (x: number, digits: number) => string;
  /** A viscosity [mm²/s], about three significant figures ("320", "30.5", "2.47"), without unit. */
  kv: (kv: number) => string;
  /** A number as entered (a limit, a setting): up to six significant figures, no trailing zeros. */
  say: (x: number) => string;
  /** A mass [kg] rounded up to whole kilograms, e.g. "1 196 kg" (grouped in the display style). */
  kg: (m: number) => string;
  /** A fraction 0–1 as per cent, e.g. "40.0 %". */
  pct: (fraction: number, digits?: number) => string;
  /** A temperature given in °C, in the display unit with its symbol, e.g. "−10.0 °C" or "14.0 °F". */
  temp: (tC: number, digits?: number) => string;
  /** A temperature given in °C as entered (a limit): {@link DisplayWords.say} in the display unit, e.g. "−6 °C". */
  sayTemp: (tC: number) => string;
  /** The display unit's symbol, "°C" or "°F". */
  tempUnit: string;
}

/** Message words for a display style (defaults: ".", no grouping, °C). */
export function displayWords(d: NumberDisplay = {}): DisplayWords {
  const num = (x: number, digits: number) => formatFixed(x, digits, d);
  const isF = d.temperatureUnit === 'F';
  const tempUnit = isF ? '°F' : '°C';
  // t_F = 9/5·t_C + 32 (definition of the Fahrenheit scale)
  const toUnit = (tC: number) => (isF ? (tC * 9) / 5 + 32 : tC);
  return {
    num,
    kv: (kv) => num(kv, kv >= 100 ? 0 : kv >= 10 ? 1 : 2),
    say: (x) => sayNumber(x, d),
    kg: (m) => `${num(Math.ceil(m), 0)} kg`,
    pct: (f, digits = 1) => `${num(100 * f, digits)} %`,
    temp: (tC, digits = 1) => `${num(toUnit(tC), digits)} ${tempUnit}`,
    sayTemp: (tC) => `${sayNumber(toUnit(tC), d)} ${tempUnit}`,
    tempUnit,
  };
}
