import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  blendSheetCsvRows,
  buildBlendSheet,
  chargeRole,
  defaultBlendingInstructions,
  largestRemainderUnits,
  qcReleaseTargets,
  limitText,
  INDEX_EXTRAPOLATED,
  quantityDecimals,
  BLEND_SHEET_CAUTIONS,
  type SheetPrediction,
} from '../../../src/core/sheet/blend-sheet';
import type { Component, ComponentCategory, Recipe } from '../../../src/core/formulation/model';
import { BLANK_SPECIFICATION } from '../../../src/core/formulation/model';
import { sheetComponent, sheetRecipe } from './fixtures';
import { BlendbenchInputError } from '../../../src/core/errors';

/** An invented test component (tests/core/sheet/fixtures.ts) with its price. */
function comp(
  id: string,
  category: ComponentCategory,
  kv40: number,
  density15: number,
  price = 1,
  basis: Component['price']['basis'] = 'per-kg',
  currency = 'EUR',
): Component {
  return sheetComponent(id, category, kv40, density15, { price: { amount: price, basis, currency } });
}

const recipe = (lines: [string, number][], grade = 320): Recipe => sheetRecipe(lines, { grade });

const sum = (xs: number[]) => xs.reduce((a, b) => a + b, 0);

describe('largestRemainderUnits', () => {
  it('hands the missing unit to the largest remainder', () => {
    // Hamilton (largest-remainder) method, worked by hand: floors 333+333+333 = 999, the third
    // value has the largest remainder (0.4) → 334. common practice (no source)
    expect(largestRemainderUnits([33.333, 33.333, 33.334], 100, 1)).toEqual([333, 333, 334]);
  });

  it('makes three thirds of 1000 kg add up to 1000.0', () => {
    // worked by hand: 333.33… ×3 → 3333, 3333, 3334 tenths (ties broken by order). common practice (no source)
    const u = largestRemainderUnits([1000 / 3, 1000 / 3, 1000 / 3], 1000, 1);
    expect(sum(u)).toBe(10000);
    expect(u.map((x) => x / 10)).toEqual([333.4, 333.3, 333.3]);
  });

  it('never moves a value by more than one displayed unit (property)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: 0, max: 1e5, noNaN: true }), { minLength: 1, maxLength: 12 }),
        fc.integer({ min: 0, max: 3 }),
        (values, d) => {
          const total = sum(values);
          const u = largestRemainderUnits(values, total, d);
          const s = 10 ** d;
          // exact column sum: the defining property of the method. common practice (no source)
          expect(sum(u)).toBe(Math.round(total * s));
          u.forEach((x, i) => expect(Math.abs(x - values[i]! * s)).toBeLessThan(1 + 1e-6));
        },
      ),
    );
  });

  it('rejects values that do not add up to the total', () => {
    expect(() => largestRemainderUnits([1, 2], 4, 1)).toThrow(BlendbenchInputError);
    expect(() => largestRemainderUnits([-1, 2], 1, 1)).toThrow(/≥ 0/);
  });
});

describe('quantityDecimals', () => {
  it('shows finer quantities for small batches', () => {
    // common practice (no source): balance for lab batches, 0.1 kg for kettles, 1 kg for tanks
    expect(quantityDecimals(50)).toBe(2);
    expect(quantityDecimals(1000)).toBe(1);
    expect(quantityDecimals(250_000)).toBe(0);
  });
});

