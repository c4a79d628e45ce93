import { beforeAll, describe, expect, it } from 'vitest';
import { wrightBlendLine, wrightHeavyFraction } from '../../src/core/blending/wright';
import { viscosityIndex } from '../../src/core/viscosity/viscosity-index';
import { kvAtTemperature, waltherLine } from '../../src/core/viscosity/viscosity-temperature';
import { blendDensityAtTemperature } from '../../src/core/blending/density-temperature';
import { displayWords } from '../../src/core/words/display';
import { predictRecipe } from '../../src/features/designer/predict';
import { combinationTradeOff } from '../../src/features/explorer/tradeoff';
import { runSearch } from '../../src/features/explorer/runner';
import type { FromWorker } from '../../src/features/explorer/protocol';
import type { SubstituteSearchInput } from '../../src/core/search/substitutes';
import { demoRecipes } from '../../src/state/demo';
import { userMessage } from '../../src/state/messages';
import { demoComponents } from '../../src/state/demo';
import { solveBlend } from '../../src/core/solver/solve-blend';
import { predictBlend } from '../../src/core/formulation/blend-properties';
import { BlendbenchInputError } from '../../src/core/errors';
import { defaultTargets } from '../../src/state/demo';
import { loadUnitConversions, makeFormatter } from '../../src/components/format';
import { DEFAULT_SETTINGS } from '../../src/state/settings';
import { FILE_NUMBERS } from '../../src/state/checks';

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
    const m = userMessage(new BlendbenchInputError(r.field, r.value, r.message), { components, words: FILE_NUMBERS });
    expect(m).toBe('BW-280: minimum 40 % is above its maximum 30 %. Lower the minimum or raise the maximum (Per-stock limits).');
    // with the user's comma: 0.405 → 40,5 %
    const comma = makeFormatter({ ...DEFAULT_SETTINGS, decimalSeparator: ',' });
    expect(userMessage(new BlendbenchInputError('targets.bounds.demo-bw-280', { min: 0.405, max: 0.3 }, ''), { components, words: comma })).toMatch(
      /^BW-280: minimum 40,5 % is above its maximum 30 %/,
    );
  });

  it('a limit outside 0–1 and other solver fields', () => {
    expect(userMessage(new BlendbenchInputError('targets.bounds.demo-bw-280.max', 1.5, 'x'), { components, words: FILE_NUMBERS })).toBe(
      'BW-280: the maximum share 150 % must be from 0 to 100 % (Per-stock limits).',
    );
    const targets = { ...defaultTargets(320, null, null), tolerancePct: -1 };
    const r = solveBlend({ components: lib, targets });
    if (r.status !== 'invalid-input') throw new Error('expected invalid-input');
    const m = userMessage(new BlendbenchInputError(r.field, r.value, r.message), { components, words: FILE_NUMBERS });
    expect(m).not.toMatch(INTERNAL);
    expect(m).toMatch(/tolerance/);
  });

  it('the QC loop’s heel and the blend sheet’s batch are named as on screen, never by their field paths (plant loop defect hunt)', async () => {
    const { adjustRecipe } = await import('../../src/core/qc/adjust');
    const { buildBlendSheet } = await import('../../src/core/sheet/blend-sheet');
    const stocks = [{ id: 'demo-bw-280', label: 'BW-280', kv40: 460, kv100: 31, density15: 0.885, savedFraction: 1 }];
    let heel: unknown;
    try {
      adjustRecipe({ stocks, batchKg: 10000, aimKv40: 460, additive: null, heel: { massKg: 12000, kv40: 460, kv100: 31, density15: 0.885, additiveFraction: 0 }, method: 'refutas' });
    } catch (e) {
      heel = e;
    }
    const h = userMessage(heel, { components, words: FILE_NUMBERS });
    expect(h).not.toMatch(/massKg|heel\./);
    expect(h).toMatch(/^Heel mass of 12000; a heel must weigh more than 0 kg and less than the batch \(10000 kg\)/);
    let batch: unknown;
    try {
      buildBlendSheet(components, demoRecipes()[0]!, { kg: 0 });
    } catch (e) {
      batch = e;
    }
    const b = userMessage(batch, { components, words: FILE_NUMBERS });
    expect(b).not.toMatch(/Batch\.kg|batch\.kg/);
    expect(b).toMatch(/^Batch size of 0/);
  });

  it('a line plan’s error keeps the grade’s name and drops the plan’s field path', () => {
    const e = new BlendbenchInputError('grades[1].targets.bounds.demo-bw-280', { min: 0.4, max: 0.3 }, 'VG 320: prepareComponents: the minimum …');
    expect(userMessage(e, { components, words: FILE_NUMBERS })).toBe('VG 320: BW-280: minimum 40 % is above its maximum 30 %. Lower the minimum or raise the maximum (Per-stock limits).');
    const d = new BlendbenchInputError('grades[0].demandKg', -1, 'planLine: the demand for VG 220 must be above 0');
    expect(userMessage(d, { components, words: FILE_NUMBERS })).toBe('The demand for VG 220 must be above 0');
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
    const m = userMessage(caught, { components: bad, words: FILE_NUMBERS });
    expect(m).not.toMatch(INTERNAL);
    expect(m).toMatch(/^BW-280: /);
    expect(m).toMatch(/measured viscosity 2 of 0\.1 mm²\/s is below 0\.21 mm²\/s/); // ASTM D341-20 range (viscosity-temperature.ts)
  });
});

