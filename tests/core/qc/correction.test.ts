import { beforeAll, describe, expect, it } from 'vitest';
import { CORRECTION_EDGE_MARGIN_PCT, correctBatchPlain, correctionBand, type CorrectionProblem } from '../../../src/core/qc/correction';
import { refutasVbn, kvFromRefutasVbn } from '../../../src/core/blending/refutas';
import { viscosityIndex } from '../../../src/core/viscosity/viscosity-index';
import { BlendbenchInputError, ViscosityOrderError } from '../../../src/core/errors';
import { rng } from '../solver/helpers';
import { expectClose } from '../../helpers/tolerance';

/** The finished batch recomputed by the test (Refutas on mass, check-values §3; D2270 by the core's VI). */
function recompute(c: CorrectionProblem, addKg: Record<string, number>) {
  let m = c.vessel.massKg;
  let x40 = m * refutasVbn(c.vessel.kv40);
  let x100 = m * refutasVbn(c.vessel.kv100);
  for (const k of c.components) {
    const a = addKg[k.id]!;
    m += a;
    x40 += a * refutasVbn(k.kv40);
    x100 += a * refutasVbn(k.kv100);
  }
  const kv40 = kvFromRefutasVbn(x40 / m);
  const kv100 = kvFromRefutasVbn(x100 / m);
  return { massKg: m, kv40, kv100, vi: viscosityIndex(kv40, kv100) };
}

/** Issue 12 feasibility: ν40 in band to 1e-4 relative, additive fraction to 1e-5, masses to 1e-3 kg. */
function expectFeasible(c: CorrectionProblem, r: Extract<ReturnType<typeof correctBatchPlain>, { status: 'optimal' }>): void {
  const b = recompute(c, r.addKg);
  const lo = c.targetKv40 * (1 - c.tolerancePct / 100);
  const hi = c.targetKv40 * (1 + c.tolerancePct / 100);
  expect(b.kv40).toBeGreaterThanOrEqual(lo * (1 - 1e-4));
  expect(b.kv40).toBeLessThanOrEqual(hi * (1 + 1e-4));
  expectClose(r.massKg, b.massKg, 1e-3);
  expectClose(r.kv40, b.kv40, 1e-6 * b.kv40);
  for (const k of c.components) {
    expect(r.addKg[k.id]!).toBeGreaterThanOrEqual(0);
    if (k.maxAddKg !== undefined) expect(r.addKg[k.id]!).toBeLessThanOrEqual(k.maxAddKg + 1e-3);
  }
  if (c.maxFinalMassKg !== undefined) expect(b.massKg).toBeLessThanOrEqual(c.maxFinalMassKg + 1e-3);
  if (c.finalMassKg !== undefined) expectClose(b.massKg, c.finalMassKg, 1e-3);
  if (c.additive) {
    const total = c.vessel.massKg * c.additive.massFraction + r.addKg[c.additive.id]!;
    expectClose(total / b.massKg, c.additive.massFraction, 1e-5);
  }
  if (c.minVi !== undefined) expect(b.vi).toBeGreaterThanOrEqual(c.minVi - 0.01);
}

const stocks = {
  hv: { id: 'BW-280', kv40: 460, kv100: 31, density15: 0.885, anilinePoint: 127, pricePerKg: 1.6 },
  pao: { id: 'BW-440', kv40: 395, kv100: 39.5, density15: 0.85, anilinePoint: 145, pricePerKg: 4.6 },
  hn: { id: 'BW-240', kv40: 110, kv100: 12, density15: 0.872, anilinePoint: 121, pricePerKg: 1.15 },
  mn: { id: 'BW-220', kv40: 42, kv100: 6.4, density15: 0.862, anilinePoint: 113, pricePerKg: 1.08 },
  ep: { id: 'EP', kv40: 250, kv100: 15, density15: 1.05, anilinePoint: 0, pricePerKg: 6 },
};
const thin: CorrectionProblem = {
  vessel: { massKg: 10_000, kv40: 290, kv100: 22, density15: 0.88, anilinePoint: 120 },
  components: [stocks.hv, stocks.pao, stocks.hn, stocks.ep],
  targetKv40: 320,
  tolerancePct: 5,
  additive: { id: 'EP', massFraction: 0.02 },
  maxFinalMassKg: 12_000,
  objective: 'cost',
};

