/**
 * Property tests of the recipe comparison's summary (src/core/formulation/comparison.ts): a change
 * printed as zero at its decimals is written "±0.0", never "+0.0" or "−0.0", and the aniline point's
 * word agrees with the printed change (common practice (no source): the sign belongs to the printed
 * value, as the blend sheet's "Change from revision N" writes "±0.00").
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { compareRecipes } from '../../../src/core/formulation/comparison';
import { stock } from '../../helpers/formulation-fixtures';

const lib = [stock('g1sn600'), stock('g2heavy'), stock('g2hv'), stock('add')];
const reference = [
  { componentId: 'g2hv', massFraction: 0.6 },
  { componentId: 'g1sn600', massFraction: 0.38 },
  { componentId: 'add', massFraction: 0.02 },
];

describe('compareRecipes summary properties', () => {
  it('a zero as printed carries no sign, a small shift of mass included (e.g. 1e-6 of g1sn600 to g2heavy)', () => {
    fc.assert(
      fc.property(fc.double({ min: -1e-3, max: 1e-3, noNaN: true }), fc.constantFrom<'C' | 'F'>('C', 'F'), (shift, unit) => {
        const candidate = [
          { componentId: 'g2hv', massFraction: 0.6 },
          { componentId: 'g1sn600', massFraction: 0.38 - Math.abs(shift) },
          { componentId: 'g2heavy', massFraction: Math.abs(shift) },
          { componentId: 'add', massFraction: 0.02 },
        ].filter((l) => l.massFraction > 0);
        const c = compareRecipes({ components: lib, reference, candidate, grade: 320, operatingTempC: 65, coldTempC: -10, display: { temperatureUnit: unit } });
        for (const line of c.summary) {
          expect(line, line).not.toMatch(/[+−]0(\.0+)?(?![\d.])/);
          const ap = /^Aniline point ([+−±])\S+ °[CF] \((more solvent|less solvent|same solvency)/.exec(line);
          if (ap) expect(ap[2]).toBe(ap[1] === '±' ? 'same solvency' : ap[1] === '−' ? 'more solvent' : 'less solvent');
        }
      }),
      { numRuns: 100 },
    );
  });
});
