// The sign of a printed change follows the value as printed (s25): a change that prints as zero has none.
// Values are arithmetic on invented numbers (common practice (no source)).
import { describe, expect, it } from 'vitest';
import { printedSign, signedText } from '../../../src/core/words/signed';

const fixed = (v: number, d: number) => v.toFixed(d);

describe('signedText / printedSign', () => {
  it('writes the sign of the printed value', () => {
    expect(signedText(1.534, 2, fixed)).toBe('+1.53');
    expect(signedText(-0.96, 2, fixed)).toBe('−0.96');
    expect(signedText(0, 2, fixed)).toBe('±0.00');
  });
  it('a change that prints as zero has no direction', () => {
    expect(signedText(-0.004, 2, fixed)).toBe('±0.00');
    expect(signedText(0.04, 1, fixed)).toBe('±0.0');
    expect(printedSign(-1e-12, 3)).toBe(0);
    expect(printedSign(0.005, 2)).toBe(1); // half away from zero: prints 0.01
    expect(printedSign(-0.005, 2)).toBe(-1);
    expect(printedSign(-0.4, 0)).toBe(0);
    expect(printedSign(-0.5, 0)).toBe(-1);
  });
});
