/**
 * Property tests of the release hold (src/core/release/release-hold.ts) on the invented demo recipes,
 * with random shifts of their shares, statuses, minimum VI and mixing rules: no hold reason ⇔ the
 * recipe is approved, current, of entered and available stocks, predicted, and meets every one of its
 * own constraints (recomputed here with `checkConstraints`) and every release limit of its QC table;
 * and every miss is named.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { assessRelease } from '../../../src/core/release/release-hold';
import { checkConstraints, checkInWords, prepareComponents } from '../../../src/core/solver/solve-blend';
import { demoComponents, demoRecipes, demoTargets } from '../../../src/state/demo';
import type { BlendMethod } from '../../../src/core/blending/blend-viscosity';
import type { RecipeStatus } from '../../../src/core/formulation/model';

const components = demoComponents();
const recipes = demoRecipes();
const targets = demoTargets();
const neutral = components.map((c) => ({ ...c, price: { amount: 0, basis: 'per-kg' as const, currency: 'neutral' } }));

describe('release hold properties', () => {
  it('no hold reason ⇔ approved, current, predicted, every own constraint and release limit met; each miss named', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: recipes.length - 1 }),
        fc.double({ min: -0.2, max: 0.2, noNaN: true }),
        fc.constantFrom<RecipeStatus>('approved', 'approved', 'draft', 'superseded'),
        fc.option(fc.integer({ min: 60, max: 120 }), { nil: null }),
        fc.constantFrom<BlendMethod>('refutas', 'astm-d7152', 'd7152-wright'),
        (k, shift, status, minVi, method) => {
          const r0 = recipes[k]!;
          const [a, b, ...rest] = r0.lines;
          const d = Math.max(-a!.massFraction, Math.min(b!.massFraction, shift));
          const recipe = { ...r0, status, lines: [{ ...a!, massFraction: a!.massFraction + d }, { ...b!, massFraction: b!.massFraction - d }, ...rest].filter((l) => l.massFraction > 0) };
          const t = { ...targets[r0.id]!, minVi };
          const out = assessRelease({ recipe, components, targets: t, method });
          const kinds = new Set(out.reasons.map((x) => x.kind));
          expect(kinds.has('status')).toBe(status !== 'approved');
          const p = out.prediction;
          if ('error' in p) {
            expect(out.reasons.length).toBeGreaterThan(0);
            return;
          }
          const P = prepareComponents(neutral, { ...t, objective: 'cost', referenceRecipeId: null }, method);
          const missed = checkConstraints(P, recipe.lines, p).filter((c) => !c.ok && !c.constraint.endsWith(' not usable'));
          for (const c of missed) expect(out.reasons.map((x) => x.message)).toContain(`It misses its own constraint — ${checkInWords(c)}.`);
          const outside = (out.qcRows ?? []).filter((r) => r.predictedOutsideTarget);
          for (const r of outside) expect(out.reasons.some((x) => x.kind === 'release-limit' && x.message.includes(r.property))).toBe(true);
          const clean = status === 'approved' && !recipe.archived && missed.length === 0 && outside.length === 0 && !kinds.has('specification') && !kinds.has('withdrawn-stock');
          expect(out.reasons.length === 0, JSON.stringify(out.reasons)).toBe(clean);
        },
      ),
      { numRuns: 150 },
    );
  });
});
