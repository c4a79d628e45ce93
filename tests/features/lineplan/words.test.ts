// The line plan's quantities in words, in the unit the blender chose (tonnes or kg).
import { describe, expect, it } from 'vitest';
import { makeFormatter } from '../../../src/components/format';
import { DEFAULT_SETTINGS } from '../../../src/state/settings';
import { MARGINAL_STEP_KG, type MarginalValue } from '../../../src/core/lineplan/plan';
import { changeText, limitedText, MARGINAL_STEP_SHOWN_KG, marginalSentence, marginalStep, quantity, quantityNumber } from '../../../src/features/lineplan/words';

const fmt = makeFormatter({ ...DEFAULT_SETTINGS, decimalSeparator: '.', thousandsGrouping: true });
const comma = makeFormatter({ ...DEFAULT_SETTINGS, decimalSeparator: ',', thousandsGrouping: true });
const NB = '\u202f';
// Invented quantities; 1 t = 1000 kg (SI). Roundings are the screen's own choice (design, not a check value).
const m = (over: Partial<MarginalValue>): MarginalValue => ({ id: 'x', code: 'BW-190', supplyKg: 250_000, useKg: 180_500, binding: false, savingPerTonne: 0, ...over });

describe('line-plan quantities in the chosen unit', () => {
  it('writes tonnes with one decimal at any size and kg as whole kilograms, grouped per the number format', () => {
    expect(quantity(fmt, 't', 12_500)).toBe('12.5 t');
    expect(quantity(fmt, 't', 250_000)).toBe('250.0 t');
    // s25 walk: a typed 150.5 t showed as "151" in the results beside the input panel's "1100.0 t" total
    expect(quantity(fmt, 't', 150_500)).toBe('150.5 t');
    expect(quantityNumber(fmt, 't', 1_100_000)).toBe('1100.0');
    expect(quantity(fmt, 'kg', 12_500)).toBe(`12${NB}500 kg`);
    expect(quantity(fmt, 'kg', 250_000.4)).toBe(`250${NB}000 kg`);
    expect(quantityNumber(comma, 'kg', 1_100_000)).toBe('1.100.000');
    expect(quantityNumber(comma, 't', 12_500)).toBe('12,5');
  });

  it('names the limited stocks’ supplies in the unit', () => {
    const code = (id: string) => (id === 'a' ? 'BW-190' : 'BW-160');
    expect(limitedText(['a', 'b'], { a: 250_000 }, code, fmt, 't')).toBe('BW-190 250.0 t; BW-160 with no supply given');
    expect(limitedText(['a', 'b'], { a: 250_000 }, code, fmt, 'kg')).toBe(`BW-190 250${NB}000 kg; BW-160 with no supply given`);
  });

  it('says what one more tonne is worth, in kg as another 1000 kg (the core’s step), never per single kg', () => {
    expect(MARGINAL_STEP_SHOWN_KG).toBe(MARGINAL_STEP_KG);
    const view = (unit: 'kg' | 't') => ({ fmt, unit, period: '2026' });
    expect(marginalStep(fmt, 't').heading).toBe('What one more tonne is worth');
    expect(marginalStep(fmt, 'kg').heading).toBe('What another 1000 kg is worth');
    // savingPerTonne 373 → "about € 370" (two significant figures, aboutMoney)
    expect(marginalSentence(m({ binding: true, savingPerTonne: 373 }), view('t'))).toBe(`One more tonne of BW-190 would save about €${NB}370 over 2026.`);
    expect(marginalSentence(m({ binding: true, savingPerTonne: 373 }), view('kg'))).toBe(`Another 1000 kg of BW-190 would save about €${NB}370 over 2026.`);
    expect(marginalSentence(m({}), view('t'))).toBe('BW-190: the plan needs 180.5 t of the 250.0 t on offer, so one more tonne would save nothing.');
    expect(marginalSentence(m({}), view('kg'))).toBe(
      `BW-190: the plan needs 180${NB}500 kg of the 250${NB}000 kg on offer, so another 1000 kg would save nothing.`,
    );
    expect(marginalSentence(m({ binding: true, savingPerTonne: null }), view('kg'))).toBe('BW-190 is used up; what another 1000 kg is worth could not be worked out.');
    expect(marginalSentence(m({ binding: true, savingPerTonne: 0.1 }), view('kg'))).toBe('BW-190 is used up, but another 1000 kg would save nothing over 2026.');
  });
});

describe('a change that prints as zero has no sign (s25)', () => {
  it('writes ±0 for a round-off change of the line cost, and signs what prints', () => {
    // invented costs; the sign follows the printed value (src/core/words/signed.ts)
    expect(changeText(fmt, -0.3, 3_715_611)).toMatch(/^±.*0 \(±0\.0 %\)$/);
    expect(changeText(fmt, 12_300, 3_715_611)).toMatch(/^\+.*12.300 \(\+0\.3 %\)$/);
    expect(changeText(fmt, -120, 3_715_611)).toMatch(/^−.*120 \(±0\.0 %\)$/);
  });
});
