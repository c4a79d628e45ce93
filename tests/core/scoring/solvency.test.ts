import { describe, expect, it } from 'vitest';
import { blendSolvency, solvencyScore } from '../../../src/core/scoring/solvency';
import { STOCKS, stock } from '../../helpers/formulation-fixtures';
import { expectClose } from '../../helpers/tolerance';

describe('solvencyScore (Blendbench bands)', () => {
  it('maps aniline points to bands at the stated thresholds', () => {
    // thresholds: common practice (no source), see solvency.ts
    expect(solvencyScore(35).band).toBe('strong');
    expect(solvencyScore(99.9).band).toBe('strong');
    expect(solvencyScore(100).band).toBe('good');
    expect(solvencyScore(112).band).toBe('moderate');
    expect(solvencyScore(119.9).band).toBe('moderate');
    expect(solvencyScore(120).band).toBe('limited');
    expect(solvencyScore(130).band).toBe('poor');
    expect(solvencyScore(160).score).toBe(1);
  });
  it('is monotone: a lower aniline point never scores less solvent', () => {
    // definition of the aniline point: lower = more solvent (ASTM D611; domain doc §5)
    let prev = 0;
    for (let ap = 200; ap >= -10; ap -= 0.5) {
      const s = solvencyScore(ap).score;
      expect(s).toBeGreaterThanOrEqual(prev);
      prev = s;
    }
  });
  it('rejects a non-finite aniline point', () => {
    expect(() => solvencyScore(Number.NaN)).toThrow(/solvencyScore/);
  });
});


describe('blendSolvency', () => {
  const lib = [stock('g2heavy'), stock('an12'), stock('add')];
  it('one base stock plus the additive gives the stock aniline point, base-fluid basis', () => {
    // identity (one-component base fluid); additive has no aniline point (base-stock-typicals.md)
    const s = blendSolvency(lib, [
      { componentId: 'g2heavy', massFraction: 0.98 },
      { componentId: 'add', massFraction: 0.02 },
    ]);
    expectClose(s.anilinePoint, 121, 1e-12);
    expect(s.basis).toBe('base-fluid');
    expect(s.band).toBe('limited');
  });
  it('blends by volume and the pulls sum to zero', () => {
    // volume blending, common practice (domain doc §5); φ from ideal mixing (check-values.md D1)
    const w = [0.7, 0.3];
    const s = blendSolvency(lib, [
      { componentId: 'g2heavy', massFraction: w[0]! },
      { componentId: 'an12', massFraction: w[1]! },
    ]);
    const v1 = w[0]! / STOCKS.g2heavy!.density15;
    const v2 = w[1]! / STOCKS.an12!.density15;
    expectClose(s.anilinePoint, (v1 * 121 + v2 * 90) / (v1 + v2), 1e-9);
    expectClose(
      s.contributions.reduce((a, c) => a + c.pull, 0),
      0,
      1e-9,
    );
    expect(s.contributions.find((c) => c.componentId === 'an12')!.pull).toBeLessThan(0);
  });
});
