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

/** Formats a viscosity tick label [mm²/s] compactly: 2, 50, 1000, 20 000, 1e6. */
export function formatKvTick(kv: number): string {
  if (kv >= 1e6) return `${kv / 1e6}e6`;
  if (kv >= 10000) return `${(kv / 1000).toFixed(0)} 000`;
  return String(Math.round(kv * 100) / 100);
}
