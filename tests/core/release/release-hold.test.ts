import { describe, expect, it } from 'vitest';
import { assessRelease, correctionHoldReasons, releaseHoldReasons } from '../../../src/core/release/release-hold';
import { newRecipeLifecycle, type BlendTargets, type Recipe } from '../../../src/core/formulation/model';
import { makeComponent, STOCKS } from '../../helpers/formulation-fixtures';
import { recordStockBasis, stockBasisChanges } from '../../../src/core/recipes/stock-basis';

const lib = [makeComponent(STOCKS.g2hv!), makeComponent(STOCKS.g2heavy!)];
const base: Recipe = {
  id: 'r',
  name: 'Invented VG 320',
  grade: 320,
  // Mass shares solved by hand with the Refutas rule for about VG 320 (checked by the assessment below).
  lines: [
    { componentId: 'g2hv', massFraction: 0.8 },
    { componentId: 'g2heavy', massFraction: 0.2 },
  ],
  revision: 1,
  isReference: false,
  notes: '',
  updatedAt: '2026-01-01T00:00:00Z',
  ...newRecipeLifecycle(),
  status: 'approved',
};
const targets: BlendTargets = {
  grade: 320, targetKv40: null, tolerancePct: 10, minVi: null, maxAnilinePoint: null, maxPolymerFraction: 0.25,
  maxPourPoint: null, minFlashPoint: null, additive: null, bounds: {}, objective: 'cost', referenceRecipeId: null,
    minInBandProbability: null,
};

describe('release hold', () => {
  it('finds no reason for an approved recipe inside its band, limits and constraints', () => {
    const a = assessRelease({ recipe: base, components: lib, targets, method: 'refutas' });
    expect('error' in a.prediction).toBe(false);
    expect(a.reasons).toEqual([]);
  });

  it('holds a draft, a superseded or archived recipe, and one on a withdrawn or missing stock', () => {
    const kinds = (r: Recipe, components = lib) =>
      assessRelease({ recipe: r, components, targets, method: 'refutas' }).reasons.map((x) => x.kind);
    expect(kinds({ ...base, status: 'draft' })).toEqual(['status']);
    expect(kinds({ ...base, status: 'superseded', archived: true })).toEqual(['status', 'archived']);
    const withdrawn = lib.map((c) => (c.id === 'g2heavy' ? { ...c, availability: 'withdrawn' as const } : c));
    expect(kinds(base, withdrawn)).toEqual(['withdrawn-stock']);
    const r = releaseHoldReasons({ recipe: base, components: [lib[0]!], targets: null, prediction: null, qcRows: null, method: 'refutas' });
    expect(r.map((x) => x.kind)).toEqual(['missing-stock']);
  });

  it('holds a recipe that misses its own constraint or a specification limit', () => {
    const strict = assessRelease({ recipe: base, components: lib, targets: { ...targets, minVi: 150 }, method: 'refutas' });
    expect(strict.reasons.map((x) => x.kind)).toEqual(['constraint']);
    expect(strict.reasons[0]!.message).toMatch(/minimum VI/);
    const spec = assessRelease({
      recipe: { ...base, specification: { ...base.specification, grade: base.grade, viMin: 150 } },
      components: lib,
      targets,
      method: 'refutas',
    });
    expect(spec.reasons.map((x) => x.kind)).toEqual(['release-limit']);
    expect(spec.reasons[0]!.message).toMatch(/Viscosity index: predicted \d+, limit ≥ 150/);
  });

  it('holds a recipe outside its grade band, and one that cannot be predicted', () => {
    const thin = { ...base, lines: [{ componentId: 'g2heavy', massFraction: 1 }] };
    const a = assessRelease({ recipe: thin, components: lib, targets, method: 'refutas' });
    expect(a.reasons.map((x) => x.kind)).toEqual(['constraint', 'release-limit']);
    const bad = assessRelease({ recipe: { ...base, lines: [{ componentId: 'g2hv', massFraction: 0.5 }] }, components: lib, targets, method: 'refutas' });
    expect(bad.reasons.map((x) => x.kind)).toEqual(['no-prediction']);
  });

  it('holds a correction sheet for the sheet’s reasons and for each withdrawn stock it adds', () => {
    const g2hv = lib[0]!;
    const withdrawnLib = [{ ...g2hv, availability: 'withdrawn' as const }, lib[1]!];
    const draft = [{ kind: 'status' as const, message: 'The recipe is a draft: it has not been approved.' }];
    expect(correctionHoldReasons([], [lib[1]!.code], withdrawnLib)).toEqual([]);
    expect(correctionHoldReasons(draft, [lib[1]!.code], withdrawnLib)).toEqual(draft);
    expect(correctionHoldReasons(draft, [g2hv.code, lib[1]!.code], withdrawnLib)).toEqual([
      ...draft,
      { kind: 'withdrawn-stock', message: `The correction adds a withdrawn stock: ${g2hv.code}.` },
    ]);
    expect(correctionHoldReasons([], [g2hv.code], lib)).toEqual([]);
  });
});