describe('core errors in the user’s number format: comma decimals and °F (issue 10, item 17)', () => {
  // The app's formatter (components/format.ts) and the core's (core/words/display.ts) with "," and °F.
  let app: ReturnType<typeof makeFormatter>;
  const core = displayWords({ decimalSeparator: ',', temperatureUnit: 'F' });
  beforeAll(async () => {
    await loadUnitConversions(); // °F conversions (mathjs) load on demand
    app = makeFormatter({ ...DEFAULT_SETTINGS, decimalSeparator: ',', temperatureUnit: 'F' });
  });
  const thrown = (f: () => unknown): unknown => {
    try {
      f();
    } catch (e) {
      return e;
    }
    throw new Error('expected the core to refuse');
  };
  /** No "." decimal and no °C value is left (a reference temperature "at 15 °C" is a name, not a value). */
  const inUserFormat = (m: string) => {
    expect(m).not.toMatch(/\d\.\d/);
    expect(m.replace(/at 15 °C/g, '')).not.toMatch(/°C/);
  };

  it('Wright’s method: ν100 not below ν40, and a target outside the two stocks at the operating temperature', () => {
    const order = thrown(() => wrightBlendLine([{ volumeFraction: 1, kv40: 10.5, kv100: 12.5 }]));
    for (const words of [app, core]) {
      const m = userMessage(order, { components, words });
      inUserFormat(m);
      expect(m).toMatch(/ν100 of 12,5 mm²\/s is not below ν40 of 10,5 mm²\/s/);
    }
    // 60 °C = 140 °F (definition of the Fahrenheit scale); the two stocks' values at 60 °C as the core writes them (toPrecision(4)).
    const outside = thrown(() => wrightHeavyFraction({ kv40: 100, kv100: 11 }, { kv40: 460, kv100: 31 }, 1000.5, 60));
    const m = userMessage(outside, { components, words: app });
    inUserFormat(m);
    expect(m).toMatch(/^Target viscosity of 1000,5 mm²\/s lies outside \d+,\d+–\d+,\d+ mm²\/s at 140 °F; no blend of the two stocks reaches it$/);
  });

  it('the VI function: ν100 below the D2270 range', () => {
    const e = thrown(() => viscosityIndex(30.5, 1.9)); // ASTM D2270 defines no VI below ν100 = 2.0 mm²/s (scope)
    const m = userMessage(e, { components, words: app });
    inUserFormat(m);
    expect(m).toBe('ν100 of 1,9 mm²/s is below 2,0 mm²/s; ASTM D2270 defines no viscosity index there');
  });

  it('temperatures: absolute zero, a range of the tables, a density range at the 15 °C reference', () => {
    // −273.15 °C = −459.67 °F; −300 °C = −508 °F (definition of the Fahrenheit scale)
    const cold = userMessage(thrown(() => kvAtTemperature(waltherLine(320, 24), -300)), { components, words: app });
    inUserFormat(cold);
    expect(cold).toMatch(/−508 °F is at or below absolute zero \(−459,67 °F\)/);
    // −50…300 °C = −58…572 °F (definition of the Fahrenheit scale)
    const hot = userMessage(thrown(() => blendDensityAtTemperature([{ massFraction: 1, density15: 0.88 }], 350)), { components, words: app });
    inUserFormat(hot);
    expect(hot).toMatch(/662 °F lies outside −58…572 °F/);
    const dense = userMessage(thrown(() => blendDensityAtTemperature([{ massFraction: 1, density15: 1.35 }], 60)), { components, words: app });
    inUserFormat(dense);
    expect(dense).toMatch(/1,35 kg\/L is outside the plausible range 0,6–1,3 kg\/L for an oil at 15 °C/);
  });

  it('every screen path that shows a core error passes the user’s format: the designer’s prediction, the explorer’s trade-off', () => {
    const bad = lib.map((c) => (c.id === 'demo-bw-280' ? { ...c, viscosityPoints: [{ tempC: 40, kv: 100.5 }, { tempC: 100, kv: 0.15 }] } : c));
    const p = predictRecipe([{ componentId: 'demo-bw-280', massFraction: 1 }], bad, 'd7152-wright', { display: { decimalSeparator: ',', temperatureUnit: 'F' } });
    expect(p.ok).toBe(false);
    if (!p.ok) {
      inUserFormat(p.message);
      expect(p.message).toMatch(/0,15 mm²\/s/);
    }
    const t = combinationTradeOff(bad, defaultTargets(320, null, null), ['demo-bw-280', 'demo-bw-190'], 'refutas', app);
    expect(t.kind).toBe('error');
    if (t.kind === 'error') {
      inUserFormat(t.message);
      expect(t.message).toMatch(/0,15 mm²\/s/);
    }
  });

  it('the explorer’s worker sends the core’s field and value, so the screen can write the message in the user’s format', async () => {
    const posted: FromWorker[] = [];
    const bad = lib.map((c) => (c.id === 'demo-bw-280' ? { ...c, density15: 1.35 } : c));
    const input = { components: bad, reference: demoRecipes()[0]!, targets: defaultTargets(320, null, null), withdrawn: [], maxComponents: 2, method: 'refutas' as const, limit: 5 };
    await runSearch(1, input as unknown as SubstituteSearchInput, (m) => posted.push(m), () => false, { yieldNow: async () => {} });
    const err = posted.find((m) => m.type === 'error');
    expect(err).toBeDefined();
    if (err?.type !== 'error') return;
    expect(err.field).toBeDefined();
    const m = userMessage(new BlendbenchInputError(err.field!, err.value, err.message), { components: bad, words: app });
    inUserFormat(m);
    expect(m).toMatch(/1,35 kg\/L/);
  });
});