describe('buildBlendSheet', () => {
  const two = [comp('a', 'group-ii', 100, 0.865, 1.2), comp('b', 'group-i', 460, 0.9, 1.0)];

  it('reproduces ideal-mixing density and litres for a 1000 kg batch', () => {
    const s = buildBlendSheet(two, recipe([['a', 0.6], ['b', 0.4]]), { kg: 1000 });
    // tests/reference/check-values.md D1: ρ = 0.87867 kg/L for 0.6 @ 0.865 + 0.4 @ 0.900 (ideal mixing)
    expect(s.density15).toBeCloseTo(0.87867, 5);
    // 600/0.865 + 400/0.900 = 693.64 + 444.44 = 1138.09 L, worked by hand from D1's inputs
    expect(s.totalLitresExact).toBeCloseTo(1138.086, 3);
    expect(s.totalKg).toBe(1000);
    expect(s.totalLitres).toBe(1138.1);
    expect(s.quantityDecimals).toBe(1);
    // Rows in charging order: the heavier (ν40 460) base stock first. common practice (domain notes)
    expect(s.rows.map((r) => r.code)).toEqual(['B', 'A']);
    expect(s.rows.map((r) => r.kg)).toEqual([400, 600]);
    // Plain rounding would print 444.4 + 693.6 = 1138.0 ≠ 1138.1; the largest remainder (444.444…, .44
    // against 693.641…, .41) takes the missing 0.1 L. Worked by hand; common practice (no source)
    expect(s.rows.map((r) => r.litres)).toEqual([444.5, 693.6]);
    expect(s.rows.map((r) => r.runningKg)).toEqual([400, 1000]);
  });

  it('takes a batch in litres at 15 °C', () => {
    const s = buildBlendSheet(two, recipe([['a', 0.6], ['b', 0.4]]), { litres: 1000 });
    // check-values D1: 1000 L × 0.87867 kg/L = 878.67 kg
    expect(s.totalKgExact).toBeCloseTo(878.67, 2);
    expect(s.totalLitres).toBe(1000);
    expect(s.batchBasis).toBe('litres');
    expect(sum(s.rows.map((r) => r.litres * 10))).toBe(10000);
  });

  it('orders base stocks heaviest first, then boosters, polymer, additive package last', () => {
    const lib = [
      comp('add', 'additive-package', 300, 1.05),
      comp('poly', 'polymer', 4000, 0.89),
      comp('an', 'group-v', 30, 0.9),
      comp('n150', 'group-ii', 30, 0.86),
      comp('hv', 'group-ii', 600, 0.88),
      comp('pao', 'group-iv', 400, 0.85),
    ];
    const r = recipe([['add', 0.02], ['poly', 0.04], ['an', 0.1], ['n150', 0.34], ['hv', 0.3], ['pao', 0.2]]);
    const s = buildBlendSheet(lib, r, { kg: 5000 });
    // common practice (domain notes, "Blending practice"): base stocks, boosters, polymer, additive last
    expect(s.rows.map((x) => x.componentId)).toEqual(['hv', 'pao', 'n150', 'an', 'poly', 'add']);
    expect(s.rows.map((x) => x.chargeOrder)).toEqual([1, 2, 3, 4, 5, 6]);
    expect(chargeRole('group-v')).toBe('solvency-booster');

    const o = buildBlendSheet(lib, r, { kg: 5000 }, { chargeOrder: ['n150', 'an'] });
    expect(o.rows.map((x) => x.componentId)).toEqual(['n150', 'an', 'hv', 'pao', 'poly', 'add']);
  });

  it('a stock whose ν40 is not yet entered comes after the others of its role, not by its placeholder ν40 (s25)', () => {
    // invented stocks; the rule is the sheet's own (common practice (no source)): an unknown ν40 is not ranked
    const fresh = { ...comp('new', 'group-ii', 9999, 0.86), notEntered: ['kv40' as const, 'kv100' as const, 'density15' as const] };
    const lib = [comp('hv', 'group-ii', 600, 0.88), comp('n150', 'group-ii', 30, 0.86), fresh, comp('add', 'additive-package', 300, 1.05)];
    const s = buildBlendSheet(lib, recipe([['hv', 0.5], ['n150', 0.28], ['new', 0.2], ['add', 0.02]]), { kg: 1000 });
    expect(s.rows.map((x) => x.componentId)).toEqual(['hv', 'n150', 'new', 'add']);
  });

  it('makes every displayed column sum exactly to its total (12 components, any batch)', () => {
    const cats: ComponentCategory[] = ['group-i', 'group-ii', 'group-iii', 'group-iv', 'group-v', 'polymer'];
    fc.assert(
      fc.property(
        fc.array(fc.integer({ min: 1, max: 1000 }), { minLength: 12, maxLength: 12 }),
        fc.array(fc.double({ min: 0.8, max: 1.1, noNaN: true }), { minLength: 12, maxLength: 12 }),
        fc.double({ min: 1, max: 500_000, noNaN: true }),
        fc.boolean(),
        (weights, dens, size, inLitres) => {
          const lib = weights.map((_, i) => comp(`c${i}`, i === 11 ? 'additive-package' : cats[i % cats.length]!, 10 + i * 50, dens[i]!));
          const w = sum(weights);
          const r = recipe(weights.map((x, i) => [`c${i}`, x / w]));
          const s = buildBlendSheet(lib, r, inLitres ? { litres: size } : { kg: size });
          const qs = 10 ** s.quantityDecimals;
          const ps = 10 ** s.percentDecimals;
          const u = (xs: number[], sc: number) => sum(xs.map((x) => Math.round(x * sc)));
          // Displayed columns sum exactly (largest remainder). common practice (no source)
          expect(u(s.rows.map((x) => x.kg), qs)).toBe(Math.round(s.totalKg * qs));
          expect(u(s.rows.map((x) => x.litres), qs)).toBe(Math.round(s.totalLitres * qs));
          expect(u(s.rows.map((x) => x.massPct), ps)).toBe(100 * ps);
          expect(u(s.rows.map((x) => x.volumePct), ps)).toBe(100 * ps);
          // The displayed batch total is the requested batch size to the displayed precision.
          expect(Math.round((inLitres ? s.totalLitres : s.totalKg) * qs)).toBe(Math.round(size * qs));
          expect(s.rows.at(-1)!.runningKg).toBe(s.totalKg);
          expect(s.rows.at(-1)!.componentId).toBe('c11');
        },
      ),
      { numRuns: 200 },
    );
  });

  it('prices the batch: per litre = ρ·Σ wᵢ·pᵢ', () => {
    const lib = [comp('a', 'group-ii', 100, 0.865, 1.2), comp('b', 'group-i', 460, 0.9, 900, 'per-tonne')];
    const s = buildBlendSheet(lib, recipe([['a', 0.6], ['b', 0.4]]), { kg: 1000 });
    if (!s.costing.available) throw new Error('costing should be available');
    // check-values D2: per litre = ρ × Σ wᵢ·pᵢ; Σ wᵢ·pᵢ = 0.6·1.2 + 0.4·0.9 = 1.08 per kg (by hand)
    expect(s.costing.perKg).toBeCloseTo(1.08, 10);
    expect(s.costing.perBatch).toBeCloseTo(1080, 8);
    expect(s.costing.perLitre).toBeCloseTo(0.87867 * 1.08, 4);

    const mixed = [comp('a', 'group-ii', 100, 0.865, 1.2), comp('b', 'group-i', 460, 0.9, 1, 'per-kg', 'USD')];
    const m = buildBlendSheet(mixed, recipe([['a', 0.6], ['b', 0.4]]), { kg: 1000 });
    expect(m.costing).toEqual({ available: false, reason: expect.stringMatching(/different currencies/) });

    // s25: a blank currency marks a stock left out of costing (priceLibraryInBase); a batch holding one has no
    // cost, even when every stock carries it (before: costed at 0 or in no currency). Invented prices.
    const blankAll = [comp('a', 'group-ii', 100, 0.865, 0, 'per-kg', ''), comp('b', 'group-i', 460, 0.9, 0, 'per-kg', '')];
    expect(buildBlendSheet(blankAll, recipe([['a', 0.6], ['b', 0.4]]), { kg: 1000 }).costing).toEqual({ available: false, reason: 'no usable price for B, A' });
    const oneBlank = [comp('a', 'group-ii', 100, 0.865, 1.2), comp('b', 'group-i', 460, 0.9, 1, 'per-kg', '')];
    expect(buildBlendSheet(oneBlank, recipe([['a', 0.6], ['b', 0.4]]), { kg: 1000 }).costing).toEqual({ available: false, reason: 'no usable price for B' });
  });

  it('prices the delivered litre at the delivery temperature (issue 13 §8)', () => {
    const lib = [comp('a', 'group-ii', 100, 0.9, 1.2)];
    expect(buildBlendSheet(lib, recipe([['a', 1]]), { kg: 1000 }).costing).toMatchObject({ perDeliveredLitre: null });
    expect(buildBlendSheet(lib, recipe([['a', 1]]), { kg: 1000 }, { deliveryTempC: 15 }).costing).toMatchObject({ perDeliveredLitre: null });
    const s = buildBlendSheet(lib, recipe([['a', 1]]), { kg: 1000 }, { deliveryTempC: 40 });
    if (!s.costing.available) throw new Error('costing should be available');
    // ASTM D1250-80 Table 54D equation (lubricating oils), by hand: α15 = 0.6278/900 per °C, Δt = 25 °C,
    // VCF = exp(−α15·Δt·(1 + 0.8·α15·Δt)); per delivered litre = 0.9 kg/L × VCF × 1.2 per kg
    const a = 0.6278 / 900;
    const vcf = Math.exp(-a * 25 * (1 + 0.8 * a * 25));
    expect(s.costing.perDeliveredLitre!.tempC).toBe(40);
    expect(s.costing.perDeliveredLitre!.cost).toBeCloseTo(0.9 * vcf * 1.2, 10);
    // warmer litres are fewer kg: cheaper per litre than at 15 °C
    expect(s.costing.perDeliveredLitre!.cost).toBeLessThan(s.costing.perLitre);
  });

  it('leaves lines at 0 % off the sheet', () => {
    const s = buildBlendSheet(two, recipe([['a', 0.6], ['b', 0.4], ['zz', 0]]), { kg: 1000 });
    expect(s.rows.map((r) => r.code)).toEqual(['B', 'A']);
  });

  it('throws specific errors for a missing component or a bad batch size', () => {
    expect(() => buildBlendSheet(two, recipe([['zz', 1]]), { kg: 1000 })).toThrow(/not in the library/);
    expect(() => buildBlendSheet(two, recipe([['a', 1]]), { kg: 0 })).toThrow(/batch.kg = 0/);
    expect(() => buildBlendSheet(two, recipe([['a', 1]]), { litres: Number.NaN })).toThrow(BlendbenchInputError);
  });
});

