import { describe, expect, it } from 'vitest';
import { assessDeposit, depositPropensity, explainDeposit } from '../../../src/core/scoring/deposit';
import { stock } from '../../helpers/formulation-fixtures';

describe('depositPropensity (Blendbench matrix)', () => {
  it('flags a highly refined, poorly solvent blend as late and abrupt', () => {
    // trade-off: check-values.md §6 "PAO is the opposite extreme"; matrix is common practice (no source)
    expect(depositPropensity(5, 1)).toEqual({ propensity: 'elevated', pattern: 'late-abrupt' });
  });
  it('flags an aromatic, solvent, less stable blend as early and gradual', () => {
    // check-values.md §6 "aromatic-rich oils dissolve polar oxidation products well but oxidise readily"
    expect(depositPropensity(2, 4)).toEqual({ propensity: 'moderate', pattern: 'early-gradual' });
  });
  it('rates a stable blend with good solvency low', () => {
    // matrix, common practice (no source)
    expect(depositPropensity(4.5, 4)).toEqual({ propensity: 'low', pattern: 'balanced' });
  });
  it('never lowers the propensity when solvency falls at high stability', () => {
    // monotonicity of the matrix for stable blends — design rule (common practice, no source)
    const order = { low: 0, moderate: 1, elevated: 2 };
    for (const r of [3.6, 4, 4.6, 5]) {
      let prev = -1;
      for (const s of [5, 4, 3, 2, 1]) {
        const p = order[depositPropensity(r, s).propensity];
        expect(p).toBeGreaterThanOrEqual(prev);
        prev = p;
      }
    }
  });
});

describe('assessDeposit', () => {
  const lib = [stock('pao40'), stock('pao6'), stock('an12'), stock('g1bs'), stock('g1sn600'), stock('add')];
  it('names the PAO as raising the aniline point and gives a late-abrupt pattern', () => {
    // PAO has the poorest solvency and the best stability (check-values.md §6) — ordering, not a value
    const a = assessDeposit(lib, [
      { componentId: 'pao40', massFraction: 0.7 },
      { componentId: 'pao6', massFraction: 0.28 },
      { componentId: 'add', massFraction: 0.02 },
    ]);
    expect(a.pattern).toBe('late-abrupt');
    expect(a.propensity).toBe('elevated');
    expect(a.drivers.raiseAniline[0]!.componentId).toBe('pao40');
    expect(a.explanation).toContain('PAO40');
    expect(a.explanation).toMatch(/not a measurement/);
    expect(a.approximate).toBe(true);
  });
  it('writes the explanation in the user’s number style: decimal comma and °F (issue 10, item 17)', () => {
    const a = assessDeposit(lib, [
      { componentId: 'pao40', massFraction: 0.7 },
      { componentId: 'pao6', massFraction: 0.28 },
      { componentId: 'add', massFraction: 0.02 },
    ]);
    // the default text is the same sentences with "." and °C
    expect(explainDeposit(a)).toBe(a.explanation);
    const text = explainDeposit(a, { decimalSeparator: ',', temperatureUnit: 'F' });
    // t_F = 9/5·t_C + 32 (definition of the Fahrenheit scale), whole degrees as printed
    const apF = Math.round((a.solvency.anilinePoint * 9) / 5 + 32);
    expect(text).toContain(`aniline point about ${apF} °F`);
    expect(text).toContain(`rating ${a.oxidation.rating.toFixed(1).replace('.', ',')} of 5`);
    expect(text).not.toMatch(/°C/);
  });
  it('names the solvency booster as lowering the aniline point', () => {
    // alkylated naphthalene is a solvency booster (domain doc, materials) — ordering, not a value
    const a = assessDeposit(lib, [
      { componentId: 'pao40', massFraction: 0.68 },
      { componentId: 'an12', massFraction: 0.3 },
      { componentId: 'add', massFraction: 0.02 },
    ]);
    expect(a.drivers.lowerAniline[0]!.componentId).toBe('an12');
    expect(a.explanation).toContain('pulled down by AN12');
  });
  it('a traditional Group I blend oxidises early and gradually', () => {
    // Group I: good solvency, oxidises readily (check-values.md §6)
    const a = assessDeposit(lib, [
      { componentId: 'g1bs', massFraction: 0.6 },
      { componentId: 'g1sn600', massFraction: 0.38 },
      { componentId: 'add', massFraction: 0.02 },
    ]);
    expect(a.pattern).toBe('early-gradual');
  });
});
