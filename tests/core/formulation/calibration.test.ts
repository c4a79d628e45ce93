import { describe, expect, it } from 'vitest';
import { calibrateComponent } from '../../../src/core/formulation/calibration';
import { blendingViscosities } from '../../../src/core/formulation/blend-properties';
import { blendKv40Kv100 } from '../../../src/core/blending/blend-viscosity';
import type { BlendMethod } from '../../../src/core/blending/blend-viscosity';
import type { Component } from '../../../src/core/formulation/model';
import { expectRelClose } from '../../helpers/tolerance';
import { stock } from '../../helpers/formulation-fixtures';

const predict = (method: BlendMethod, lib: Component[], w: Record<string, number>) =>
  blendKv40Kv100(
    method,
    Object.entries(w).map(([id, massFraction]) => {
      const c = lib.find((x) => x.id === id)!;
      const v = blendingViscosities(c);
      return { massFraction, density15: c.density15, kv40: v.kv40, kv100: v.kv100 };
    }),
  );

describe('calibrateComponent', () => {
  const lib = [stock('g2heavy'), stock('g2med'), stock('pib'), stock('add')];
  const trial = { g2heavy: 0.6, g2med: 0.28, pib: 0.1, add: 0.02 };

  for (const method of ['refutas', 'astm-d7152', 'd7152-wright'] as const) {
    it(`round-trips: calibrate then predict reproduces the measured trial (${method})`, () => {
      // identity of the exact inverse of the rule (check-values.md §3 equations), 1e-9 relative
      const cal = calibrateComponent({
        components: lib,
        unknownId: 'pib',
        massFractions: trial,
        measuredKv40: 105,
        measuredKv100: 11.6,
        method,
        labReference: 'TB-001 (invented)',
        calibratedOn: '2024-05-02',
      });
      const libCal = lib.map((c) => (c.id === 'pib' ? { ...c, calibration: cal } : c));
      const p = predict(method, libCal, trial);
      expectRelClose(p.kv40, 105, 1e-9);
      expectRelClose(p.kv100, 11.6, 1e-9);
      expect(cal.method).toBe(method);
      expect(cal.calibratedOn).toBe('2024-05-02');
      expect(cal.trial.labReference).toBe('TB-001 (invented)');
      expect(cal.trial.massFractions).toEqual(trial);
    });
  }

  it('returns the component own viscosities when the trial matches the uncalibrated prediction', () => {
    // identity: if the measured blend equals the ideal prediction, the effective value is the measured one
    const ideal = predict('refutas', lib, trial);
    const cal = calibrateComponent({
      components: lib,
      unknownId: 'pib',
      massFractions: trial,
      measuredKv40: ideal.kv40,
      measuredKv100: ideal.kv100,
      method: 'refutas',
      labReference: 'x',
      calibratedOn: '2024-05-02',
    });
    expectRelClose(cal.effectiveKv40, 6500, 1e-8);
    expectRelClose(cal.effectiveKv100, 210, 1e-8);
  });

  it('a thinner measured blend gives a lower effective viscosity (monotone)', () => {
    // monotonicity of the Refutas rule (VBN increasing in ν) — check-values.md §3
    const at = (kv40: number) =>
      calibrateComponent({
        components: lib,
        unknownId: 'pib',
        massFractions: trial,
        measuredKv40: kv40,
        measuredKv100: 11.6,
        method: 'refutas',
        labReference: 'x',
        calibratedOn: '2024-05-02',
      }).effectiveKv40;
    expect(at(100)).toBeLessThan(at(110));
  });

  it('names the field on impossible input', () => {
    const base = {
      components: lib,
      unknownId: 'pib',
      massFractions: trial,
      measuredKv40: 105,
      measuredKv100: 11.6,
      method: 'refutas' as const,
      labReference: 'x',
      calibratedOn: '2024-05-02',
    };
    expect(() => calibrateComponent({ ...base, unknownId: 'nope' })).toThrow(/unknownId/);
    expect(() => calibrateComponent({ ...base, calibratedOn: 'May 2' })).toThrow(/calibratedOn/);
    expect(() => calibrateComponent({ ...base, massFractions: { g2heavy: 0.9, pib: 0.05 } })).toThrow(/sum/);
    expect(() => calibrateComponent({ ...base, measuredKv100: 300 })).toThrow(/kv100/);
    expect(() => calibrateComponent({ ...base, massFractions: { g2heavy: 0.7, g2med: 0.3, pib: 0 } })).toThrow(
      /at least/,
    );
    // a trial of 90 % ν-110 + 10 % polymer cannot reach 100 000 mm²/s with any finite effective ν
    expect(() => calibrateComponent({ ...base, measuredKv40: 100000, measuredKv100: 11.6 })).toThrow(/thicker/);
    expect(() => calibrateComponent({ ...base, measuredKv40: 15, measuredKv100: 3.5 })).toThrow(/thinner/);
  });
});