describe('defaultBlendingInstructions', () => {
  it('follows the common charging practice and names the stock codes', () => {
    const lib = [comp('hv', 'group-ii', 600, 0.88), comp('poly', 'polymer', 4000, 0.89), comp('add', 'additive-package', 300, 1.05)];
    const s = buildBlendSheet(lib, recipe([['hv', 0.9], ['poly', 0.08], ['add', 0.02]]), { kg: 1000 });
    const steps = defaultBlendingInstructions(s);
    const text = steps.join('\n');
    // domain notes (common practice): heat to about 50–65 °C, polymer slowly, additive last, mix 30–60 min
    expect(text).toMatch(/50–65 °C/);
    expect(text).toMatch(/30–60 min/);
    expect(steps.findIndex((x) => x.includes('POLY'))).toBeLessThan(steps.findIndex((x) => x.includes('ADD')));
    expect(text).toMatch(/QC sample/);
    const plain = defaultBlendingInstructions(buildBlendSheet(lib, recipe([['hv', 1]]), { kg: 1000 }), {
      heatToC: [55, 60],
    });
    expect(plain.join('\n')).not.toMatch(/polymer/i);
    expect(plain.join('\n')).toMatch(/55–60 °C/);
  });

  it('prints the temperatures in °F when asked', () => {
    const lib = [comp('hv', 'group-ii', 600, 0.88), comp('add', 'additive-package', 300, 1.05)];
    const s = buildBlendSheet(lib, recipe([['hv', 0.98], ['add', 0.02]]), { kg: 1000 });
    const text = defaultBlendingInstructions(s, { temperatureUnit: 'F' }).join('\n');
    // t_F = 9/5·t_C + 32, the definition of the scale (common practice, no source): 50 → 122, 65 → 149 °F
    expect(text).toMatch(/Heat to 122–149 °F with agitation; do not exceed 149 °F\./);
    expect(text).toMatch(/at no more than 149 °F/);
    expect(text).not.toMatch(/°C/);
  });

  it('rounds the heating range inward in °F, so the printed maximum is never above the one set', () => {
    const lib = [comp('hv', 'group-ii', 600, 0.88), comp('add', 'additive-package', 300, 1.05)];
    const s = buildBlendSheet(lib, recipe([['hv', 0.98], ['add', 0.02]]), { kg: 1000 });
    const text = defaultBlendingInstructions(s, { temperatureUnit: 'F', heatToC: [50.5, 66] }).join('\n');
    // t_F = 9/5·t_C + 32 (common practice, no source): 50.5 °C = 122.9 °F → at least 123; 66 °C = 150.8 °F → at most 150
    expect(text).toMatch(/Heat to 123–150 °F with agitation; do not exceed 150 °F\./);
    expect(text).toMatch(/at no more than 150 °F/);
  });
});

