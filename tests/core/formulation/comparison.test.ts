import { describe, expect, it } from 'vitest';
import { compareRecipes } from '../../../src/core/formulation/comparison';
import { predictBlend } from '../../../src/core/formulation/blend-properties';
import { makeComponent, STOCKS, stock } from '../../helpers/formulation-fixtures';
import { expectClose } from '../../helpers/tolerance';

// Invented stocks with generic typicals (base-stock-typicals.md, from memory)
const lib = [
  { ...stock('g1bs'), availability: 'withdrawn' as const },
  stock('g1sn600'),
  stock('g2heavy'),
  stock('g2hv'),
  stock('an12'),
  stock('add'),
  makeComponent({ ...STOCKS.pib!, id: 'pma', shearLossPct: 30 }),
];
const reference = [
  { componentId: 'g1bs', massFraction: 0.6 },
  { componentId: 'g1sn600', massFraction: 0.38 },
  { componentId: 'add', massFraction: 0.02 },
];
const candidate = [
  { componentId: 'g2hv', massFraction: 0.6 },
  { componentId: 'g2heavy', massFraction: 0.28 },
  { componentId: 'an12', massFraction: 0.1 },
  { componentId: 'add', massFraction: 0.02 },
];
const base = { components: lib, reference, candidate, grade: 220, operatingTempC: 65, coldTempC: -10 };

describe('compareRecipes', () => {
  it('writes the summary in the display format: decimal comma, °F (temperatures and differences)', () => {
    const comma = (x: number, d: number) => x.toFixed(d).replace('.', ',');
    const c = compareRecipes({ ...base, display: { formatNumber: comma, temperatureUnit: 'F' } });
    const text = c.summary.join('\n');
    // every temperature in °F but the litre's: 15 °C is the volume tables' reference (ASTM D1250 / ISO 91),
    // named so in every unit, as the designer and the blend sheet name it
    expect(text.replace(/litre at 15 °C/g, '')).not.toMatch(/°C/);
    expect(text).not.toMatch(/\d\.\d/);
    // 65 °C = 149 °F and −10 °C = 14 °F (t_F = 9/5·t_C + 32, definition of the Fahrenheit scale)
    expect(text).toMatch(/Viscosity at 149 °F \(operating\)/);
    // −10 °C lies outside the measured 40–100 °C: flagged as extrapolated (core assessTemperature)
    expect(text).toMatch(/Viscosity at 14 °F \(cold-start; extrapolated\)/);
    // cost per litre names the temperature of its litres: the tables' 15 °C (not 59 °F, which is no reference)
    expect(text).toMatch(/Cost per litre at 15 °C /);
    expect(text).not.toMatch(/59 °F/);
    const far = compareRecipes({ ...base, coldTempC: -30 }).summary.join('\n');
    expect(far).toMatch(/Viscosity at -30 °C \(cold-start; outside -20…150 °C, not to be trusted\)/);
    // A difference converts by 9/5 only (no offset), by definition.
    const dF = (c.anilinePoint.delta! * 9) / 5;
    expect(text).toContain(`Aniline point ${dF > 0 ? '+' : '−'}${comma(Math.abs(dF), 1)} °F`);
  });

  it('reports every difference as candidate − reference from the core predictions', () => {
    // identity: Δ = candidate − reference of predictBlend's values (same rule and temperatures)
    const c = compareRecipes(base);
    const r = predictBlend(lib, reference, { operatingTempC: 65, coldTempC: -10 });
    const k = predictBlend(lib, candidate, { operatingTempC: 65, coldTempC: -10 });
    expectClose(c.costPerLitre.delta!, k.costPerLitre! - r.costPerLitre!, 1e-12);
    expectClose(c.vi.delta!, k.vi! - r.vi!, 1e-12);
    expectClose(c.anilinePoint.delta!, k.anilinePoint!.value - r.anilinePoint!.value, 1e-12);
    expectClose(c.kvAtOperating.delta!, k.kvAtOperating!.kv - r.kvAtOperating!.kv, 1e-9);
    expectClose(c.kvAtCold.delta!, k.kvAtCold!.kv - r.kvAtCold!.kv, 1e-9);
    expect(c.kvAtCold.tempC).toBe(-10);
    expectClose(c.costPerLitre.deltaPct!, (100 * c.costPerLitre.delta!) / r.costPerLitre!, 1e-9);
  });

  it('a Group II replacement is more stable and less solvent than the Group I original', () => {
    // check-values.md §6: deeper refining buys oxidation stability and costs solvency
    const c = compareRecipes(base);
    expect(c.oxidation.change).toBe('better');
    expect(c.anilinePoint.delta!).toBeGreaterThan(0);
    expect(c.summary.join(' ')).toMatch(/Oxidation stability better/);
    expect(c.summary.at(-1)).toMatch(/laboratory confirmation/);
  });

  it('comparing a recipe with itself gives zero differences and no changes', () => {
    // identity
    const c = compareRecipes({ ...base, candidate: reference });
    expect(c.costPerLitre.delta).toBe(0);
    expect(c.vi.delta).toBe(0);
    expect(c.oxidation.change).toBe('same');
    expect(c.deposit.change).toBe('same');
    expect(c.solvency.change).toBe('same');
  });

  it('flags a candidate that leaves the grade after shear', () => {
    // ISO 3448 VG 320 band 288–352 (check-values.md G2); 30 % KRL loss (base-stock-typicals.md, from memory)
    const cand = [
      { componentId: 'g2heavy', massFraction: 0.66 },
      { componentId: 'pma', massFraction: 0.32 },
      { componentId: 'add', massFraction: 0.02 },
    ];
    const ref = [
      { componentId: 'g2hv', massFraction: 0.5 },
      { componentId: 'g2heavy', massFraction: 0.48 },
      { componentId: 'add', massFraction: 0.02 },
    ];
    const c = compareRecipes({ ...base, grade: 320, reference: ref, candidate: cand });
    expect(c.shear.candidate.inGradeAfter).toBe(false);
    expect(c.summary.join(' ')).toMatch(/candidate falls out of VG 320 after shear/);
  });

  it('rejects empty recipes', () => {
    expect(() => compareRecipes({ ...base, candidate: [] })).toThrow(/candidate/);
  });

  it('never subtracts a cost in one currency from a cost in another', () => {
    // the reference's base stocks quoted in USD (no rate applied), everything else in the fixtures' currency
    const usd = lib.map((c) => (c.id === 'g1bs' || c.id === 'g1sn600' ? { ...c, price: { ...c.price, currency: 'USD' } } : c));
    const refOnly = [{ componentId: 'g1bs', massFraction: 0.6 }, { componentId: 'g1sn600', massFraction: 0.4 }];
    const c = compareRecipes({ ...base, components: usd, reference: refOnly });
    expect(c.reference.properties.currency).toBe('USD');
    expect(c.candidate.properties.currency).not.toBe('USD');
    expect(c.costPerLitre.reference).not.toBeNull();
    expect(c.costPerLitre.candidate).not.toBeNull();
    expect(c.costPerLitre.delta).toBeNull();
    expect(c.costPerLitre.deltaPct).toBeNull();
    expect(c.summary[0]).toBe('Cost per litre at 15 °C not compared (prices in different currencies or missing).');
  });
});
