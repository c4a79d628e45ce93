/**
 * Property-based checks of the blend sheet's quantities (`sheet/blend-sheet.ts`): random recipes,
 * batch sizes in kg or litres, heels already in the vessel. The rule checked is the module's own:
 * every printed column adds up to its printed total (largest remainder, common practice (no source)),
 * and with a heel the heel line + the column = the whole batch as printed (the batch ordered, rounded).
 * Invariants only; seeds fixed so CI is deterministic.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { blendSheetCsvRows, buildBlendSheet, largestRemainderUnits, qcReleaseTargets, type CsvFixed } from '../../../src/core/sheet/blend-sheet';
import { BLANK_SPECIFICATION } from '../../../src/core/formulation/model';
import { sheetComponent, sheetRecipe } from './fixtures';
import type { Component, ComponentCategory, Recipe } from '../../../src/core/formulation/model';

const NUM_RUNS = Number(process.env.PROP_RUNS ?? 300);

/** An invented component (tests/core/sheet/fixtures.ts). */
const comp = (id: string, category: ComponentCategory, kv40: number, density15: number): Component =>
  sheetComponent(id, category, kv40, density15, { code: `BW-${id}`, price: { amount: 1.2, basis: 'per-kg', currency: 'EUR' } });

const recipeOf = (fractions: readonly number[]): Recipe =>
  sheetRecipe(fractions.map((f, i) => [`c${i}`, f] as const), { name: 'Invented property recipe', revision: 1 });

const cats: ComponentCategory[] = ['group-i', 'group-ii', 'group-iii', 'group-iv', 'group-v', 'polymer', 'additive-package'];

const caseArb = fc.record({
  weights: fc.array(fc.integer({ min: 1, max: 10_000 }), { minLength: 1, maxLength: 9 }),
  densities: fc.array(fc.double({ min: 0.8, max: 1.1, noNaN: true }), { minLength: 9, maxLength: 9 }),
  /** A batch size as typed: up to two decimals (weighed or metered), or any number. */
  size: fc.oneof(fc.integer({ min: 1, max: 50_000_000 }).map((n) => n / 100), fc.double({ min: 0.5, max: 600_000, noNaN: true })),
  inLitres: fc.boolean(),
  /** The heel as a share of the batch; its mass typed to up to three decimals (ties at the printed rounding). */
  heelShare: fc.option(fc.double({ min: 0.0005, max: 0.95, noNaN: true }), { nil: null }),
  heelDecimals: fc.integer({ min: 0, max: 3 }),
  heelDensity: fc.double({ min: 0.82, max: 0.98, noNaN: true }),
  meteringTempC: fc.option(fc.double({ min: 0, max: 90, noNaN: true }), { nil: undefined }),
});

const units = (x: number, qd: number) => Math.round(x * 10 ** qd);
const sumUnits = (xs: readonly number[], qd: number) => xs.reduce((t, x) => t + units(x, qd), 0);

