import { describe, expect, it } from 'vitest';
import {
  blendOxidationRating,
  DEFAULT_OXIDATION_RATING,
  oxidationClass,
  oxidationRating,
} from '../../../src/core/scoring/oxidation';
import type { ComponentCategory } from '../../../src/core/formulation/model';

const comp = (id: string, category: ComponentCategory, oxidationRating: number | null = null) => ({
  id,
  category,
  oxidationRating,
});

describe('oxidationRating (Blendbench ordinal scale)', () => {
  it('orders category defaults PAO ≈ Group III > Group II > Group I', () => {
    // ordering: base-stock-typicals.md "Oxidation stability … (common practice, ordinal)"
    const r = (c: ComponentCategory) => oxidationRating(comp('x', c));
    expect(r('group-iv')).toBe(r('group-iii'));
    expect(r('group-iii')).toBeGreaterThan(r('group-ii'));
    expect(r('group-ii')).toBeGreaterThan(r('group-i'));
  });

  it('rates Group V (saturated polyol esters, alkylated naphthalenes) above Group I by default', () => {
    // issue 13 §5, common practice (from memory): those Group V fluids are good to excellent, better than Group I
    expect(oxidationRating(comp('x', 'group-v'))).toBe(4);
    expect(oxidationRating(comp('x', 'group-v'))).toBeGreaterThan(oxidationRating(comp('x', 'group-i')));
  });

  it('uses the component override when set', () => {
    // identity: override replaces the default (definition of the field in model.ts)
    expect(oxidationRating(comp('x', 'group-v', 1.5))).toBe(1.5);
  });

  it('rejects an override outside 1–5', () => {
    expect(() => oxidationRating(comp('x', 'group-i', 6))).toThrow(/oxidationRating/);
    expect(() => oxidationRating(comp('x', 'group-i', Number.NaN))).toThrow(/oxidationRating/);
  });

  it('every default lies on the scale', () => {
    for (const v of Object.values(DEFAULT_OXIDATION_RATING)) {
      expect(v >= 1 && v <= 5).toBe(true);
    }
  });
});

describe('oxidationClass', () => {
  it('maps the scale to named classes at half-way boundaries', () => {
    // class boundaries are Blendbench's own design (common practice, no source)
    expect(oxidationClass(1)).toBe('low');
    expect(oxidationClass(1.5)).toBe('fair');
    expect(oxidationClass(2.49)).toBe('fair');
    expect(oxidationClass(3)).toBe('moderate');
    expect(oxidationClass(4.49)).toBe('good');
    expect(oxidationClass(4.5)).toBe('high');
  });
});

describe('blendOxidationRating', () => {
  const lib = [comp('g1', 'group-i'), comp('pao', 'group-iv'), comp('add', 'additive-package')];
  it('is the mass-weighted mean over the base fluid, additive excluded', () => {
    // arithmetic of the stated definition: (0.49·2 + 0.49·5)/0.98 = 3.5 (common practice, no source)
    const b = blendOxidationRating(lib, [
      { componentId: 'g1', massFraction: 0.49 },
      { componentId: 'pao', massFraction: 0.49 },
      { componentId: 'add', massFraction: 0.02 },
    ]);
    expect(b.rating).toBeCloseTo(3.5, 12);
    expect(b.oxidationClass).toBe('good');
    expect(b.contributions.map((c) => c.componentId)).toEqual(['g1', 'pao']);
  });
  it('a single base stock gives its own rating', () => {
    // identity (one-component blend returns the component)
    expect(blendOxidationRating(lib, [{ componentId: 'pao', massFraction: 1 }]).rating).toBe(5);
  });
  it('rejects unknown components and blends without base fluid', () => {
    expect(() => blendOxidationRating(lib, [{ componentId: 'nope', massFraction: 1 }])).toThrow(/not in the component library/);
    expect(() => blendOxidationRating(lib, [{ componentId: 'add', massFraction: 1 }])).toThrow(/base fluid/);
  });
});