describe('qcReleaseTargets', () => {
  const p: SheetPrediction = {
    kv40: 318.44,
    kv100: 24.1,
    reportedVi: 97,
    density15: 0.8912,
    anilinePoint: 118.2,
    flashPoint: 241.6,
    pourPoint: -11.2,
    operating: { tempC: 60, kv: 120.3 },
  };

  it('puts ν40 inside the plant aim band and the ISO 3448 band', () => {
    const rows = qcReleaseTargets(320, p);
    const kv40 = rows.find((r) => r.key === 'kv40')!;
    // ISO 3448 VG 320: 288–352 (check-values G2); plant aim ±5 % of 320 = 304–336 (common practice, domain notes)
    expect(kv40.min).toBe(304);
    expect(kv40.max).toBe(336);
    expect(kv40.target).toBe('304.0–336.0 (ISO VG 320: 288.0–352.0)');
    expect(kv40.method).toBe('ASTM D445');
    expect(kv40.predicted).toBe('318.4');
    // A plant tolerance wider than ISO is clipped to the ISO band (check-values G2 limits).
    const wide = qcReleaseTargets(320, p, { kv40TolerancePct: 15 }).find((r) => r.key === 'kv40')!;
    expect([wide.min, wide.max]).toEqual([288, 352]);
    // ISO 3448 VG 220: 198–242 exactly (check-values G1), no floating-point edge
    const g220 = qcReleaseTargets(220, p, { kv40TolerancePct: 10 }).find((r) => r.key === 'kv40')!;
    expect([g220.min, g220.max]).toEqual([198, 242]);
  });

  it('marks a flash or pour estimate made beyond its blending index fitted range (issue 13)', () => {
    const plain = Object.fromEntries(qcReleaseTargets(320, p).map((r) => [r.key, r.property]));
    expect(plain.flash).toBe('Flash point, open cup (estimate)');
    expect(plain.pour).toBe('Pour point (estimate)');
    const marked = Object.fromEntries(
      qcReleaseTargets(320, { ...p, flashPointExtrapolated: true, pourPointExtrapolated: true }).map((r) => [r.key, r.property]),
    );
    expect(marked.flash).toBe('Flash point, open cup (extrapolated estimate)');
    expect(marked.pour).toBe('Pour point (extrapolated estimate)');
    // In °F the label stays (only the numbers are converted).
    const f = qcReleaseTargets(320, { ...p, flashPointExtrapolated: true }, { temperatureUnit: 'F' }).find((r) => r.key === 'flash')!;
    expect(f.property).toBe(`Flash point, open cup (${INDEX_EXTRAPOLATED})`);
  });

  it('flags a prediction that falls outside its own release target', () => {
    // ν40 228.0 is below the VG 320 aim band 304–336 (ISO 3448 band 288–352, check-values G2)
    const low = qcReleaseTargets(320, { ...p, kv40: 228.0 });
    expect(low.find((r) => r.key === 'kv40')!.predictedOutsideTarget).toBe(true);
    expect(low.filter((r) => r.predictedOutsideTarget).map((r) => r.key)).toEqual(['kv40']);
    // 318.44 prints as 318.4, inside 304–336
    expect(qcReleaseTargets(320, p).some((r) => r.predictedOutsideTarget)).toBe(false);
    // Edge: 303.96 prints as 304.0, which is inside (limits inclusive, as ISO 3448; check-values G1 style)
    expect(qcReleaseTargets(320, { ...p, kv40: 303.96 }).find((r) => r.key === 'kv40')!.predictedOutsideTarget).toBe(false);
  });

  it('takes every limit but ν40 from the recipe specification, never from the prediction (issue 10, item 12)', () => {
    // No specification entered: nothing is derived from the model's own estimates.
    const blank = Object.fromEntries(qcReleaseTargets(320, p).map((r) => [r.key, r]));
    for (const k of ['kv100', 'vi', 'density15', 'flash', 'pour', 'copper', 'foam'] as const) {
      expect(blank[k]!.target).toBe('Per specification');
      expect([blank[k]!.min, blank[k]!.max]).toEqual([null, null]);
      expect(blank[k]!.limitSource).toBe('none');
      expect(blank[k]!.release).toBe(true);
    }
    // The predictions are still printed beside the limits, for information.
    expect([blank.flash!.predicted, blank.pour!.predicted, blank.vi!.predicted]).toEqual(['242', '-11', '97']);
    // Limits as entered in an invented test specification (common practice (no source) for the shape only).
    const spec = {
      ...BLANK_SPECIFICATION, kv100Min: 22, kv100Max: 26, viMin: 90, density15Min: 0.88, density15Max: 0.9,
      flashMin: 220, pourMax: -9, copper: '1b max', foam: '50/0',
    };
    const rows = qcReleaseTargets(320, p, { specification: spec });
    const by = Object.fromEntries(rows.map((r) => [r.key, r]));
    expect([by.kv100!.target, by.vi!.target, by.density15!.target]).toEqual(['22.00–26.00', '≥ 90', '0.8800–0.9000']);
    expect([by.flash!.target, by.flash!.min, by.pour!.target, by.pour!.max]).toEqual(['≥ 220', 220, '≤ -9', -9]);
    expect([by.copper!.target, by.foam!.target]).toEqual(['1b max', '50/0']);
    expect(by.vi!.limitSource).toBe('specification');
    expect(by.kv40!.limitSource).toBe('grade');
    // pour estimate −11.2 °C rounds to −11 (≤ −9 passes); a −12 °C limit is missed
    expect(rows.some((r) => r.predictedOutsideTarget)).toBe(false);
    const strict = qcReleaseTargets(320, p, { specification: { ...spec, pourMax: -12, viMin: 100 } });
    expect(strict.filter((r) => r.predictedOutsideTarget).map((r) => r.key)).toEqual(['vi', 'pour']);
    expect(rows.map((r) => r.method)).toEqual([
      'Visual', 'ASTM D445', 'ASTM D445', 'ASTM D2270', 'ASTM D4052', 'ASTM D92', 'ASTM D97', 'ASTM D611',
      'ASTM D341-20', 'ASTM D130', 'ASTM D892',
    ]);
    // the calculated row names the D341 form of its line (Settings); the simple form by its Z
    const simple = qcReleaseTargets(320, { ...p, operating: { ...p.operating!, form: 'walther-simple' } });
    expect(simple.find((r) => r.key === 'kvOperating')!.method).toBe('ASTM D341 (Z = ν + 0.7)');
    expect(by.aniline!.release).toBe(false);
  });

  it('prints flash, pour, aniline and operating temperatures in °F, judged as in °C', () => {
    const spec = { ...BLANK_SPECIFICATION, flashMin: 232, pourMax: -5 };
    const rows = qcReleaseTargets(320, p, { temperatureUnit: 'F', specification: spec });
    const by = Object.fromEntries(rows.map((r) => [r.key, r]));
    // t_F = 9/5·t_C + 32 (common practice, no source), rounded to whole degrees:
    // flash 241.6 °C → 466.9 → 467 °F; the limit 232 °C → 449.6 °F is converted, not rounded
    expect([by.flash!.unit, by.flash!.predicted, by.flash!.target, by.flash!.min]).toEqual(['°F', '467', '≥ 449.6', 449.6]);
    // pour −11.2 °C → 11.8 → 12 °F, limit −5 °C → 23 °F
    expect([by.pour!.unit, by.pour!.predicted, by.pour!.target, by.pour!.max]).toEqual(['°F', '12', '≤ 23', 23]);
    // aniline 118.2 °C → 244.8 → 245 °F; operating 60 °C → 140 °F
    expect([by.aniline!.unit, by.aniline!.predicted]).toEqual(['°F', '245']);
    expect(by.kvOperating!.property).toBe('Viscosity at 140 °F (calculated)');
    // a viscosity read off the line outside 40–100 °C says so, in either unit (core assessTemperature flags)
    const hot = qcReleaseTargets(320, { ...p, operating: { tempC: 110, kv: 16, extrapolated: true, outsideBand: false } });
    expect(hot.find((r) => r.key === 'kvOperating')!.property).toBe('Viscosity at 110 °C (calculated; extrapolated)');
    const far = qcReleaseTargets(320, { ...p, operating: { tempC: 160, kv: 7, extrapolated: true, outsideBand: true } }, { temperatureUnit: 'F' });
    expect(far.find((r) => r.key === 'kvOperating')!.property).toBe('Viscosity at 320 °F (calculated; outside −20…150 °C, not to be trusted)');
    // The standard test temperatures stay in °C; verdicts do not change with the unit.
    expect(by.kv40!.property).toBe('Kinematic viscosity at 40 °C');
    expect(rows.map((r) => r.predictedOutsideTarget)).toEqual(
      qcReleaseTargets(320, p, { specification: spec }).map((r) => r.predictedOutsideTarget),
    );
  });

  it('flags a prediction that prints outside its printed °F limit, though it passes as rounded in °C (property hunt, s25)', () => {
    // Flash 218.6 °C, limit ≥ 219 °C: in °C it prints 219 against ≥ 219 (rounded as printed: passes).
    // In °F (t_F = 9/5·t_C + 32, common practice, no source) it prints 425 against ≥ 426.2 — flagged now;
    // before, the °C verdict was copied and the sheet showed 425 °F under ≥ 426.2 °F without a flag.
    const spec = { ...BLANK_SPECIFICATION, flashMin: 219 };
    const near = { ...p, flashPoint: 218.6 };
    const c = qcReleaseTargets(320, near, { specification: spec }).find((r) => r.key === 'flash')!;
    expect([c.predicted, c.target, c.predictedOutsideTarget]).toEqual(['219', '≥ 219', false]);
    const f = qcReleaseTargets(320, near, { specification: spec, temperatureUnit: 'F' }).find((r) => r.key === 'flash')!;
    expect([f.predicted, f.target, f.predictedOutsideTarget]).toEqual(['425', '≥ 426.2', true]);
  });

  it('prints a prediction beside its limit with the digits that put it on the side of its verdict (s25 polish)', () => {
    // Before: ν100 22.1236 printed "22.12" under "≥ 22.1234" without a flag (it passes), and 22.1299 printed
    // "22.13" flagged outside "≥ 22.13"; density 0.87999 printed "0.8800" flagged outside "≥ 0.8800".
    // Values and limits invented (common practice (no source)); the usual digits are kept otherwise.
    const spec = { ...BLANK_SPECIFICATION, kv100Min: 22.1234, density15Min: 0.88 };
    const row = (q: Partial<typeof p>, sp = spec) => Object.fromEntries(qcReleaseTargets(320, { ...p, ...q }, { specification: sp }).map((r) => [r.key, r]));
    const pass = row({ kv100: 22.1236 });
    expect([pass.kv100!.predicted, pass.kv100!.target, pass.kv100!.predictedOutsideTarget]).toEqual(['22.124', '≥ 22.1234', false]);
    const miss = row({ kv100: 22.1299 }, { ...spec, kv100Min: 22.13 });
    expect([miss.kv100!.predicted, miss.kv100!.target, miss.kv100!.predictedOutsideTarget]).toEqual(['22.1299', '≥ 22.13', true]);
    const dense = row({ density15: 0.87999 });
    expect([dense.density15!.predicted, dense.density15!.target, dense.density15!.predictedOutsideTarget]).toEqual(['0.87999', '≥ 0.8800', true]);
    const clear = row({ kv100: 24.5, density15: 0.8912 });
    expect([clear.kv100!.predicted, clear.density15!.predicted]).toEqual(['24.50', '0.8912']);
  });

  it('reports rather than invents targets for missing estimates', () => {
    const rows = qcReleaseTargets(320, { ...p, reportedVi: null, flashPoint: null, pourPoint: null, operating: null });
    const by = Object.fromEntries(rows.map((r) => [r.key, r]));
    expect(by.flash!.target).toBe('Per specification');
    expect(by.vi!.predicted).toBe('—');
    expect(by.kvOperating).toBeUndefined();
  });

  it('never prints a release limit looser than the specification (a °F limit is converted, not rounded to whole degrees)', () => {
    // t_F = 9/5·t_C + 32 (common practice, no source): 219 °C → 426.2 °F, −8 °C → 17.6 °F.
    // Rounded to whole degrees these printed "≥ 426" and "≤ 18", limits a batch at 218.9 °C or −7.8 °C would pass.
    const spec = { ...BLANK_SPECIFICATION, flashMin: 219, pourMax: -8 };
    const rows = qcReleaseTargets(320, p, { temperatureUnit: 'F', specification: spec });
    const by = Object.fromEntries(rows.map((r) => [r.key, r]));
    expect([by.flash!.target, by.pour!.target]).toEqual(['≥ 426.2', '≤ 17.6']);
    expect([by.flash!.min, by.pour!.max]).toEqual([426.2, 17.6]);
    // A whole-degree limit still prints whole; a limit typed in °F (stored in °C to 12 significant
    // figures) prints as typed: 425 °F → 218.333333333 °C → 425 °F.
    const typedF = qcReleaseTargets(320, p, { temperatureUnit: 'F', specification: { ...spec, flashMin: 218.333333333, pourMax: -5 } });
    expect(typedF.find((r) => r.key === 'flash')!.target).toBe('≥ 425');
    expect(typedF.find((r) => r.key === 'pour')!.target).toBe('≤ 23');
    // In °C a limit with more decimals than the row prints is shown as entered (common practice, no source).
    const c = Object.fromEntries(
      qcReleaseTargets(320, p, { specification: { ...spec, flashMin: 219.4, viMin: 89.5, kv100Min: 22.125, kv100Max: 26.004 } }).map((r) => [r.key, r.target]),
    );
    expect([c.flash, c.vi, c.kv100]).toEqual(['≥ 219.4', '≥ 89.5', '22.125–26.004']);
    // Beyond two extra decimals a limit is rounded inward: a minimum up, a maximum down.
    expect(limitText(14.12341, 14.98769, 2)).toBe('14.1235–14.9876');
    expect(limitText(null, -7.77777, 0, (x, d) => x.toFixed(d).replace('.', ','))).toBe('≤ -7,78');
  });
});

