/**
 * The plain-number functions issue 2 requires from src/core/index.ts, called through the index as
 * other code and outside checks call them.
 */
import { describe, expect, it } from 'vitest';
import * as core from '../../src/core';
import { expectClose } from '../helpers/tolerance';

describe('public API (src/core/index.ts)', () => {
  it('exports the required functions', () => {
    for (const name of [
      'viscosityIndex',
      'reportedViscosityIndex',
      'viscosityAtTemperature',
      'temperatureForViscosity',
      'blendViscosityRefutas',
      'isoViscosityGrade',
    ] as const) {
      expect(typeof core[name]).toBe('function');
    }
  });

  it('answers with plain numbers', () => {
    // ASTM D2270 worked example (tests/reference/check-values.md V1)
    expectClose(core.viscosityIndex(73.3, 8.86), 92.43, 0.02);
    expect(core.reportedViscosityIndex(73.3, 8.86)).toBe(92);
    // formula, ASTM D341 (check-values.md W2, W1)
    expectClose(core.viscosityAtTemperature(220, 19.0, 80), 35.6, 0.01);
    expectClose(core.temperatureForViscosity(73.3, 8.86, 30.0826), 60, 0.01);
    // formula, Refutas (check-values.md B2)
    expectClose(
      core.blendViscosityRefutas([
        { massFraction: 0.5, kv: 100 },
        { massFraction: 0.5, kv: 460 },
      ]),
      203.39,
      0.05,
    );
    // standard, ISO 3448 (check-values.md G1)
    expect(core.isoViscosityGrade(198.0)).toBe(220);
    expect(core.isoViscosityGrade(197.9)).toBeNull();
    expect(() => core.viscosityIndex(10, 1.9)).toThrow(core.ViscosityOutOfRangeError); // D2270 scope (V9)
  });

  it('plans a line in plain numbers (planLinePlain, issue 11)', () => {
    // Two stocks to an exact target: heavy mass fraction 0.55126 ± 1e-4 (tests/reference/check-values.md B3)
    const r = core.planLinePlain({
      components: [
        { id: 'light', kv40: 100, kv100: 11, density15: 0.88, anilinePoint: 110, pricePerKg: 1.0 },
        { id: 'heavy', kv40: 460, kv100: 31, density15: 0.9, anilinePoint: 125, pricePerKg: 1.5 },
      ],
      grades: [{ id: 'VG 220', targetKv40: 220, tolerancePct: 0, demandKg: 1000 }],
    });
    expect(r.status).toBe('optimal');
    if (r.status === 'optimal') expectClose(r.grades[0]!.massFractions.heavy!, 0.55126, 1e-4);
  });
});

describe('public API — the QC loop (issue 12, item 6)', () => {
  const problem: core.PlainProblem = {
    components: [
      { id: 'light', kv40: 110, kv100: 12, density15: 0.872, anilinePoint: 121, pricePerKg: 1.15, kv40RelSd: 0.015 },
      { id: 'heavy', kv40: 460, kv100: 31, density15: 0.885, anilinePoint: 127, pricePerKg: 1.6, kv40RelSd: 0.015 },
    ],
    targetKv40: 320,
    tolerancePct: 5,
    minInBandProbability: 0.99,
    objective: 'cost',
  };

  it('solveBlendPlain takes kv40RelSd and minInBandProbability and reports inBandProbability', () => {
    const r = core.solveBlendPlain(problem);
    if (r.status !== 'optimal') throw new Error(r.reason);
    expect(r.inBandProbability!).toBeGreaterThanOrEqual(0.99);
    expectClose(core.inBandProbabilityPlain(problem, r.massFractions), r.inBandProbability!, 1e-12); // same model, two paths
    const without = core.solveBlendPlain({ ...problem, components: problem.components.map(({ kv40RelSd: _s, ...c }) => c), minInBandProbability: undefined });
    expect('inBandProbability' in without).toBe(false); // only when a spread is given (issue 12 item 6)
  });

  it('correctBatchPlain answers in kg', () => {
    const r = core.correctBatchPlain({
      vessel: { massKg: 10_000, kv40: 290, kv100: 22, density15: 0.88, anilinePoint: 120 },
      components: [{ ...problem.components[1]!, maxAddKg: 5_000 }],
      targetKv40: 320,
      tolerancePct: 5,
      maxFinalMassKg: 12_000,
      objective: 'cost',
    });
    if (r.status !== 'optimal') throw new Error(r.reason);
    // Refutas two-part inverse (check-values §3): 10 000 kg at VBN(290) + m kg at VBN(460) → VBN(304)
    const v = core.refutasVbn;
    expectClose(r.addKg.heavy!, (10_000 * (v(304) - v(290))) / (v(460) - v(304)), 1e-3);
  });
});
