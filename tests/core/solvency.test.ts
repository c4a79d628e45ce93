import { describe, expect, it } from 'vitest';
import { solvencyScore } from '../../src/core/solvency';

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
