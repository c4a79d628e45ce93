/**
 * Axis transform for viscosity–temperature charts on ASTM D341 co-ordinates.
 *
 * ASTM D341-20: log log Z = A − B · log T, with Z = ν + 0.7 + exp(−1.47 − 1.84ν − 0.51ν²) [ν in mm²/s]
 * and T the absolute temperature [K]. Plotting x = log10(T) against y = log10(log10(Z(ν))) therefore
 * draws every Newtonian oil as a straight line. The chart works in these transformed co-ordinates and
 * labels its ticks back in °C and mm²/s at round values.
 *
 * Presentation only: every co-ordinate and every line comes from the core's D341 functions
 * (`src/core/viscosity/viscosity-temperature.ts`: the full Z, its published inverse and the fit), so the
 * chart draws exactly the lines the calculations use. Each function takes the D341 form of the
 * Settings (default 'd341-20'; 'walther-simple' = Z = ν + 0.7), so axes and lines use the same Z.
 */
import {
  assessTemperature,
  d341LogLogZ,
  fitWalther,
  kvFromD341LogLogZ,
  D341_TRUSTED_BAND_C,
  type D341Form,
} from '../../core/viscosity/viscosity-temperature';

const KELVIN_OFFSET = 273.15;

/** The −20…150 °C band outside which a D341 line is not to be trusted for a gear oil (core). */
export const TRUSTED_BAND_C = D341_TRUSTED_BAND_C;

/** x co-ordinate: log10 of the absolute temperature. @param tempC temperature [°C] (> −273.15). */
export function d341X(tempC: number): number {
  return Math.log10(tempC + KELVIN_OFFSET);
}

/** Inverse of {@link d341X}: temperature [°C] for an x co-ordinate. */
export function d341TempC(x: number): number {
  return 10 ** x - KELVIN_OFFSET;
}

/**
 * y co-ordinate: log10(log10(Z(ν))) with the form's Z (core).
 * @param kv kinematic viscosity [mm²/s] (≥ 0.21 for D341-20, ≥ 2 for the simple form)
 * @param form D341 form; default 'd341-20'
 */
export function d341Y(kv: number, form: D341Form = 'd341-20'): number {
  return d341LogLogZ(kv, form);
}

/** Inverse of {@link d341Y}: kinematic viscosity [mm²/s] by the form's inverse (core). */
export function d341Kv(y: number, form: D341Form = 'd341-20'): number {
  return kvFromD341LogLogZ(y, form);
}

/**
 * The straight line of an oil through two measured points in D341 co-ordinates, y = a − b·x: the
 * core's D341 fit in the given form (a = A, b = B; default 'd341-20').
 *
 * @throws the core's input errors (e.g. equal temperatures, a hotter point not thinner)
 */
export function d341LineFromPoints(
  p1: { tempC: number; kv: number },
  p2: { tempC: number; kv: number },
  form: D341Form = 'd341-20',
): { a: number; b: number } {
  const { A, B } = fitWalther([p1, p2], form);
  return { a: A, b: B };
}

/** How a stretch of an oil's line is drawn: between its measured points, extrapolated, or below its pour point. */
export type D341SegmentKind = 'measured' | 'extrapolated' | 'below-pour';

/** Stroke of a stretch of line by its kind (on top of the role's colour and width); live and static lines share it. */
export const D341_SEGMENT_STYLE: Record<D341SegmentKind, { opacity: number; dash?: string }> = {
  measured: { opacity: 1 },
  extrapolated: { opacity: 0.5 },
  'below-pour': { opacity: 0.55, dash: '1 4' },
};

/** One stretch of a line over [fromC, toC] °C. */
export interface D341Segment {
  kind: D341SegmentKind;
  fromC: number;
  toC: number;
}

/**
 * Splits the chart's temperature range [loC, hiC] into the stretches of one oil's line: measured
 * (inside the temperatures its line was fitted on), extrapolated (outside them, along the D341 line),
 * and below the pour point (where the line means nothing — the oil does not flow as a Newtonian liquid).
 * Segments are in ascending temperature and cover [loC, hiC] without gaps.
 *
 * @param loC - lower end of the chart [°C]
 * @param hiC - upper end of the chart [°C]
 * @param fitted - the lowest and highest measured temperature [°C] (40 and 100 for ν40/ν100)
 * @param pourPointC - the oil's pour point [°C], or null when unknown
 */
