import { describe, expect, it } from 'vitest';
import { ViBoundary, referenceLH } from '../../../src/core/solver/vi-boundary';
import { blendCoordinates } from '../../../src/core/solver/coordinates';
import { referenceViscosities, viscosityIndex } from '../../../src/core/viscosity/viscosity-index';
import { refutasVbn, kvFromRefutasVbn } from '../../../src/core/blending/refutas';
import { astmLogLog, kvFromAstmLogLog } from '../../../src/core/blending/astm-loglog';
import { preparePlain } from '../../../src/core/solver/plain';
import { solvePrepared } from '../../../src/core/solver/engine';
import { randomPlainProblem, rng } from './helpers';
import { D2270_KV100 } from '../../../src/core/viscosity/d2270-table1';

describe('solver blending coordinates', () => {
  it('the unchecked coordinate functions equal the core rules exactly', () => {
    const R = blendCoordinates('refutas');
    const A = blendCoordinates('astm-d7152');
    for (const kv of [2, 4.1, 20, 100, 220, 460, 1240, 6500]) {
      // identity with the core functions (Refutas; ASTM D7152) — same expressions
      expect(R.toXRaw(kv)).toBe(refutasVbn(kv));
      expect(A.toXRaw(kv)).toBe(astmLogLog(kv));
      expect(R.toKvRaw(R.toX(kv))).toBe(kvFromRefutasVbn(refutasVbn(kv)));
      expect(A.toKvRaw(A.toX(kv))).toBe(kvFromAstmLogLog(astmLogLog(kv)));
    }
  });
});

describe('VI boundary (ASTM D2270 solved for ν40)', () => {
  it('referenceLH reproduces referenceViscosities exactly (Table 1 and the equations above 70)', () => {
    const out = { L: 0, H: 0 };
    for (let y = 2; y <= 150; y += 0.037) {
      referenceLH(y, out);
      const ref = referenceViscosities(y);
      expect(out.L).toBe(ref.L);
      expect(out.H).toBe(ref.H);
    }
  });

  it('U_max gives exactly the minimum VI (procedures A and B)', () => {
    // identity: VI(U_max(Y), Y) = m by construction from ASTM D2270 §7–§8
    for (const m of [0, 60, 95, 100, 105, 140, 180]) {
      const b = new ViBoundary(m, blendCoordinates('refutas'));
      for (const y of [2.5, 5.05, 8.86, 15, 31.5, 69, 100, 210]) {
        expect(viscosityIndex(b.uMax(y), y)).toBeCloseTo(m, 8);
      }
    }
  });

  it('g is increasing and h is its inverse (both mixing rules)', () => {
    // identity: h is constructed as the inverse of g (no external source)
    for (const method of ['refutas', 'astm-d7152'] as const) {
      const c = blendCoordinates(method);
      for (const m of [90, 100, 120]) {
        const b = new ViBoundary(m, c);
        let prev = -Infinity;
        for (let kv = 2.05; kv < 300; kv *= 1.03) {
          const g = b.g(c.toX(kv));
          expect(g).toBeGreaterThan(prev);
          prev = g;
          expect(b.h(g)).toBeCloseTo(c.toX(kv), 9);
        }
      }
    }
  });

  it('the explicit h equals the root search on g (Table 1 rows, between rows, above the table)', () => {
    // identity: both invert the same g (ASTM D2270 Table 1 and equations); no external source
    for (const method of ['refutas', 'astm-d7152'] as const) {
      const c = blendCoordinates(method);
      for (const m of [0, 60, 95, 100, 100.5, 105, 120, 140, 180]) {
        const b = new ViBoundary(m, c);
        for (let kv = 2.5; kv < 40000; kv *= 1.017) {
          const x40 = c.toX(kv);
          const h = b.h(x40);
          expect(Math.abs(h - b.hSearch(x40))).toBeLessThanOrEqual(1e-11 * Math.max(1, Math.abs(h)));
          if (h > b.x100Min) expect(Math.abs(b.g(h) - x40)).toBeLessThanOrEqual(1e-11 * Math.max(1, Math.abs(x40)));
        }
        // exactly at the rows of Table 1
        for (const y of [2.1, 9.9, 20, 20.2, 30, 30.5, 69.5]) {
          const x40 = c.toX(b.uMax(y));
          expect(b.h(x40)).toBeCloseTo(c.toX(y), 11);
        }
      }
    }
  });

  it('every relaxation line lies below h on its interval (validity)', () => {
    // property: the lines are under-estimators of h, checked on a fine grid of the interval
    for (const method of ['refutas', 'astm-d7152'] as const)
    for (const m of [95, 105, 130]) {
      const c = blendCoordinates(method);
      const b = new ViBoundary(m, c);
      for (const [lo, hi] of [
        [135, 165],
        [198, 242],
        [288, 352],
        [612, 748],
        [900, 1100],
        [304, 310],
      ] as const) {
        const a = c.toX(lo);
        const z = c.toX(hi);
        const lines = b.relaxation(a, b.h(a), z, b.h(z));
        for (let k = 0; k <= 400; k++) {
          const x40 = a + ((z - a) * k) / 400;
          const h = b.h(x40);
          for (const l of lines) expect(l.alpha + l.beta * x40).toBeLessThanOrEqual(h + 1e-9 / c.rowScale);
        }
      }
    }
  });
});

