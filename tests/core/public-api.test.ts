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
    // ASTM D2270 worked example (shared/reference/check-values.md V1)
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
    // Two stocks to an exact target: heavy mass fraction 0.55126 ± 1e-4 (shared/reference/check-values.md B3)
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