export function d341Segments(
  loC: number,
  hiC: number,
  fitted: { minC: number; maxC: number } = { minC: 40, maxC: 100 },
  pourPointC: number | null = null,
): D341Segment[] {
  const cuts = [loC, hiC, fitted.minC, fitted.maxC];
  if (pourPointC !== null && Number.isFinite(pourPointC)) cuts.push(pourPointC);
  const xs = [...new Set(cuts.filter((t) => t >= loC && t <= hiC))].sort((a, b) => a - b);
  const out: D341Segment[] = [];
  for (let i = 1; i < xs.length; i++) {
    const fromC = xs[i - 1]!;
    const toC = xs[i]!;
    const mid = (fromC + toC) / 2;
    const kind: D341SegmentKind =
      pourPointC !== null && Number.isFinite(pourPointC) && mid < pourPointC
        ? 'below-pour'
        : assessTemperature(mid, fitted).extrapolated
          ? 'extrapolated'
          : 'measured';
    const last = out[out.length - 1];
    if (last && last.kind === kind) last.toC = toC;
    else out.push({ kind, fromC, toC });
  }
  return out;
}

/**
 * The temperatures an oil's line was fitted on: the lowest and highest of its measured points [°C]
 * (at least 40–100 °C, the two points a chart line is drawn through).
 */
export function fittedRangeOf(points: readonly { tempC: number }[]): { minC: number; maxC: number } {
  const ts = points.map((p) => p.tempC).filter((t) => Number.isFinite(t));
  return { minC: Math.min(40, ...ts), maxC: Math.max(100, ...ts) };
}

/**
 * A temperature read off the chart with its flag, in words: extrapolated beyond the measured range,
 * or outside the −20…150 °C band (core `assessTemperature`); '' when neither.
 *
 * @param tempC - the temperature [°C]
 * @param formatTemp - writes a temperature in the user's unit (default "−20 °C")
 * @param fitted - the measured range [°C], default 40–100
 */
export function temperatureFlag(
  tempC: number,
  formatTemp: (c: number) => string = (c) => `${c} °C`,
  fitted: { minC: number; maxC: number } = { minC: 40, maxC: 100 },
): string {
  const a = assessTemperature(tempC, fitted);
  if (a.outsideBand) return `outside ${formatTemp(TRUSTED_BAND_C.min)}…${formatTemp(TRUSTED_BAND_C.max)}: not to be trusted`;
  if (a.extrapolated) return 'extrapolated';
  return '';
}

/**
 * Round viscosity values for tick labels [mm²/s], in order of preference: decades first, then
 * 5× and 2× values, then 3 and 20/30 near the thin end.
 */
export const KV_TICK_CANDIDATES: readonly number[] = (() => {
  const decades: number[] = [];
  for (let d = 10; d <= 1e6; d *= 10) decades.push(d);
  return [...decades, 5, ...decades.slice(0, -1).map((d) => 5 * d), 2, ...decades.slice(0, -1).map((d) => 2 * d), 3, 30];
})();

/** Round temperatures for tick labels [°C], in order of preference (40 and 100 °C first). */
export const TEMP_TICK_CANDIDATES: readonly number[] = [
  40, 100, 0, -20, 20, 60, 80, 120, 150, -40, 200, -10, 10, 30, 50, 70, 90, 110, -30, 130, 140, -50, 175,
];

/**
 * Picks ticks from `candidates` (listed in order of preference) that fall inside [lo, hi] (data
 * units) and lie at least `minGap` from every tick already taken once transformed; returns them
 * in ascending order.
 */
export function pickTicks(
  candidates: readonly number[],
  lo: number,
  hi: number,
  transform: (v: number) => number,
  minGap: number,
): number[] {
  const taken: { v: number; t: number }[] = [];
  for (const v of candidates) {
    if (v < lo || v > hi) continue;
    const t = transform(v);
    if (taken.every((o) => Math.abs(o.t - t) >= minGap)) taken.push({ v, t });
  }
  return taken.sort((a, b) => a.v - b.v).map((o) => o.v);
}

