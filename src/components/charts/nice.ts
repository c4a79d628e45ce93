/** Round axis ranges and ticks (1–2–5 steps) for the linear axes of the charts. */

/** A 1–2–5 step giving about `n` intervals over `span` (> 0). */
export function niceStep(span: number, n = 5): number {
  const raw = Math.abs(span) / n || 1;
  const p = 10 ** Math.floor(Math.log10(raw));
  const m = raw / p;
  return (m <= 1 ? 1 : m <= 2 ? 2 : m <= 5 ? 5 : 10) * p;
}

/** The range [lo, hi] padded by `pad` of its span and rounded out to round steps. */
export function niceDomain(lo: number, hi: number, pad = 0.04): [number, number] {
  const span = hi - lo || Math.abs(hi) * 0.1 || 1;
  const step = niceStep(span * (1 + 2 * pad));
  return [Math.floor((lo - span * pad) / step) * step, Math.ceil((hi + span * pad) / step) * step];
}

/** Round ticks covering a domain. */
export function niceTicks([lo, hi]: readonly [number, number], n = 5): number[] {
  const step = niceStep(hi - lo, n);
  const out: number[] = [];
  for (let v = Math.ceil(lo / step - 1e-9) * step; v <= hi + step * 1e-9; v += step) out.push(Number(v.toFixed(10)));
  return out;
}

/** Decimals needed to label the ticks of a domain. */
export function tickDecimals([lo, hi]: readonly [number, number], n = 5): number {
  return Math.max(0, -Math.floor(Math.log10(niceStep(hi - lo, n)) + 1e-9));
}
