import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { addLine, basisFractions, editFraction, normalise, removeLine } from '../../../src/features/designer/fractions';
import type { RecipeLine } from '../../../src/core/formulation/model';

// invented demo data, not check values: densities (kg/L) and fractions of four made-up lines
const dens: Record<string, number> = { a: 0.87, b: 0.9, c: 0.85, add: 1.05 };
const density = (id: string) => dens[id]!;
const sum = (ls: RecipeLine[]) => ls.reduce((s, l) => s + l.massFraction, 0);
const frac = (ls: RecipeLine[], id: string) => ls.find((l) => l.componentId === id)!.massFraction;

const recipe: RecipeLine[] = [
  { componentId: 'a', massFraction: 0.5 },
  { componentId: 'b', massFraction: 0.3 },
  { componentId: 'c', massFraction: 0.18 },
  { componentId: 'add', massFraction: 0.02 },
];

describe('editFraction', () => {
  it('balance mode: only the balance stock changes', () => {
    // hand arithmetic on the invented fractions (no external source): a = 1 − 0.35 − 0.18 − 0.02 = 0.45
    const r = editFraction(recipe, density, 'mass', 'b', 0.35, { mode: 'balance', balanceId: 'a' });
    expect(r.clamped).toBe(false);
    expect(frac(r.lines, 'b')).toBe(0.35);
    expect(frac(r.lines, 'a')).toBeCloseTo(0.45, 12);
    expect(frac(r.lines, 'c')).toBe(0.18);
    expect(frac(r.lines, 'add')).toBe(0.02);
    expect(sum(r.lines)).toBe(1);
  });

  it('proportional mode keeps the locked additive at its treat rate', () => {
    // hand arithmetic (no external source): a and b share 1 − 0.28 − 0.02 in their 0.5 : 0.3 ratio
    const r = editFraction(recipe, density, 'mass', 'c', 0.28, { mode: 'proportional', lockedIds: ['add'] });
    expect(frac(r.lines, 'c')).toBe(0.28);
    expect(frac(r.lines, 'add')).toBe(0.02);
    // a and b shrink together, keeping their 5 : 3 ratio
    expect(frac(r.lines, 'a') / frac(r.lines, 'b')).toBeCloseTo(5 / 3, 12);
    expect(Math.abs(sum(r.lines) - 1)).toBeLessThan(1e-15);
  });

  it('volume view: the edited line reaches the volume share entered (ideal mixing at 15 °C)', () => {
    // Ideal mixing φ = (w/ρ)/Σ(w/ρ): common practice (tests/reference/check-values.md D1 uses the same rule)
    for (const rebalance of [{ mode: 'balance', balanceId: 'a' } as const, { mode: 'proportional', lockedIds: ['add'] } as const]) {
      const r = editFraction(recipe, density, 'volume', 'b', 0.4, rebalance);
      const vol = basisFractions(r.lines, density, 'volume');
      expect(vol[1]).toBeCloseTo(0.4, 12);
      expect(frac(r.lines, 'add')).toBe(0.02);
      expect(Math.abs(sum(r.lines) - 1)).toBeLessThan(1e-15);
    }
  });

  it('clamps when the balance stock runs out, and says so', () => {
    // hand arithmetic (no external source): b is exhausted, so c reaches 0.18 + 0.30 = 0.48
    const r = editFraction(recipe, density, 'mass', 'c', 0.9, { mode: 'balance', balanceId: 'b' });
    expect(r.clamped).toBe(true);
    expect(r.message).toMatch(/balance stock/);
    expect(frac(r.lines, 'c')).toBeCloseTo(0.48, 12);
    expect(frac(r.lines, 'b')).toBe(0);
    expect(sum(r.lines)).toBeCloseTo(1, 15);
  });

  it('refuses to edit the balance line itself', () => {
    // identity: a refused edit returns the recipe unchanged (no external source)
    const r = editFraction(recipe, density, 'mass', 'a', 0.4, { mode: 'balance', balanceId: 'a' });
    expect(r.clamped).toBe(true);
    expect(r.lines).toEqual(recipe);
  });

  it('spreads over absorbers that are all at zero', () => {
    // hand arithmetic (no external source): the freed 0.4 is split evenly, 0.2 each
    const ls: RecipeLine[] = [
      { componentId: 'a', massFraction: 1 },
      { componentId: 'b', massFraction: 0 },
      { componentId: 'c', massFraction: 0 },
    ];
    const r = editFraction(ls, density, 'mass', 'a', 0.6, { mode: 'proportional', lockedIds: [] });
    expect(frac(r.lines, 'b')).toBeCloseTo(0.2, 12);
    expect(frac(r.lines, 'c')).toBeCloseTo(0.2, 12);
  });

  it('always keeps every fraction in [0, 1] and the sum at 1 (property)', () => {
    // property test: invariants of the editing rule, common practice (no source)
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: 0.01, max: 1, noNaN: true }), { minLength: 4, maxLength: 4 }),
        fc.integer({ min: 0, max: 3 }),
        fc.double({ min: -0.2, max: 1.2, noNaN: true }),
        fc.constantFrom<'mass' | 'volume'>('mass', 'volume'),
        fc.boolean(),
        (raw, which, value, basis, proportional) => {
          const ids = ['a', 'b', 'c', 'add'];
          const lines = normalise(raw.map((w, i) => ({ componentId: ids[i]!, massFraction: w })));
          const id = ids[which]!;
          const r = editFraction(lines, density, basis, id, value, proportional ? { mode: 'proportional', lockedIds: ['add'] } : { mode: 'balance', balanceId: id === 'a' ? 'b' : 'a' });
          for (const l of r.lines) {
            expect(l.massFraction).toBeGreaterThanOrEqual(0);
            expect(l.massFraction).toBeLessThanOrEqual(1);
          }
          expect(Math.abs(sum(r.lines) - 1)).toBeLessThan(1e-12);
        },
      ),
      { numRuns: 300 },
    );
  });
});

describe('add, remove, normalise', () => {
  it('removing a line gives its share to the balance stock', () => {
    // hand arithmetic (no external source): a = 0.5 + 0.18 = 0.68
    const ls = removeLine(recipe, 'c', { mode: 'balance', balanceId: 'a' });
    expect(ls.map((l) => l.componentId)).toEqual(['a', 'b', 'add']);
    expect(frac(ls, 'a')).toBeCloseTo(0.68, 12);
    expect(sum(ls)).toBe(1);
  });

  it('adding a line starts it at 0 %', () => {
    // definition of the editing rule (no external source): a new line starts at 0, a first line at 1
    const ls = addLine(recipe.slice(0, 2), 'c');
    expect(frac(ls, 'c')).toBe(0);
    expect(addLine([], 'a')).toEqual([{ componentId: 'a', massFraction: 1 }]);
  });

  it('normalise scales to exactly 1', () => {
    // invariant: normalised fractions sum to 1 (no external source)
    const ls = normalise([
      { componentId: 'a', massFraction: 0.333 },
      { componentId: 'b', massFraction: 0.333 },
      { componentId: 'c', massFraction: 0.333 },
    ]);
    expect(sum(ls)).toBe(1);
  });
});
