/**
 * How many decimals a value compared with a limit is printed with, so the printed value reads on the
 * side of its verdict: a miss beyond the limit ("95.96, limit at least 96", not "96.0"), a pass not
 * beyond it ("94.65 ✓ minimum 94.65", not "94.6"). One rule for the constraint reasons, the designer's
 * properties panel and the blend sheet's QC table.
 */

/** The limits a value is judged against, in the unit the value is printed in (°F, %, …); null: none. */
export interface VerdictLimits {
  min: number | null;
  max: number | null;
}

/** The decimals to print with, and whether the value printed with them reads on its verdict's side. */
export interface VerdictDigits {
  digits: number;
  /**
   * False when even at the most decimals the printed value reads on the other side: a value that
   * passes only within a check tolerance (94.641 against a minimum of 94.65). The caller says so,
   * e.g. "(met within the check tolerance)".
   */
  onItsSide: boolean;
}

/**
 * The fewest decimals, from `least` to `most`, at which `value` printed reads on the side of its
 * verdict, judged against the limits in the unit shown.
 *
 * Printed value at d decimals: p(d) = round(value, d), rounded as the app prints (half away from zero,
 * `Number.prototype.toFixed`, which {@link formatFixed} uses), so −5.5 prints "−6" and is judged as −6.
 * Reads outside when p(d) < min or p(d) > max (a value equal to a limit is inside). A `'missed'`
 * verdict wants p(d) outside, a `'met'` verdict wants it inside. Without such d the answer is `most`
 * with `onItsSide: false`. Units: any, as long as value and limits share the unit shown (convert °C to
 * °F, a fraction to %, before calling). Standard: none (display rule; common practice (no source)).
 *
 * @param value - the value as judged (unrounded), in the unit shown
 * @param limits - lower and upper limit in the unit shown, null where none
 * @param verdict - 'met' (passes, perhaps within a check tolerance) or 'missed'
 * @param least - the usual decimals of the value
 * @param most - the most decimals to print (at least `least`)
 * @example verdictDigits(95.96, { min: 96, max: null }, 'missed', 1, 3) // → { digits: 2, onItsSide: true } ("95.96")
 * @example verdictDigits(94.648, { min: 94.65, max: null }, 'met', 1, 3) // → { digits: 2, onItsSide: true } ("94.65")
 */
export function verdictDigits(value: number, limits: VerdictLimits, verdict: 'met' | 'missed', least: number, most: number): VerdictDigits {
  const top = Math.max(least, most);
  const readsOutside = (d: number): boolean => {
    const p = Number(value.toFixed(d));
    return (limits.min !== null && p < limits.min) || (limits.max !== null && p > limits.max);
  };
  const wantOutside = verdict === 'missed';
  for (let d = least; d <= top; d++) {
    if (readsOutside(d) === wantOutside) return { digits: d, onItsSide: true };
  }
  return { digits: top, onItsSide: false };
}
