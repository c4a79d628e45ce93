import { describe, expect, it } from 'vitest';
import { userMessage } from '../../src/state/messages';
import { demoComponents } from '../../src/state/demo';
import { solveBlend } from '../../src/core/solver/solve-blend';
import { predictBlend } from '../../src/core/formulation/blend-properties';
import { BlendbenchInputError } from '../../src/core/errors';
import { defaultTargets } from '../../src/state/demo';
import { makeFormatter } from '../../src/components/format';
import { DEFAULT_SETTINGS } from '../../src/state/settings';

const lib = demoComponents();
const components = lib;
/** No text meant for a programmer: no function names, field paths or stock ids. */
const INTERNAL = /prepareComponents|predictBlend|viscosityIndex|targets\.|components\[|parts\[|demo-|kv100|kv40|massFraction/;

describe('core errors in the user’s words', () => {
  it('a per-stock minimum above its maximum names the stock by code, in per cent', () => {
    const targets = { ...defaultTargets(320, null, null), bounds: { 'demo-bw-280': { min: 0.4, max: 0.3 } } };
    const r = solveBlend({ components: lib, targets });
    expect(r.status).toBe('invalid-input');
    if (r.status !== 'invalid-input') return;
    expect(r.message).toMatch(/prepareComponents/); // the core's own text, for programmers
    const m = userMessage(new BlendbenchInputError(r.field, r.value, r.message), { components });
    expect(m).toBe('BW-280: minimum 40 % is above its maximum 30 %. Lower the minimum or raise the maximum (Per-stock limits).');
    // with the user's comma: 0.405 → 40,5 %
    const comma = makeFormatter({ ...DEFAULT_SETTINGS, decimalSeparator: ',' });
    expect(userMessage(new BlendbenchInputError('targets.bounds.demo-bw-280', { min: 0.405, max: 0.3 }, ''), { components, words: comma })).toMatch(
      /^BW-280: minimum 40,5 % is above its maximum 30 %/,
    );
  });

  it('a limit outside 0–1 and other solver fields', () => {
    expect(userMessage(new BlendbenchInputError('targets.bounds.demo-bw-280.max', 1.5, 'x'), { components })).toBe(
      'BW-280: the maximum share 150 % must be from 0 to 100 % (Per-stock limits).',
    );
    const targets = { ...defaultTargets(320, null, null), tolerancePct: -1 };
    const r = solveBlend({ components: lib, targets });
    if (r.status !== 'invalid-input') throw new Error('expected invalid-input');
    const m = userMessage(new BlendbenchInputError(r.field, r.value, r.message), { components });
    expect(m).not.toMatch(INTERNAL);
    expect(m).toMatch(/tolerance/);
  });

  it('a line plan’s error keeps the grade’s name and drops the plan’s field path', () => {
    const e = new BlendbenchInputError('grades[1].targets.bounds.demo-bw-280', { min: 0.4, max: 0.3 }, 'VG 320: prepareComponents: the minimum …');
    expect(userMessage(e, { components })).toBe('VG 320: BW-280: minimum 40 % is above its maximum 30 %. Lower the minimum or raise the maximum (Per-stock limits).');
    const d = new BlendbenchInputError('grades[0].demandKg', -1, 'planLine: the demand for VG 220 must be above 0');
    expect(userMessage(d, { components })).toBe('The demand for VG 220 must be above 0');
  });

  it('an error from a prediction names the stock and the property', () => {
    const bad = lib.map((c) => (c.id === 'demo-bw-280' ? { ...c, viscosityPoints: [{ tempC: 40, kv: 100 }, { tempC: 100, kv: 0.1 }] } : c));
    let caught: unknown;
    try {
      predictBlend(bad, [{ componentId: 'demo-bw-280', massFraction: 1 }]);
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(BlendbenchInputError);
    const m = userMessage(caught, { components: bad });
    expect(m).not.toMatch(INTERNAL);
    expect(m).toMatch(/^BW-280: /);
    expect(m).toMatch(/measured viscosity 2 of 0\.1 mm²\/s is below 0\.21 mm²\/s/); // ASTM D341-20 range (viscosity-temperature.ts)
  });
});