describe('VI floor and root relaxation computed once per prepared problem', () => {
  it('solves every subset exactly as with a fresh boundary (no cached floor, no cached root)', () => {
    // property: the per-problem cache (h at the band end, root relaxation) changes no answer;
    // a fresh ViBoundary object bypasses both, so the two paths are compared on the same LPs
    const r = rng(2609);
    let compared = 0;
    let rejectedEarly = 0;
    for (let t = 0; t < 150; t++) {
      const p = randomPlainProblem(r, { k: 4, vi: 1, aniline: 0.3 });
      const P = preparePlain(p);
      const fresh = new ViBoundary(P.targets.minVi!, P.coords);
      for (const subset of [null, [0, 1], [0, 2, 3], [1, 2, 3], [1, 3]]) {
        const cached = solvePrepared(P, subset);
        const direct = solvePrepared(P, subset, { vi: fresh });
        expect(cached.status).toBe(direct.status);
        if (cached.status === 'optimal' && direct.status === 'optimal') {
          expect(cached.objectiveValue).toBe(direct.objectiveValue);
          expect(Array.from(cached.massFractions)).toEqual(Array.from(direct.massFractions));
        }
        if (cached.lpCount === 0 && direct.lpCount > 0) rejectedEarly++;
        compared++;
      }
    }
    expect(compared).toBe(750);
    expect(rejectedEarly).toBeGreaterThan(0); // the floor test did reject some subsets without an LP
  });
});

