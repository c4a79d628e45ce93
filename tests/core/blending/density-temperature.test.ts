// Density at temperature — ASTM D1250-80 / ISO 91-1 Table 54D (lubricating oils). No copy of the
// printed table and no published Table 54D value was found: values are checked against the table's
// equation (formula); its constants and range against two independent open-source implementations
// (Zubastic120993/fuel_mcp, joe02740/energycal) and the 60 °F tables' per-°F constant (0.34878 × 1.8).
import { describe, expect, it } from 'vitest';
import {
  LUBE_OIL_TABLE_54D,
  blendDensityAtTemperature,
  densityAtTemperature,
  lubeTableInRange,
  lubeThermalExpansion15,
  lubeVolumeCorrectionFactor,
} from '../../../src/core/blending/density-temperature';
import { blendCostPerLitre, blendCostPerLitreAt, batchQuantities } from '../../../src/core/formulation/cost';
import { BlendbenchInputError } from '../../../src/core/errors';
import { expectClose, expectRelClose } from '../../helpers/tolerance';

describe('Table 54D (lubricating oils)', () => {
  it('constants agree with independent implementations of the tables', () => {
    // independent implementation: Zubastic120993/fuel_mcp, fuel_mcp/core/vcf_official_full.py, VCF_TABLES["54D"]:
    // K0 = 0.0, K1 = 0.6278, range (800.0, 1164.0) kg/m³
    expect(LUBE_OIL_TABLE_54D.K1).toBe(0.6278);
    expect(LUBE_OIL_TABLE_54D.K0).toBe(0);
    expect([LUBE_OIL_TABLE_54D.density15MinKgM3, LUBE_OIL_TABLE_54D.density15MaxKgM3]).toEqual([800, 1164]);
    // independent implementation: joe02740/energycal, src/lib/calc/REFERENCE.md §2.3 (API MPMS 11.1-2004),
    // lube oils K0 = 0, K1 = 0.34878 per °F: the same coefficient per °C is 0.34878 × 1.8 (to its 5 digits)
    expectClose(LUBE_OIL_TABLE_54D.K1, 0.34878 * 1.8, 1e-4);
  });

  it('α₁₅ and VCF by the table equation', () => {
    // formula, ASTM D1250-80 Table 54D: α = 0.6278/880 = 7.1341e-4 /°C; VCF = exp(−αΔt(1 + 0.8αΔt)), Δt = 45
    expectRelClose(lubeThermalExpansion15(0.88), 0.6278 / 880, 1e-12);
    const a = 0.6278 / 880;
    expectRelClose(lubeVolumeCorrectionFactor(0.88, 60), Math.exp(-a * 45 * (1 + 0.8 * a * 45)), 1e-12);
    expectClose(lubeVolumeCorrectionFactor(0.88, 60), 0.96761, 5e-6);
    expect(lubeVolumeCorrectionFactor(0.9, 15)).toBe(1); // identity at the reference temperature
    expect(lubeVolumeCorrectionFactor(0.9, 0)).toBeGreaterThan(1);
    expectClose(densityAtTemperature(0.88, 60), 0.8515, 1e-4);
  });

  it('range flags and input errors', () => {
    // Table 54D density range 800–1164 kg/m³ (as listed by fuel_mcp, vcf_official_full.py)
    expect(lubeTableInRange(0.88)).toBe(true);
    expect(lubeTableInRange(0.79)).toBe(false);
    expect(lubeTableInRange(1.2)).toBe(false);
    expect(() => lubeVolumeCorrectionFactor(0.88, 400)).toThrow(BlendbenchInputError);
    expect(() => lubeVolumeCorrectionFactor(880, 60)).toThrow(/density15/);
  });

  it('blend density at t by ideal mixing of corrected components; cost per litre at t', () => {
    // ideal mixing (check-values.md D1) at t with each ρᵢ(t) from Table 54D; D2 for cost per litre
    const parts = [
      { massFraction: 0.6, density15: 0.865, pricePerKg: 1.2 },
      { massFraction: 0.4, density15: 0.9, pricePerKg: 1.5 },
    ];
    const rho = blendDensityAtTemperature(parts, 60);
    expectRelClose(1 / rho, 0.6 / densityAtTemperature(0.865, 60) + 0.4 / densityAtTemperature(0.9, 60), 1e-12);
    expectRelClose(blendDensityAtTemperature(parts, 15), 0.87867, 1e-5); // D1 at 15 °C
    expectRelClose(blendCostPerLitreAt(parts, 15), blendCostPerLitre(parts), 1e-12);
    expectRelClose(blendCostPerLitreAt(parts, 60), rho * (0.6 * 1.2 + 0.4 * 1.5), 1e-12);
  });

  it('batch litres at the metering temperature', () => {
    // identity: kg / ρ(t) per line; totals add up under ideal mixing
    const q = batchQuantities([{ massFraction: 0.5, density15: 0.88 }, { massFraction: 0.5, density15: 1.05 }], { kg: 1000 }, 60);
    expectRelClose(q.lines[0]!.litresAtMetering!, 500 / densityAtTemperature(0.88, 60), 1e-12);
    expectRelClose(q.totalLitresAtMetering!, q.lines[0]!.litresAtMetering! + q.lines[1]!.litresAtMetering!, 1e-12);
    expect(q.totalLitresAtMetering!).toBeGreaterThan(q.totalLitres);
    expect(batchQuantities([{ massFraction: 1, density15: 0.9 }], { kg: 900 }).totalLitresAtMetering).toBeNull();
  });
});