describe('batch correction — worked cases', () => {
  it('a thin batch: the cheapest heavy stock, with the additive topped up in proportion', () => {
    const r = correctBatchPlain(thin);
    expect(r.status).toBe('optimal');
    if (r.status !== 'optimal') return;
    expectFeasible(thin, r);
    expect(r.addKg['BW-440']).toBe(0); // invented prices: the PAO costs three times as much
    expect(r.addKg['BW-240']).toBe(0);
    // Two-part Refutas inverse (check-values §3, exact linear rule): 10 000 kg at VBN(290) plus m kg of
    // VBN(460) and 0.02/0.98·m of VBN(250) reaching VBN(304):
    const v = refutasVbn;
    const k = 0.02 / 0.98;
    const m = (10_000 * (v(304) - v(290))) / (v(460) - v(304) + k * (v(250) - v(304)));
    expectClose(r.addKg['BW-280']!, m, 1e-3);
    expectClose(r.addKg.EP!, k * m, 1e-3);
    expectClose(r.addedCost, 1.6 * m + 6 * k * m, 1e-2);
  });

  it('a batch whose ν100 is exactly 2.0 mm²/s (the D2270 limit, accepted input) is answered, not refused by the VI (property hunt, s25)', () => {
    // Before: the round trip through the Refutas VBN gave ν100 = 1.9999999999999998 and the VI threw.
    // Invented light batch, in its band already (common practice (no source): nothing to add).
    const r = correctBatchPlain({
      vessel: { massKg: 50, kv40: 10, kv100: 2, density15: 0.83, anilinePoint: 100 },
      components: [stocks.mn],
      targetKv40: 10,
      tolerancePct: 5,
      objective: 'mass',
    });
    expect(r.status).toBe('optimal');
    if (r.status !== 'optimal') return;
    expect(r.addedKg).toBe(0);
    expect(r.kv100).toBe(2);
    expect(Number.isFinite(r.vi)).toBe(true);
  });

  it('a batch already in band needs nothing', () => {
    const c = { ...thin, vessel: { ...thin.vessel, kv40: 318 } };
    const r = correctBatchPlain(c);
    expect(r.status).toBe('optimal');
    if (r.status !== 'optimal') return;
    expect(r.addedKg).toBe(0);
    expect(r.massKg).toBe(10_000);
  });

  it('a heavy batch is thinned; least mass and least cost can differ', () => {
    const c: CorrectionProblem = {
      ...thin,
      vessel: { ...thin.vessel, kv40: 360, kv100: 26 },
      components: [stocks.hn, { ...stocks.mn, pricePerKg: 3 }, stocks.ep],
      maxFinalMassKg: 14_000,
    };
    const cost = correctBatchPlain(c);
    const mass = correctBatchPlain({ ...c, objective: 'mass' });
    if (cost.status !== 'optimal' || mass.status !== 'optimal') throw new Error('expected optimal');
    expectFeasible(c, cost);
    expectFeasible(c, mass);
    expect(mass.addedKg).toBeLessThan(cost.addedKg); // the thinner stock needs less mass
    expect(cost.addedCost).toBeLessThanOrEqual(mass.addedCost + 1e-9);
  });

  it('a heel topped up to an exact batch, in band, at the treat rate', () => {
    const c: CorrectionProblem = { ...thin, vessel: { ...thin.vessel, massKg: 800 }, finalMassKg: 10_000, maxFinalMassKg: undefined };
    delete c.maxFinalMassKg;
    const r = correctBatchPlain(c);
    expect(r.status).toBe('optimal');
    if (r.status !== 'optimal') return;
    expectFeasible(c, r);
    expectClose(r.addedKg, 9200, 1e-3);
    expectClose(r.addKg.EP!, 0.02 * 9200, 1e-3); // the heel holds its own 2 %
  });

  it('meets a minimum VI exactly and stays within 0.5 % of a fine search over the two heavy stocks', () => {
    const c: CorrectionProblem = { ...thin, minVi: 97, maxFinalMassKg: 20_000 };
    const r = correctBatchPlain(c);
    expect(r.status).toBe('optimal');
    if (r.status !== 'optimal') return;
    expectFeasible(c, r);
    // brute force: masses of BW-440 in 1 kg steps; for each, BW-280 from the least that reaches 304 mm²/s
    // (Refutas linear inverse, check-values §3) upward in 1 kg steps until the VI is met; additive in proportion
    const v = refutasVbn;
    const k = 0.02 / 0.98;
    let best = Number.POSITIVE_INFINITY;
    for (let p = 0; p <= 6000; p += 1) {
      const h0 = Math.max(0, Math.ceil((10_000 * (v(304) - v(290)) - p * (v(395) - v(304)) - k * p * (v(250) - v(304))) / (v(460) - v(304) + k * (v(250) - v(304)))));
      for (let h = h0; h <= h0 + 200; h += 1) {
        const add: Record<string, number> = { 'BW-280': h, 'BW-440': p, 'BW-240': 0, EP: k * (h + p) };
        const cost = 1.6 * h + 4.6 * p + 6 * add.EP!;
        if (cost >= best) break;
        const b = recompute(c, add);
        if (b.kv40 < 304 || b.kv40 > 336 || b.vi < 97) continue;
        best = cost;
        break;
      }
    }
    expect(Number.isFinite(best)).toBe(true);
    expect(r.addedCost).toBeLessThanOrEqual(best * 1.005 + 1e-9);
  });
});

