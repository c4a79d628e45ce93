/**
 * Axis transform for viscosity–temperature charts on ASTM D341 co-ordinates.
 *
 * ASTM D341 (Walther form): log log Z = A − B · log T, with Z = ν + 0.7 [ν in mm²/s] and T the
 * absolute temperature [K]. Plotting x = log10(T) against y = log10(log10(ν + 0.7)) therefore draws
 * every Newtonian oil as a straight line. The chart works in these transformed co-ordinates and
 * labels its ticks back in °C and mm²/s at round values.
 *
 * Presentation only: the core (`src/core/viscosity/viscosity-temperature.ts`) owns the method itself.
 */

const KELVIN_OFFSET = 273.15;
/** The D341 constant added to ν before the double logarithm (adequate for ν ≥ 2 mm²/s). */
const Z_OFFSET = 0.7;

/** x co-ordinate: log10 of the absolute temperature. @param tempC temperature [°C] (> −273.15). */
export function d341X(tempC: number): number {
  return Math.log10(tempC + KELVIN_OFFSET);
}

/** Inverse of {@link d341X}: temperature [°C] for an x co-ordinate. */
export function d341TempC(x: number): number {
  return 10 ** x - KELVIN_OFFSET;
}

/** y co-ordinate: log10(log10(ν + 0.7)). @param kv kinematic viscosity [mm²/s] (> 0.3). */
export function d341Y(kv: number): number {
  return Math.log10(Math.log10(kv + Z_OFFSET));
}

/** Inverse of {@link d341Y}: kinematic viscosity [mm²/s] for a y co-ordinate. */
export function d341Kv(y: number): number {
  return 10 ** 10 ** y - Z_OFFSET;
}

/**
 * The straight line of an oil through two measured points in D341 co-ordinates, y = a − b·x.
 * Equivalent to the two-point Walther fit (B = (y1 − y2)/(x2 − x1), A = y1 + B·x1).
 */
export function d341LineFromPoints(
  p1: { tempC: number; kv: number },
  p2: { tempC: number; kv: number },
): { a: number; b: number } {
  const x1 = d341X(p1.tempC);
  const x2 = d341X(p2.tempC);
  const y1 = d341Y(p1.kv);
  const y2 = d341Y(p2.kv);
  if (x1 === x2) throw new RangeError('d341LineFromPoints: the two points need different temperatures');
  const b = (y1 - y2) / (x2 - x1);
  return { a: y1 + b * x1, b };
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