describe('blendSheetCsvRows and cautions', () => {
  it('exports the component table with a totals row, prices only on request', () => {
    const lib = [comp('a', 'group-ii', 100, 0.865, 1.2), comp('b', 'group-i', 460, 0.9, 1.0)];
    const s = buildBlendSheet(lib, recipe([['a', 0.6], ['b', 0.4]]), { kg: 1000 });
    const plant = blendSheetCsvRows(s);
    expect(Object.keys(plant[0]!)).toEqual([
      'Charge order', 'Code', 'Name', 'Category', 'Mass %', 'Volume %', 'kg', 'Litres at 15 °C', 'Running total kg',
    ]);
    expect(plant.at(-1)).toMatchObject({ Code: 'TOTAL', kg: { value: 1000, decimals: 1 }, 'Mass %': { value: 100, decimals: 2 } });
    expect(plant[0]!.kg).toEqual({ value: 400, decimals: 1 });
    const costing = blendSheetCsvRows(s, { includePrices: true });
    // 0.6 × 1.2 + 0.4 × 1.0 = 1.12 per kg × 1000 kg = 1120.00, by hand (check-values D2 form)
    expect(costing.at(-1)!['Line cost (EUR)']).toMatchObject({ decimals: 2 });
    expect((costing.at(-1)!['Line cost (EUR)'] as { value: number }).value).toBeCloseTo(1120, 9);
  });

  it('exports the heel already in the vessel as its first line, the running totals counting it as the printed sheet does (plant loop defect hunt)', () => {
    const lib = [comp('a', 'group-ii', 100, 0.865, 1.2), comp('b', 'group-i', 460, 0.9, 1.0)];
    // the additions of a 1000 kg batch on a 250 kg heel: 750 kg
    const s = buildBlendSheet(lib, recipe([['a', 0.6], ['b', 0.4]]), { kg: 750 });
    const rows = blendSheetCsvRows(s, { heel: { kg: 250, litres: 250 / 0.88, description: 'previous batch, lot 2291' } });
    expect(rows[0]).toMatchObject({ 'Charge order': 0, Code: 'HEEL', Category: 'in vessel', 'Mass %': null, kg: { value: 250, decimals: 1 } });
    expect(rows[0]!.Name).toBe('Heel already in the vessel (previous batch, lot 2291)');
    // 250 / 0.88 = 284.09 L at 15 °C, by hand; carried as printed, to the sheet's 0.1 L
    expect(rows[0]!['Litres at 15 °C']).toEqual({ value: 284.1, decimals: 1 });
    expect(rows[0]!['Running total kg']).toEqual({ value: 250, decimals: 1 });
    // heel 250 + b 300 (charged first, heaviest) = 550, by hand
    expect(rows[1]).toMatchObject({ Code: 'B', 'Running total kg': { value: 550, decimals: 1 } });
    const total = rows.at(-1)!;
    expect(total).toMatchObject({ Code: 'TOTAL ADDED', kg: { value: 750, decimals: 1 }, 'Running total kg': { value: 1000, decimals: 1 } });
    // without a heel nothing changes
    expect(blendSheetCsvRows(s, { heel: { kg: 0, litres: 0, description: '' } })).toEqual(blendSheetCsvRows(s));
  });

  it('with a heel, the heel line + the additions = the batch ordered as printed, even when the heel sits on a rounding tie (property hunt, s25)', () => {
    const lib = [comp('a', 'group-ii', 100, 0.865, 1.2), comp('b', 'group-i', 460, 0.9, 1.0)];
    const r = recipe([['a', 0.6], ['b', 0.4]]);
    // 150 000 kg ordered on a 2000.5 kg heel (whole kg printed from 100 000 kg): hand arithmetic —
    // heel 2000.5 → 2001, so the additions print 147 999 (0.6/0.4 of 147 999.5: 88 799.7 → 88 799, 59 199.8 → 59 200).
    // Before: additions 148 000 and a batch of 150 001 kg (heel 2001 + 148 000), one more than ordered.
    const big = buildBlendSheet(lib, r, { kg: 150_000 - 2000.5 }, { heel: { kg: 2000.5, litres: 2000.5 / 0.88 } });
    expect(big.quantityDecimals).toBe(0);
    expect(big.heel).toMatchObject({ kg: 2001, kgExact: 2000.5 });
    expect(big.totalKg).toBe(147_999);
    expect(big.rows.map((x) => x.kg)).toEqual([59_200, 88_799]);
    expect(big.batchKg).toBe(150_000);
    // 10 000.0 kg on a 2000.25 kg heel: heel 2000.3, additions 7999.7 (before 7999.8: 10 000.1 kg in all)
    const s = buildBlendSheet(lib, r, { kg: 10_000 - 2000.25 }, { heel: { kg: 2000.25, litres: 2000.25 / 0.88 } });
    expect(s.heel!.kg).toBe(2000.3);
    expect(s.totalKg).toBe(7999.7);
    expect(s.batchKg).toBe(10_000);
    // litres: 2000.25 / 0.88 = 2273.01 L → 2273.0; the column takes the rest of the whole batch's litres
    expect(s.heel!.litres).toBe(2273);
    expect(Math.round((s.heel!.litres + s.totalLitres) * 10)).toBe(Math.round(s.batchLitres * 10));
    const csv = blendSheetCsvRows(s, { heel: { kg: 2000.25, litres: 2000.25 / 0.88, description: '' } });
    expect(csv[0]!.kg).toEqual({ value: 2000.3, decimals: 1 });
    expect((csv.at(-1)!['Running total kg'] as { value: number }).value).toBeCloseTo(10_000, 9);
    expect(() => buildBlendSheet(lib, r, { kg: 100 }, { heel: { kg: -1, litres: 0 } })).toThrow(BlendbenchInputError);
  });

  it('says laboratory confirmation is required and defers to SDS and site procedures', () => {
    const text = BLEND_SHEET_CAUTIONS.join(' ');
    expect(text).toMatch(/Laboratory confirmation/);
    expect(text).toMatch(/safety data sheet/);
    expect(text).toMatch(/hydrogen sulfide/);
  });
});