describe('batch correction — impossible corrections say why in numbers', () => {
  it('no stock heavy enough', () => {
    const r = correctBatchPlain({ ...thin, components: [stocks.hn, stocks.mn, stocks.ep] });
    expect(r.status).toBe('infeasible');
    if (r.status !== 'infeasible') return;
    expect(r.reason).toMatch(/290 mm²\/s, below the band 304–336 mm²\/s/);
    expect(r.reason).toMatch(/the heaviest, BW-240, has 110 mm²\/s/);
  });

  it('the band and the measured batch are written as entered and as the correction sheet prints them, not rounded to whole mm²/s (s25)', () => {
    // Band 313.6–326.4 mm²/s: 320 ± 2 % (the correction's default band, common practice (no source)); batch measured at 280.5.
    const r = correctBatchPlain({ ...thin, vessel: { ...thin.vessel, kv40: 280.5 }, tolerancePct: 2, components: [stocks.hn, stocks.mn, stocks.ep] });
    expect(r.status).toBe('infeasible');
    if (r.status !== 'infeasible') return;
    expect(r.reason).toMatch(/280\.5 mm²\/s, below the band 313\.6–326\.4 mm²\/s/);
  });

  it('a stock heavy enough that the additive top-up keeps out of the band: the additive is named as the reason, not the stock (property hunt, s25)', () => {
    // Every addition carries EP at 10 % (the vessel's treat rate), so the heaviest addition is the mix
    // 0.9·BW-310 + 0.1·EP. Refutas on mass fractions (check-values §3), by the core's VBN functions:
    const heavy = { ...stocks.hv, id: 'BW-310', kv40: 310, kv100: 24 };
    const mix = kvFromRefutasVbn(0.9 * refutasVbn(310) + 0.1 * refutasVbn(250));
    expect(mix).toBeLessThan(304); // the mix stays below the band although BW-310 alone is above 304
    const r = correctBatchPlain({ ...thin, components: [heavy, stocks.hn, stocks.ep], additive: { id: 'EP', massFraction: 0.1 } });
    if (r.status !== 'infeasible') throw new Error('expected infeasible');
    // Before: "no stock on hand is heavy enough …: the heaviest, BW-310, has 310 mm²/s. Add a stock heavier than 304 mm²/s"
    expect(r.reason).not.toMatch(/no stock on hand is heavy enough/);
    expect(r.reason).toMatch(/every addition carries the additive package EP \(250 mm²\/s\) at the treat rate of 10\.00 %/);
    expect(r.reason).toContain(`the heaviest addition, BW-310 (310 mm²/s) with EP, is ${Math.round(mix)} mm²/s`);
  });

  it('the vessel is too full', () => {
    const r = correctBatchPlain({ ...thin, maxFinalMassKg: 10_500 });
    if (r.status !== 'infeasible') throw new Error('expected infeasible');
    expect(r.reason).toMatch(/needs 1196 kg of BW-280 and 25 kg of EP \(1220 kg in all\); the vessel takes only 500 kg more/);
  });

  it('not enough on hand', () => {
    const r = correctBatchPlain({ ...thin, components: [{ ...stocks.hv, maxAddKg: 800 }, { ...stocks.pao, maxAddKg: 100 }, stocks.hn, stocks.ep] });
    if (r.status !== 'infeasible') throw new Error('expected infeasible');
    expect(r.reason).toMatch(/it needs 1196 kg of BW-280; only 800 kg is on hand/);
  });

  it('a heel too large for the batch to come into band', () => {
    const r = correctBatchPlain({ ...thin, vessel: { ...thin.vessel, massKg: 9_900, kv40: 250, kv100: 19 }, finalMassKg: 10_000 });
    if (r.status !== 'infeasible') throw new Error('expected infeasible');
    expect(r.reason).toMatch(/a batch of 10\u202f000 kg on 9900 kg in the vessel leaves room for only 100 kg/);
  });

  it('a VI that no addition holds', () => {
    const r = correctBatchPlain({ ...thin, components: [stocks.hv, stocks.ep], minVi: 110 });
    if (r.status !== 'infeasible') throw new Error('expected infeasible');
    expect(r.reason).toMatch(/leave the VI below 110 \(\d+\.\d with the least addition/);
  });

  it('two limits in the way together: the reason names each in numbers (property hunt, s25)', () => {
    // A full vessel (no room) and a VI no addition holds: lifting either alone does not help.
    const r = correctBatchPlain({ ...thin, components: [stocks.hv, stocks.ep], maxFinalMassKg: 10_000, minVi: 110 });
    if (r.status !== 'infeasible') throw new Error('expected infeasible');
    // Before: "… the vessel's room, the stock on hand and the band cannot all be met together." (no numbers for the why)
    expect(r.reason).toMatch(/more than one must change: the vessel's room \(0 kg more\) and the minimum VI of 110\.$/);
  });

  it('refuses impossible input with named errors', () => {
    expect(() => correctBatchPlain({ ...thin, vessel: { ...thin.vessel, massKg: 0 } })).toThrow(/vessel.massKg = 0/);
    expect(() => correctBatchPlain({ ...thin, vessel: { ...thin.vessel, kv100: 300 } })).toThrow(ViscosityOrderError);
    expect(() => correctBatchPlain({ ...thin, additive: { id: 'nope', massFraction: 0.02 } })).toThrow(/additive.id/);
    expect(() => correctBatchPlain({ ...thin, maxFinalMassKg: 9_000 })).toThrow(/below the 10000 kg already in the vessel/);
    expect(() => correctBatchPlain({ ...thin, components: [{ ...stocks.hv, maxAddKg: -5 }] })).toThrow(/components\[0\]\.maxAddKg/);
    expect(() => correctBatchPlain({ ...thin, objective: 'speed' as 'cost' })).toThrow(BlendbenchInputError);
  });
});

describe('batch correction against HiGHS (LPs in kg: no VI condition)', () => {
  // HiGHS (WebAssembly build, test-only oracle) solves the correction written independently in kg:
  // variables mᵢ; band Σ mᵢ(VBNᵢ − A) ≥ −M_v(VBN_v − A) and ≤ −M_v(VBN_v − B); mᵢ ≤ maxAddᵢ;
  // Σ mᵢ ≤ M_max − M_v or = M − M_v; (1 − r)mₐ − r·Σ_{i≠a} mᵢ = 0. Same status; optimum to 1e-6 relative.
  let highs: { solve(lp: string): { Status: string; ObjectiveValue: number } };
  beforeAll(async () => {
    const mod = (await import('highs')) as unknown as { default: () => Promise<typeof highs> };
    highs = await mod.default();
  });
  const num = (x: number): string => (x >= 0 ? `+ ${x.toPrecision(17)}` : `- ${(-x).toPrecision(17)}`);
  function lpText(c: CorrectionProblem): string {
    const m = (i: number) => `m${i}`;
    const sum = (f: (i: number) => number) => c.components.map((_, i) => `${num(f(i))} ${m(i)}`).join(' ');
    const A = refutasVbn(c.targetKv40 * (1 - c.tolerancePct / 100));
    const B = refutasVbn(c.targetKv40 * (1 + c.tolerancePct / 100));
    const vv = refutasVbn(c.vessel.kv40);
    const Mv = c.vessel.massKg;
    const rows = [
      `lo: ${sum((i) => refutasVbn(c.components[i]!.kv40) - A)} >= ${-Mv * (vv - A)}`,
      `hi: ${sum((i) => refutasVbn(c.components[i]!.kv40) - B)} <= ${-Mv * (vv - B)}`,
    ];
    if (c.finalMassKg !== undefined) rows.push(`fin: ${sum(() => 1)} = ${c.finalMassKg - Mv}`);
    else if (c.maxFinalMassKg !== undefined) rows.push(`room: ${sum(() => 1)} <= ${c.maxFinalMassKg - Mv}`);
    if (c.additive) {
      const r = c.additive.massFraction;
      rows.push(`add: ${sum((i) => (c.components[i]!.id === c.additive!.id ? 1 - r : -r))} = 0`);
    }
    const bounds = c.components.map((k, i) => (k.maxAddKg !== undefined ? ` ${m(i)} <= ${k.maxAddKg}` : '')).filter(Boolean);
    const obj = sum((i) => (c.objective === 'cost' ? c.components[i]!.pricePerKg : 1));
    return `Minimize\n obj: ${obj}\nSubject To\n ${rows.join('\n ')}\nBounds\n${bounds.join('\n')}\nEnd\n`;
  }

  it('matches status and optimum on random corrections and heels (10 candidate stocks at most)', () => {
    const r = rng(1205);
    const pool = [stocks.hv, stocks.pao, stocks.hn, stocks.mn, { ...stocks.hv, id: 'HV2', kv40: 495, pricePerKg: 1.66 }, { id: 'G1', kv40: 30.5, kv100: 5.15, density15: 0.868, anilinePoint: 98, pricePerKg: 0.98 }, { id: 'PIB', kv40: 6500, kv100: 210, density15: 0.89, anilinePoint: 120, pricePerKg: 2.4 }, { id: 'AN', kv40: 29, kv100: 4.7, density15: 0.908, anilinePoint: 35, pricePerKg: 4.1 }, { id: 'G3', kv40: 34, kv100: 6.3, density15: 0.84, anilinePoint: 123, pricePerKg: 1.4 }];
    let optimal = 0;
    let infeasible = 0;
    for (let n = 0; n < 80; n++) {
      const k = 2 + Math.floor(r() * 8);
      const picks = [...pool].sort(() => r() - 0.5).slice(0, k).map((s) => ({ ...s, pricePerKg: s.pricePerKg * (0.8 + 0.4 * r()), ...(r() < 0.4 ? { maxAddKg: Math.round(200 + 3000 * r()) } : {}) }));
      const target = [220, 320, 460][n % 3]!;
      const heel = r() < 0.3;
      const Mv = heel ? 300 + 3000 * r() : 5000 + 10_000 * r();
      const c: CorrectionProblem = {
        vessel: { massKg: Mv, kv40: target * (0.8 + 0.4 * r()), kv100: 0, density15: 0.88, anilinePoint: 120 },
        components: [...picks, stocks.ep],
        targetKv40: target,
        tolerancePct: 2 + 6 * r(),
        additive: { id: 'EP', massFraction: 0.01 + 0.02 * r() },
        objective: r() < 0.5 ? 'cost' : 'mass',
      };
      c.vessel.kv100 = c.vessel.kv40 ** 0.55;
      if (heel) c.finalMassKg = 10_000;
      else c.maxFinalMassKg = Mv * (1.02 + 0.3 * r());
      const mine = correctBatchPlain(c);
      const ref = highs.solve(lpText(c));
      expect(['Optimal', 'Infeasible']).toContain(ref.Status);
      expect(mine.status, JSON.stringify(c)).toBe(ref.Status === 'Optimal' ? 'optimal' : 'infeasible');
      if (mine.status === 'optimal') {
        optimal++;
        expectFeasible(c, mine);
        const v = c.objective === 'cost' ? mine.addedCost : mine.addedKg;
        expect(Math.abs(v - ref.ObjectiveValue)).toBeLessThanOrEqual(1e-6 * Math.max(1, Math.abs(ref.ObjectiveValue)) + 1e-3);
      } else infeasible++;
    }
    expect(optimal).toBeGreaterThan(30);
    expect(infeasible).toBeGreaterThan(5);
  });
});

describe('correctionBand: a correction aims inside the release band with a margin (session 19, defect 3)', () => {
  // Margin: CORRECTION_EDGE_MARGIN_PCT = 1 % of the edge's ν40, common practice (no source).
  // Band 304–336 mm²/s: VG 320 (ISO 3448:1992 Table 1 mid-point 320) ± 5 %, the plant aim band.
  it('keeps each edge 1 % of ν40 inside the release limit', () => {
    const band = correctionBand(305, 2, { min: 304, max: 336 })!;
    expectClose(band.min, 304 * 1.01, 1e-9);
    expectClose(band.max, 305 * 1.02, 1e-9);
    const high = correctionBand(335, 2, { min: 304, max: 336 })!;
    expectClose(high.max, 336 * 0.99, 1e-9);
    expectClose(high.min, 335 * 0.98, 1e-9);
  });
  it('leaves the band around an aim well inside as it is', () => {
    expect(correctionBand(320, 2, { min: 304, max: 336 })).toEqual({ min: 320 * 0.98, max: 320 * 1.02 });
  });
  it('gives null when the aim’s band does not reach inside the margin', () => {
    expect(correctionBand(300, 1, { min: 304, max: 336 })).toBeNull();
    expect(CORRECTION_EDGE_MARGIN_PCT).toBe(1);
  });
});