describe('release hold for a stock whose values are not yet entered (s25)', () => {
  it('holds a draft holding it with the stock and the missing values named, beside the draft status', () => {
    // A stock just added (ν40, ν100, density placeholders) in a draft without flash or pour limits:
    // the check said only "it is a draft", so the draft could be approved.
    const unentered = lib.map((c) => (c.id === 'g2heavy' ? { ...c, notEntered: ['kv40' as const, 'kv100' as const, 'density15' as const] } : c));
    const a = assessRelease({ recipe: { ...base, status: 'draft' }, components: unentered, targets, method: 'refutas' });
    expect(a.reasons.map((x) => x.kind)).toEqual(['status', 'unentered-stock']);
    expect(a.reasons[1]!.message).toBe(
      'It uses a stock whose measured values are not yet entered: G2HEAVY (ν40, ν100 and density). Its limits are checked once they are entered.',
    );
    // Constraints and release limits are not checked on placeholders (a strict minimum VI adds no reason).
    const strict = assessRelease({ recipe: base, components: unentered, targets: { ...targets, minVi: 150 }, method: 'refutas' });
    expect(strict.reasons.map((x) => x.kind)).toEqual(['unentered-stock']);
    // Approval waits for every reason other than the status (RecipesScreen `blocking`).
    expect(a.reasons.filter((r) => r.kind !== 'status')).toHaveLength(1);
    // An approved recipe whose stock lost nothing is not held; two stocks are named together.
    const two = unentered.map((c) => (c.id === 'g2hv' ? { ...c, notEntered: ['density15' as const] } : c));
    const r = releaseHoldReasons({ recipe: base, components: two, targets: null, prediction: null, qcRows: null, method: 'refutas' });
    expect(r).toEqual([
      {
        kind: 'unentered-stock',
        message: 'It uses stocks whose measured values are not yet entered: G2HV (density); G2HEAVY (ν40, ν100 and density). Its limits are checked once they are entered.',
      },
    ]);
    // An empty list is a complete stock (as saved before the list existed).
    const empty = lib.map((c) => ({ ...c, notEntered: [] }));
    expect(assessRelease({ recipe: base, components: empty, targets, method: 'refutas' }).reasons).toEqual([]);
  });

  it('holds a correction that adds such a stock', () => {
    const unentered = lib.map((c) => (c.id === 'g2hv' ? { ...c, notEntered: ['kv100' as const] } : c));
    expect(correctionHoldReasons([], ['G2HV'], unentered)).toEqual([
      { kind: 'unentered-stock', message: 'The correction adds a stock whose measured values are not yet entered: G2HV (ν100).' },
    ]);
    expect(correctionHoldReasons([], ['G2HEAVY'], unentered)).toEqual([]);
  });
});

describe('stock data recorded with a recipe while values were not yet entered (s25)', () => {
  it('compares a value not yet entered as not given: entering it reads "— → value", never from the placeholder', () => {
    const fresh = { ...makeComponent(STOCKS.g2heavy!), notEntered: ['kv40' as const, 'density15' as const] };
    const basis = recordStockBasis([lib[0]!, fresh], base.lines, '2026-12-04T16:00:00.000Z');
    expect(basis.stocks[1]!.notEntered).toEqual(['kv40', 'density15']);
    expect('notEntered' in basis.stocks[0]!).toBe(false);
    // Nothing entered yet: no change. (A new placeholder is no change either.)
    const moved = { ...fresh, density15: 0.9 };
    expect(stockBasisChanges(basis, [lib[0]!, moved])).toEqual([]);
    // Entered: from not given to the value (fixture values, invented).
    const entered = { ...makeComponent(STOCKS.g2heavy!) };
    const change = stockBasisChanges(basis, [lib[0]!, entered]);
    expect(change).toHaveLength(1);
    const kv40 = entered.viscosityPoints.find((p) => p.tempC === 40)!.kv;
    expect(change[0]!.fields).toEqual([
      { property: 'ν at 40 °C', unit: 'mm²/s', from: null, to: kv40 },
      { property: 'density at 15 °C', unit: 'kg/L', from: null, to: entered.density15 },
    ]);
  });
});