describe('VI relaxation validity on dense random intervals', () => {
  it('no line exceeds h anywhere on its interval (Table 1 rows, the 70 mm²/s seam, VI 0–180, both rules)', () => {
    // property: a relaxation line must be an under-estimator of h on its whole interval, else the
    // branch and bound can cut off feasible recipes. The curve is walked forward (X40 = g(X100),
    // exact to rounding) at 300 even points, every Table 1 row inside, the seam at 70 mm²/s and
    // points 1e-6 either side of each; tolerance 1e-12 relative (rounding only, no source needed)
    const r = rng(7016);
    const rows = Array.from(D2270_KV100);
    let worst = 0;
    let where = '';
    let checked = 0;
    for (let t = 0; t < 1500; t++) {
      const method = t % 2 === 0 ? 'refutas' : 'astm-d7152';
      const c = blendCoordinates(method);
      const m = Math.round(r() * 180 * 2) / 2;
      const b = new ViBoundary(m, c);
      // interval centres: around the seam, near a Table 1 row, or anywhere in 2–600 mm²/s
      const kind = t % 3;
      const centre = kind === 0 ? 70 * Math.exp((r() - 0.5) * 0.6) : kind === 1 ? rows[Math.floor(r() * rows.length)]! * (1 + (r() - 0.5) * 0.02) : 2 * Math.exp(r() * Math.log(300));
      const width = Math.exp(Math.log(1e-4) + r() * Math.log(1e4)) * 0.5; // relative half width 5e-5 … 0.5
      const y1 = Math.max(2, centre * (1 - width));
      const y2 = centre * (1 + width);
      const a = b.g(c.toX(y1)) - (r() < 0.1 ? 0.05 / c.rowScale : 0);
      const z = b.g(c.toX(y2));
      const ha = b.h(a);
      const hz = b.h(z);
      const lines = b.relaxation(a, ha, z, hz);
      const probes: number[] = [];
      for (let k = 0; k <= 300; k++) probes.push(ha + ((hz - ha) * k) / 300);
      for (const y of [...rows, 70]) {
        const x = c.toX(y);
        for (const d of [0, -1e-6, 1e-6]) if (x + d > ha && x + d < hz) probes.push(x + d);
      }
      for (const x100 of probes) {
        const x40 = b.g(x100);
        if (!(x40 >= a && x40 <= z)) continue;
        for (const l of lines) {
          const excess = (l.alpha + l.beta * x40 - x100) / Math.max(1, Math.abs(x100));
          if (excess > worst) {
            worst = excess;
            where = `${method} VI ${m} on ν100 ${y1.toPrecision(6)}–${y2.toPrecision(6)} at X100 ${x100}`;
          }
        }
        checked++;
      }
      // the flat stretch below the ν100 = 2.0 mm²/s floor
      if (a < b.g(b.x100Min)) for (const l of lines) expect(l.alpha + l.beta * a).toBeLessThanOrEqual(b.x100Min + 1e-12 * Math.max(1, b.x100Min));
    }
    expect(checked).toBeGreaterThan(300000);
    expect(worst, where).toBeLessThanOrEqual(1e-12);
  });
});

describe('VI relaxation inside Table 1 (Refutas, closed-form bounds between rows)', () => {
  it('its lines lie below h, and its end lines meet h at their ends', () => {
    // property: inside Table 1 with Refutas coordinates the lines are bounded in closed form
    // between rows (validity: the dense test above); the end lines are turned about their end, so
    // h(a) and h(b) are met to the rounding allowance (1.1e-12 relative) — checked on random bands.
    // Source of the tolerances: common practice (no source) — a few ulps of double rounding.
    const r = rng(4711);
    const c = blendCoordinates('refutas');
    const rows = Array.from(D2270_KV100);
    let worstEnd = 0;
    let worstValid = -Infinity;
    for (let t = 0; t < 600; t++) {
      const m = Math.round(r() * 180 * 2) / 2;
      const b = new ViBoundary(m, c);
      const y1 = 2.2 + r() * 60;
      const y2 = Math.min(69.9, y1 * (1 + 0.002 + r() * 0.15));
      const a = b.g(c.toX(y1));
      const z = b.g(c.toX(y2));
      const ha = b.h(a);
      const hz = b.h(z);
      const lines = b.relaxation(a, ha, z, hz);
      const top = (x: number) => Math.max(...lines.map((l) => l.alpha + l.beta * x));
      worstEnd = Math.max(worstEnd, (ha - top(a)) / ha, (hz - top(z)) / hz);
      for (let k = 0; k <= 200; k++) {
        const x100 = ha + ((hz - ha) * k) / 200;
        const x40 = b.g(x100);
        if (x40 >= a && x40 <= z) worstValid = Math.max(worstValid, (top(x40) - x100) / x100);
      }
      for (const y of rows) {
        const x100 = c.toX(y);
        if (x100 > ha && x100 < hz) worstValid = Math.max(worstValid, (top(b.g(x100)) - x100) / x100);
      }
    }
    expect(worstValid).toBeLessThanOrEqual(1e-12);
    expect(worstEnd).toBeLessThanOrEqual(3e-12);
  });
});
