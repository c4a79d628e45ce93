import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { batchQuantities, blendCostPerKg, blendCostPerLitre, pricePerKg } from '../../../src/core/formulation/cost';
import { blendDensity, massToVolumeFractions, volumeToMassFractions } from '../../../src/core/blending/density';
import {
  BlendbenchInputError,
  FractionSumError,
  ImplausibleDensityError,
  InvalidNumberError,
} from '../../../src/core/errors';
import { expectClose, expectRelClose, isClose } from '../../helpers/tolerance';

const d1 = [
  { massFraction: 0.6, density15: 0.865 },
  { massFraction: 0.4, density15: 0.9 },
];

describe('density by ideal mixing', () => {
  it('D1: 0.6 at 0.865 + 0.4 at 0.900 kg/L → 0.87867 kg/L', () => {
    // common practice, ideal mixing 1/ρ = Σ wᵢ/ρᵢ (tests/reference/check-values.md D1)
    expectClose(blendDensity(d1), 0.87867, 1e-5);
  });

  it('mass ↔ volume fractions', () => {
    // ideal mixing φᵢ = wᵢ·ρ_blend/ρᵢ (common practice, check-values.md D1)
    const phi = massToVolumeFractions(d1);
    expectClose(phi[0]!, (0.6 * blendDensity(d1)) / 0.865, 1e-12);
    expectClose(phi[0]! + phi[1]!, 1, 1e-12);
    const w = volumeToMassFractions([
      { volumeFraction: phi[0]!, density15: 0.865 },
      { volumeFraction: phi[1]!, density15: 0.9 },
    ]);
    expectClose(w[0]!, 0.6, 1e-12);
    expectClose(w[1]!, 0.4, 1e-12);
  });

  it('mass → volume → mass round-trips (property)', () => {
    // inverse conversions under ideal mixing (identity)
    const partsArb = fc
      .array(fc.tuple(fc.double({ min: 0.01, max: 1, noNaN: true }), fc.double({ min: 0.6, max: 1.3, noNaN: true })), {
        minLength: 1,
        maxLength: 6,
      })
      .map((ps) => {
        const t = ps.reduce((s, [w]) => s + w, 0);
        return ps.map(([w, rho]) => ({ massFraction: w / t, density15: rho }));
      });
    fc.assert(
      fc.property(partsArb, (parts) => {
        const phi = massToVolumeFractions(parts);
        const back = volumeToMassFractions(parts.map((p, i) => ({ volumeFraction: phi[i]!, density15: p.density15 })));
        return back.every((w, i) => isClose(w, parts[i]!.massFraction, 1e-12, 1e-15));
      }),
    );
  });

  it('rejects implausible densities and bad fractions', () => {
    expect(() => blendDensity([{ massFraction: 1, density15: 865 }])).toThrow(ImplausibleDensityError);
    expect(() => blendDensity([{ massFraction: 1, density15: 865 }])).toThrow(
      /blendDensity: parts\[0\]\.density15 = 865 kg\/L is outside the plausible range 0\.6–1\.3/,
    );
    expect(() => blendDensity([{ massFraction: 1, density15: 0.5 }])).toThrow(ImplausibleDensityError);
    expect(() => blendDensity([{ massFraction: 0.9, density15: 0.87 }])).toThrow(FractionSumError);
    expect(() => volumeToMassFractions([{ volumeFraction: Number.NaN, density15: 0.87 }])).toThrow(InvalidNumberError);
  });
});

describe('cost', () => {
  it('price per kg from each basis', () => {
    // per litre ÷ ρ15, per tonne ÷ 1000 (common practice, no source)
    expect(pricePerKg({ amount: 2, basis: 'per-kg', currency: 'EUR' }, 0.9)).toBe(2);
    expectClose(pricePerKg({ amount: 1.8, basis: 'per-litre', currency: 'EUR' }, 0.9), 2, 1e-12);
    expectClose(pricePerKg({ amount: 1500, basis: 'per-tonne', currency: 'EUR' }, 0.9), 1.5, 1e-12);
    expect(() => pricePerKg({ amount: -1, basis: 'per-kg', currency: 'EUR' }, 0.9)).toThrow(BlendbenchInputError);
  });

  it('D2: cost per litre = ρ_blend·Σ wᵢ·priceᵢ = Σ φᵢ·price per litreᵢ', () => {
    // common practice (tests/reference/check-values.md D2), exact up to float rounding
    const parts = [
      { massFraction: 0.6, density15: 0.865, pricePerKg: 1.1 },
      { massFraction: 0.4, density15: 0.9, pricePerKg: 1.9 },
    ];
    const perKg = blendCostPerKg(parts);
    expectClose(perKg, 0.6 * 1.1 + 0.4 * 1.9, 1e-12);
    const perL = blendCostPerLitre(parts);
    expectRelClose(perL, blendDensity(parts) * perKg, 1e-14);
    const phi = massToVolumeFractions(parts);
    expectRelClose(perL, phi[0]! * 1.1 * 0.865 + phi[1]! * 1.9 * 0.9, 1e-12);
  });

  it('batch quantities in kg and in litres at 15 °C', () => {
    // ideal mixing: line kg = wᵢ·total, line L = kg/ρᵢ, Σ lines L = total L (common practice, check-values.md D1)
    const byKg = batchQuantities(d1, { kg: 10000 });
    expect(byKg.totalKg).toBe(10000);
    expectRelClose(byKg.totalLitres, 10000 / blendDensity(d1), 1e-12);
    expectClose(byKg.lines[0]!.kg, 6000, 1e-9);
    expectClose(byKg.lines[1]!.litres, 4000 / 0.9, 1e-9);
    expectRelClose(byKg.lines[0]!.litres + byKg.lines[1]!.litres, byKg.totalLitres, 1e-12);
    const byL = batchQuantities(d1, { litres: 1000 });
    expect(byL.totalLitres).toBe(1000);
    expectRelClose(byL.totalKg, 1000 * blendDensity(d1), 1e-12);
    expectRelClose(byL.lines[0]!.litres + byL.lines[1]!.litres, 1000, 1e-12);
    expect(() => batchQuantities(d1, { kg: 0 })).toThrow(BlendbenchInputError);
  });
});