describe('litres at the metering temperature (issue 13 §8)', () => {
  it('adds a column by ASTM D1250-80 Table 54D that sums to its total', async () => {
    const { buildBlendSheet } = await import('../../../src/core/sheet/blend-sheet');
    const { densityAtTemperature } = await import('../../../src/core/blending/density-temperature');
    const { makeComponent, STOCKS } = await import('../../helpers/formulation-fixtures');
    const lib = [makeComponent(STOCKS.g2heavy!), makeComponent(STOCKS.g2hv!), makeComponent(STOCKS.add!)];
    const recipe = {
      id: 'r', name: 'invented', grade: 320, revision: 1, isReference: false, notes: '', updatedAt: '2024-01-01T00:00:00Z',
      lines: [
        { componentId: 'g2heavy', massFraction: 0.4 },
        { componentId: 'g2hv', massFraction: 0.58 },
        { componentId: 'add', massFraction: 0.02 },
      ],
    } as unknown as Parameters<typeof buildBlendSheet>[1];
    const sheet = buildBlendSheet(lib, recipe, { kg: 10000 }, { meteringTempC: 60 });
    expect(sheet.metering!.tempC).toBe(60);
    // identity: each line kg / ρ(60 °C) by Table 54D, rounded to the sheet's decimals; the column adds up
    const row = sheet.rows.find((r) => r.componentId === 'g2hv')!;
    expect(Math.abs(row.litresAtMetering! - 5800 / densityAtTemperature(0.885, 60))).toBeLessThanOrEqual(0.1);
    const sum = sheet.rows.reduce((s, r) => s + r.litresAtMetering!, 0);
    expect(Math.abs(sum - sheet.metering!.totalLitres)).toBeLessThan(1e-6);
    expect(sheet.metering!.totalLitres).toBeGreaterThan(sheet.totalLitres);
    expect(buildBlendSheet(lib, recipe, { kg: 10000 }).metering).toBeNull();
  });

  it('the CSV export carries the column, its header naming the temperature, and its total', async () => {
    const { buildBlendSheet, blendSheetCsvRows } = await import('../../../src/core/sheet/blend-sheet');
    const { makeComponent, STOCKS } = await import('../../helpers/formulation-fixtures');
    const lib = [makeComponent(STOCKS.g2heavy!), makeComponent(STOCKS.g2hv!)];
    const recipe = {
      id: 'r', name: 'invented', grade: 320, revision: 1, isReference: false, notes: '', updatedAt: '2024-01-01T00:00:00Z',
      lines: [
        { componentId: 'g2heavy', massFraction: 0.4 },
        { componentId: 'g2hv', massFraction: 0.6 },
      ],
    } as unknown as Parameters<typeof buildBlendSheet>[1];
    const sheet = buildBlendSheet(lib, recipe, { kg: 10000 }, { meteringTempC: 60 });
    const rows = blendSheetCsvRows(sheet);
    expect(Object.keys(rows[0]!)).toEqual([
      'Charge order', 'Code', 'Name', 'Category', 'Mass %', 'Volume %', 'kg', 'Litres at 15 °C', 'Litres at 60 °C (metering)', 'Running total kg',
    ]);
    // identity: the CSV cells are the sheet's displayed values (same decimals), the total row the column's total
    sheet.rows.forEach((r, i) => expect(rows[i]!['Litres at 60 °C (metering)']).toEqual({ value: r.litresAtMetering, decimals: sheet.quantityDecimals }));
    expect(rows.at(-1)!['Litres at 60 °C (metering)']).toEqual({ value: sheet.metering!.totalLitres, decimals: sheet.quantityDecimals });
    // a plant metering at 15 °C still gets two distinct columns; a fractional temperature keeps its decimal
    const at15 = blendSheetCsvRows(buildBlendSheet(lib, recipe, { kg: 10000 }, { meteringTempC: 15 }));
    expect(Object.keys(at15[0]!)).toContain('Litres at 15 °C (metering)');
    const at575 = blendSheetCsvRows(buildBlendSheet(lib, recipe, { kg: 10000 }, { meteringTempC: 57.5 }));
    expect(Object.keys(at575[0]!)).toContain('Litres at 57.5 °C (metering)');
    // without a metering temperature the export is as before
    expect(Object.keys(blendSheetCsvRows(buildBlendSheet(lib, recipe, { kg: 10000 }))[0]!)).not.toContain('Litres at 60 °C (metering)');
  });
});
