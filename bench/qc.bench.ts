/**
 * Bench: the plant's QC loop (issue 12) — three lines:
 *
 * - robust solve, 12 components, p = 0.99: `solveBlendPlain` with `minInBandProbability: 0.99` on
 *   seeded random twelve-stock problems (VG 220–460, ±5 % band, a minimum VI in half of them; every
 *   stock with a lot spread of 1–3 %), mean time per solve; goal ≤ 20 ms;
 * - correction, 10 candidate stocks: `correctBatchPlain` on seeded random off-grade batches (too thin
 *   or too thick by 6–15 %) with ten stocks on hand, some with kg limits, the additive topped up in
 *   proportion, a vessel limit; mean time per correction; goal ≤ 2 ms;
 * - probability of one recipe: `inBandProbabilityPlain` for a twelve-stock recipe (validation
 *   included), mean time per call; goal ≤ 5 µs.
 *
 * Times are CPU time of this process (the machine is shared), the fastest of five rounds; stocks are
 * invented around generic typicals (from memory, tests/reference/base-stock-typicals.md).
 */
import { solveBlendPlain, type PlainComponent, type PlainProblem } from '../src/core/solver/plain';
import { correctBatchPlain, type CorrectionProblem } from '../src/core/qc/correction';
import { inBandProbabilityPlain } from '../src/core/qc/probability-plain';
import type { BenchLine } from './types';
import { rng, typicalsAt } from './fixtures/random-problems';

const TYPICALS = typicalsAt([0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11]);
const ROUNDS = 5;

/** CPU time of this process spent in f [ms] (user + system). */
function cpuMs(f: () => void): number {
  const c0 = process.cpuUsage();
  f();
  const c = process.cpuUsage(c0);
  return (c.user + c.system) / 1000;
}
/** Fastest of `rounds` CPU timings of f [ms]. */
function fastest(rounds: number, f: () => void): number {
  let best = Number.POSITIVE_INFINITY;
  for (let r = 0; r < rounds; r++) best = Math.min(best, cpuMs(f));
  return best;
}

/** Twelve invented stocks around the typicals (every typical once, varied), with lot spreads. */
function twelveStocks(r: () => number): PlainComponent[] {
  return TYPICALS.map(([kv40, kv100, rho, ap], i) => {
    const f = 0.92 + 0.16 * r();
    return {
      id: `s${i}`,
      kv40: kv40 * f,
      kv100: kv100 * f ** 0.6,
      density15: rho,
      anilinePoint: ap,
      pricePerKg: 0.9 + 3 * r(),
      kv40RelSd: 0.01 + 0.02 * r(),
    };
  });
}

function robustProblems(count: number, seed: number): PlainProblem[] {
  const r = rng(seed);
  const out: PlainProblem[] = [];
  for (let k = 0; k < count; k++) {
    const p: PlainProblem = {
      components: twelveStocks(r),
      targetKv40: [220, 320, 460][k % 3]!,
      tolerancePct: 5,
      minInBandProbability: 0.99,
      objective: 'cost',
    };
    if (k % 2 === 1) p.minVi = 90 + 10 * r();
    out.push(p);
  }
  return out;
}

function corrections(count: number, seed: number): CorrectionProblem[] {
  const r = rng(seed);
  const out: CorrectionProblem[] = [];
  for (let k = 0; k < count; k++) {
    const stocks = twelveStocks(r).slice(0, 9).map((c) => ({ ...c, ...(r() < 0.3 ? { maxAddKg: Math.round(500 + 3000 * r()) } : {}) }));
    const target = [220, 320, 460][k % 3]!;
    const off = (r() < 0.5 ? -1 : 1) * (0.06 + 0.09 * r());
    const kv40 = target * (1 + off);
    out.push({
      vessel: { massKg: 8000 + 4000 * r(), kv40, kv100: kv40 ** 0.55, density15: 0.88, anilinePoint: 118 },
      components: [...stocks, { id: 'ep', kv40: 250, kv100: 15, density15: 1.05, anilinePoint: 0, pricePerKg: 6 }],
      targetKv40: target,
      tolerancePct: 5,
      additive: { id: 'ep', massFraction: 0.02 },
      maxFinalMassKg: 20_000,
      objective: k % 2 === 0 ? 'cost' : 'mass',
    });
  }
  return out;
}

export async function run(): Promise<BenchLine[]> {
  // 1. Robust solves.
  const problems = robustProblems(30, 1201);
  let optimal = 0;
  for (const p of problems) if (solveBlendPlain(p).status === 'optimal') optimal++; // warm-up, and the count
  const robustMs = fastest(ROUNDS, () => {
    for (const p of problems) solveBlendPlain(p);
  }) / problems.length;
  const nominalMs = fastest(ROUNDS, () => {
    for (const p of problems) solveBlendPlain({ ...p, minInBandProbability: undefined });
  }) / problems.length;

  // 2. Corrections.
  const cs = corrections(60, 1205);
  let corrected = 0;
  for (const c of cs) if (correctBatchPlain(c).status === 'optimal') corrected++;
  const corrMs = fastest(ROUNDS, () => {
    for (const c of cs) correctBatchPlain(c);
  }) / cs.length;

  // 3. Probability of one recipe.
  const p = problems[0]!;
  const recipe = solveBlendPlain(p);
  if (recipe.status !== 'optimal') throw new Error('qc bench: the first robust problem should be feasible');
  const calls = 20_000;
  let sink = 0;
  const probUs = (fastest(ROUNDS, () => {
    for (let k = 0; k < calls; k++) sink += inBandProbabilityPlain(p, recipe.massFractions);
  }) * 1000) / calls;
  if (!(sink > 0)) throw new Error('qc bench: probabilities should be positive');

  return [
    {
      name: 'qc robust solve, 12 components, p = 0.99',
      measured: robustMs,
      unit: 'ms',
      op: '<=',
      goal: 20,
      note: `${optimal}/${problems.length} feasible; the same problems without the probability take ${nominalMs.toFixed(2)} ms each (CPU time, fastest of ${ROUNDS} rounds)`,
    },
    {
      name: 'qc correction, 10 candidate stocks',
      measured: corrMs,
      unit: 'ms',
      op: '<=',
      goal: 2,
      note: `${corrected}/${cs.length} correctable (the rest answered with the reason in numbers)`,
    },
    {
      name: 'qc probability of one recipe',
      measured: probUs,
      unit: 'µs',
      op: '<=',
      goal: 5,
      note: 'inBandProbabilityPlain, twelve stocks, validation included',
    },
  ];
}