/**
 * Round viscosity ticks for a D341 axis, evenly chosen. The axis is the data range rounded out to
 * the 1–2–5 series (so it stays tight); the ticks are the finest of the series 1–2–5, 1–5, 1 per
 * decade and 1 per two decades whose neighbouring ticks lie at least `minGap` apart once transformed.
 *
 * @param lo - lowest viscosity to show [mm²/s] (> 0)
 * @param hi - highest viscosity to show [mm²/s]
 * @param transform - data → axis co-ordinate (d341Y)
 * @param minGap - least distance between ticks [axis units] for the axis range (in axis units)
 * @returns the rounded-out range [mm²/s] and its ticks, ascending
 */
export function kvAxis(
  lo: number,
  hi: number,
  transform: (v: number) => number,
  minGap: (range: readonly [number, number]) => number,
): { range: [number, number]; ticks: number[] } {
  const seriesValues = (mults: readonly number[], every: number): number[] => {
    const values: number[] = [];
    for (let e = -1; e <= 7; e++) {
      if (e % every !== 0) continue;
      for (const m of mults) values.push(Number((m * 10 ** e).toPrecision(6)));
    }
    return values;
  };
  const fine = seriesValues([1, 2, 5], 1);
  const below = fine.filter((v) => v <= lo * (1 + 1e-9));
  const above = fine.filter((v) => v >= hi * (1 - 1e-9));
  const range: [number, number] = [below.length ? Math.max(...below) : fine[0]!, above.length ? Math.min(...above) : fine[fine.length - 1]!];
  const gap = minGap([transform(range[0]), transform(range[1])]);
  let ticks: number[] = [];
  for (const [mults, every] of [
    [[1, 2, 5], 1],
    [[1, 5], 1],
    [[1], 1],
    [[1], 2],
  ] as const) {
    ticks = seriesValues(mults, every).filter((v) => v >= range[0] && v <= range[1]);
    if (ticks.every((v, i) => i === 0 || transform(v) - transform(ticks[i - 1]!) >= gap)) break;
  }
  return { range, ticks };
}

/**
 * Round, evenly spaced temperature ticks in the user's unit for a D341 axis: multiples of the
 * smallest step of 5, 10, 20, 25, 50 or 100 degrees whose neighbouring ticks lie at least `minGap`
 * apart once transformed (on the log-absolute scale the hot end is the tightest).
 *
 * @param loC - lowest temperature shown [°C]
 * @param hiC - highest temperature shown [°C]
 * @param toUser - °C → the user's unit; `toC` its inverse
 * @param transform - °C → axis co-ordinate (d341X)
 * @param minGap - least distance between ticks [axis units]
 * @returns the ticks in °C (at round values of the user's unit), ascending
 */
export function temperatureTicks(
  loC: number,
  hiC: number,
  toUser: (c: number) => number,
  toC: (u: number) => number,
  transform: (c: number) => number,
  minGap: number,
): number[] {
  const lo = toUser(loC);
  const hi = toUser(hiC);
  let ticks: number[] = [];
  for (const step of [5, 10, 20, 25, 50, 100]) {
    ticks = [];
    for (let u = Math.ceil(lo / step - 1e-9) * step; u <= hi + 1e-9; u += step) ticks.push(toC(u));
    if (ticks.every((t, i) => i === 0 || transform(t) - transform(ticks[i - 1]!) >= minGap)) return ticks;
  }
  return ticks;
}

/**
 * Formats a viscosity tick label [mm²/s]: whole numbers from 10 up, one decimal below; `num`
 * writes the number (the user's separators); by default digits grouped by a space (20 000).
 */
export function formatKvTick(kv: number, num?: (v: number, decimals: number) => string): string {
  const decimals = kv >= 10 || Number.isInteger(kv) ? 0 : 1;
  if (num) return num(kv, decimals);
  const text = kv.toFixed(decimals);
  return kv >= 10000 ? text.replace(/\B(?=(\d{3})+(?!\d))/g, ' ') : text;
}
