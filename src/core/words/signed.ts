/**
 * A change written with its sign, the sign following the value as printed: "+1.53", "−0.96", and
 * "±0.00" for a change that prints as zero at its decimals (a round-off or sub-digit difference is no
 * direction). One rule for the comparison summary, the explorer's comparison table, the line plan's
 * changes and the blend sheet's change from the previous revision. No equation: presentation only.
 */

/**
 * The sign of `x` as printed with `digits` decimals (half away from zero, as the app's printer rounds).
 *
 * @param x - the change, in the unit it is printed in
 * @param digits - decimals printed (≥ 0)
 * @returns −1, 0 (prints as zero) or +1
 * @example printedSign(-0.004, 2) // → 0 ("±0.00")
 */
export function printedSign(x: number, digits: number): -1 | 0 | 1 {
  if (!Number.isFinite(x)) return x > 0 ? 1 : x < 0 ? -1 : 0;
  const f = 10 ** Math.max(0, Math.round(digits));
  return Math.round(Math.abs(x) * f) === 0 ? 0 : x > 0 ? 1 : -1;
}

/**
 * `x` with its printed sign ("+", "−" or "±") before its magnitude as `format` writes it.
 *
 * @param x - the change, in the unit it is printed in
 * @param digits - decimals printed
 * @param format - writes the magnitude |x| with `digits` decimals (the display's separators, a currency)
 * @returns e.g. "+1.53", "−€ 120", "±0.0"
 * @example signedText(-0.96, 2, (v, d) => v.toFixed(d)) // → "−0.96"
 */
export function signedText(x: number, digits: number, format: (magnitude: number, digits: number) => string): string {
  return `${['−', '±', '+'][printedSign(x, digits) + 1]}${format(Math.abs(x), digits)}`;
}