describe('buildBlendSheet — printed quantities add up (properties)', () => {
  it('every column sums to its printed total, each line within one printed unit of its exact quantity, the total the batch ordered', () => {
    fc.assert(
      fc.property(caseArb, (k) => {
        const lib = k.weights.map((_, i) => comp(`c${i}`, cats[i % cats.length]!, 30 + 97 * i, k.densities[i]!));
        const w = k.weights.reduce((a, b) => a + b, 0);
        const s = buildBlendSheet(lib, recipeOf(k.weights.map((x) => x / w)), k.inLitres ? { litres: k.size } : { kg: k.size }, k.meteringTempC === undefined ? {} : { meteringTempC: k.meteringTempC });
        const qd = s.quantityDecimals;
        expect(sumUnits(s.rows.map((r) => r.kg), qd)).toBe(units(s.totalKg, qd));
        expect(sumUnits(s.rows.map((r) => r.litres), qd)).toBe(units(s.totalLitres, qd));
        expect(sumUnits(s.rows.map((r) => r.massPct), s.percentDecimals)).toBe(units(100, s.percentDecimals));
        expect(sumUnits(s.rows.map((r) => r.volumePct), s.percentDecimals)).toBe(units(100, s.percentDecimals));
        if (s.metering) expect(sumUnits(s.rows.map((r) => r.litresAtMetering!), qd)).toBe(units(s.metering.totalLitres, qd));
        expect(units(k.inLitres ? s.totalLitres : s.totalKg, qd)).toBe(units(k.size, qd));
        expect(units(s.rows.at(-1)!.runningKg, qd)).toBe(units(s.totalKg, qd));
        s.rows.forEach((r, i) => {
          expect(r.kg).toBeGreaterThanOrEqual(0);
          const exact = r.massFraction * s.totalKgExact;
          expect(Math.abs(r.kg - exact) * 10 ** qd).toBeLessThanOrEqual(1 + 1e-6);
          if (i > 0) expect(r.runningKg).toBeGreaterThanOrEqual(s.rows[i - 1]!.runningKg);
        });
        expect(s.heel).toBeNull();
        expect(s.batchKg).toBe(s.totalKg);
      }),
      { seed: 25_201, numRuns: NUM_RUNS },
    );
  });

  it('with a heel in the vessel, heel line + column = the whole batch as printed = the batch ordered, in kg and litres, on the sheet and in the CSV', () => {
    fc.assert(
      fc.property(caseArb, (k) => {
        fc.pre(k.heelShare !== null);
        const lib = k.weights.map((_, i) => comp(`c${i}`, cats[i % cats.length]!, 30 + 97 * i, k.densities[i]!));
        const w = k.weights.reduce((a, b) => a + b, 0);
        const recipe = recipeOf(k.weights.map((x) => x / w));
        // The batch ordered in kg; the heel typed to `heelDecimals` decimals (e.g. 2000.25 kg on a 10 000.0 kg sheet).
        const M = k.size;
        const scale = 10 ** k.heelDecimals;
        const heelKg = Math.round(k.heelShare! * M * scale) / scale;
        fc.pre(heelKg > 0 && heelKg < M);
        const heelLitres = heelKg / k.heelDensity;
        const s = buildBlendSheet(lib, recipe, { kg: M - heelKg }, { heel: { kg: heelKg, litres: heelLitres } });
        const qd = s.quantityDecimals;
        expect(s.heel).not.toBeNull();
        // heel line + the column's printed total = the batch printed = the batch ordered, rounded
        expect(units(s.heel!.kg, qd) + sumUnits(s.rows.map((r) => r.kg), qd)).toBe(units(s.batchKg, qd));
        expect(units(s.batchKg, qd)).toBe(units(M, qd));
        expect(units(s.heel!.litres, qd) + sumUnits(s.rows.map((r) => r.litres), qd)).toBe(units(s.batchLitres, qd));
        expect(units(s.batchLitres, qd)).toBe(units(s.totalLitresExact + heelLitres, qd));
        expect(Math.abs(s.heel!.kg - heelKg) * 10 ** qd).toBeLessThanOrEqual(0.5 + 1e-9);
        // the decimals follow the whole batch (tank batches of 100 000 kg and more print whole kg)
        expect(qd).toBe(M < 100 ? 2 : M < 100_000 ? 1 : 0);
        // CSV: the heel line, the additions, and the running total ending at the batch
        const csv = blendSheetCsvRows(s, { heel: { kg: heelKg, litres: heelLitres, description: '' } });
        const val = (c: unknown) => Number((c as CsvFixed).value.toFixed((c as CsvFixed).decimals));
        const heelRow = csv[0]!;
        const totalRow = csv.at(-1)!;
        const addRows = csv.slice(1, -1);
        expect(units(val(heelRow.kg), qd) + sumUnits(addRows.map((r) => val(r.kg)), qd)).toBe(units(val(totalRow['Running total kg']), qd));
        expect(units(val(totalRow['Running total kg']), qd)).toBe(units(M, qd));
        expect(units(val(addRows.at(-1)!['Running total kg']), qd)).toBe(units(M, qd));
      }),
      { seed: 25_202, numRuns: NUM_RUNS },
    );
  });
});

describe('QC release targets — a prediction printed outside its printed limit is flagged (property)', () => {
  it('flash and pour, in °C and °F: the printed prediction against the printed limit never contradicts a missing flag', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 150, max: 320, noNaN: true }),
        fc.double({ min: -3, max: 3, noNaN: true }),
        fc.double({ min: -50, max: 10, noNaN: true }),
        fc.double({ min: -3, max: 3, noNaN: true }),
        fc.constantFrom('C' as const, 'F' as const),
        (flash, dFlash, pour, dPour, unit) => {
          // limits typed to one decimal, near the prediction
          const spec = { ...BLANK_SPECIFICATION, flashMin: Math.round((flash + dFlash) * 10) / 10, pourMax: Math.round((pour + dPour) * 10) / 10 };
          const p = { kv40: 320, kv100: 24, reportedVi: 95, density15: 0.88, anilinePoint: 120, flashPoint: flash, pourPoint: pour, operating: null };
          const rows = qcReleaseTargets(320, p, { specification: spec, temperatureUnit: unit });
          for (const r of rows.filter((x) => x.key === 'flash' || x.key === 'pour')) {
            const shown = Number(r.predicted);
            const out = (r.min !== null && shown < r.min) || (r.max !== null && shown > r.max);
            if (out) expect(r.predictedOutsideTarget, `${unit} ${r.key}: ${r.predicted} against ${r.target} not flagged`).toBe(true);
          }
        },
      ),
      { seed: 25_204, numRuns: 3000 },
    );
  });
});

describe('largestRemainderUnits — properties', () => {
  it('sums to the target (its own rounding, or one unit either side), no value moved by more than one unit (two when the target is one off), none negative', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: 0, max: 1e5, noNaN: true }), { minLength: 1, maxLength: 12 }),
        fc.integer({ min: 0, max: 3 }),
        fc.constantFrom(-1, 0, 1),
        (values, d, shift) => {
          const total = values.reduce((a, b) => a + b, 0);
          const target = Math.round(total * 10 ** d) + shift;
          fc.pre(target >= 0);
          const u = largestRemainderUnits(values, total, d, target);
          expect(u.reduce((a, b) => a + b, 0)).toBe(target);
          u.forEach((x, i) => {
            expect(x).toBeGreaterThanOrEqual(0);
            expect(Math.abs(x - values[i]! * 10 ** d)).toBeLessThanOrEqual(shift === 0 ? 1 + 1e-6 : 2 + 1e-6);
          });
        },
      ),
      { seed: 25_203, numRuns: 2000 },
    );
  });
});
