/**
 * Property tests of the blend after shear (src/core/formulation/shear-blend.ts) for each mixing
 * rule: with one polymer whose ν100 loss L is stated, the blend loses L % of ν100 (the module's
 * steps 2–3; Wright to 1e-9 by its fixed point); shear never raises ν40 or ν100; a blend without a
 * polymer is unchanged.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { blendAfterShear } from '../../../src/core/formulation/shear-blend';
import { demoComponents } from '../../../src/state/demo';
import type { BlendMethod } from '../../../src/core/blending/blend-viscosity';

const lib0 = demoComponents();
const polymer = lib0.find((c) => c.category === 'polymer')!;
const bases = lib0.filter((c) => c.category !== 'polymer' && c.category !== 'additive-package' && c.availability !== 'withdrawn');

describe('blendAfterShear properties', () => {
  it('one polymer with a stated ν100 (or ν40) loss L: the blend loses L % there; nothing rises', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: bases.length - 1 }),
        fc.integer({ min: 0, max: bases.length - 1 }),
        fc.double({ min: 0.01, max: 0.25, noNaN: true }),
        fc.double({ min: 0.5, max: 40, noNaN: true }),
        fc.constantFrom<BlendMethod>('refutas', 'astm-d7152', 'd7152-wright'),
        fc.boolean(),
        (i, j, wp, L, method, at40) => {
          const lib = lib0.map((c) => (c.id === polymer.id ? { ...c, shearLossPct: at40 ? null : L, shearLoss40Pct: at40 ? L : null } : c));
          const lines = [
            { componentId: bases[i]!.id, massFraction: i === j ? 1 - wp : (1 - wp) / 2 },
            ...(i === j ? [] : [{ componentId: bases[j]!.id, massFraction: (1 - wp) / 2 }]),
            { componentId: polymer.id, massFraction: wp },
          ];
          let r;
          try {
            r = blendAfterShear(lib, lines, { method });
          } catch (e) {
            // a loss more than the polymer can lose is refused with a message
            expect((e as Error).message).toMatch(/more than|polymer/);
            return;
          }
          if (r.unchanged) return; // polymer thinner than its base fluid: nothing to lose
          // relative 1e-6 for Refutas/ASTM (exact construction), 1e-6 for Wright (fixed point to 1e-9): common practice (no source)
          expect(Math.abs((at40 ? r.lossKv40Pct : r.lossKv100Pct) - L)).toBeLessThanOrEqual(1e-6 * L);
          expect(r.kv100After).toBeLessThanOrEqual(r.kv100Before * (1 + 1e-12));
          expect(r.kv40After).toBeLessThanOrEqual(r.kv40Before * (1 + 1e-12));
        },
      ),
      { numRuns: 200 },
    );
  });

  it('a blend without a polymer is unchanged', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: bases.length - 1 }), fc.constantFrom<BlendMethod>('refutas', 'astm-d7152', 'd7152-wright'), (i, method) => {
        const r = blendAfterShear(lib0, [{ componentId: bases[i]!.id, massFraction: 1 }], { method });
        expect(r.unchanged).toBe(true);
        expect(r.kv40After).toBe(r.kv40Before);
      }),
      { numRuns: 30 },
    );
  });
});
