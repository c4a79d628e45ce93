/**
 * Why a line plan has no solution, in a planner's words: which grade cannot be made at all (and
 * why, from the single-grade diagnosis), or which supply is short and by how many tonnes, or how
 * many distinct stocks the line needs at least.
 *
 * Order of the questions (each asked only when the previous ones found nothing):
 * 1. each grade alone, with every usable stock and no supply or tank limit (`solvePrepared`); an
 *    infeasible grade is reported with `diagnoseInfeasible`'s reason;
 * 2. the least supply shortfall: the line plan with a slack of tonnes on every supply row and on
 *    every minimum-use row, their sum minimised (tank limit left out); a positive optimum names
 *    each short stock and the tonnes by which one least-shortfall plan misses;
 * 3. the least number of distinct stocks the line can be made from under the supplies
 *    (Σ yᵢ minimised, exactly); above the limit, that number is the reason.
 */
import { formatFixed, type NumberDisplay } from '../words/display';
import { solvePrepared } from '../solver/engine';
import { diagnoseInfeasible, type DiagnosisLabels } from '../solver/diagnose';
import { solveJoint, type JointProblem } from './joint';
import { inBandInfeasibleReason, withInBandProbability } from '../qc/robust-solve';

/** Wording for a plan's messages. */
export interface PlanLabels {
  /** Per grade: e.g. "VG 460 (Gear oil VG 460)" and its ISO limits, for the single-grade diagnosis. */
  grades: readonly DiagnosisLabels[];
  /** Per stock: its code. */
  stocks: readonly string[];
  /** How the reason writes numbers (default "."). */
  display?: NumberDisplay;
}

export interface PlanDiagnosis {
  /** The reason in words, with the numbers (quantities in tonnes). */
  reason: string;
  /**
   * The same reason with its quantities in kg (kinds 'supply' and 'min-use', the reasons that name
   * quantities), for a planner who enters the plan in kg; absent for reasons without quantities.
   */
  reasonKg?: string;
  /** 'grade' (a grade alone), 'supply' (short supply), 'min-use' (a stock cannot be used as much as asked), 'tanks', or 'unknown'. */
  kind: 'grade' | 'supply' | 'min-use' | 'tanks' | 'unknown';
  /** The grade that cannot be made (index), for kind 'grade'. */
  grade: number | null;
  /** Stocks short and by how many tonnes (kind 'supply' or 'min-use'). */
  short: { stock: number; tonnes: number }[];
  /** Least number of distinct stocks (kind 'tanks'); null when not found within the LP limit. */
  minStocks: number | null;
  lpCount: number;
}

/**
 * Tonnes for a message: whole tonnes from 10 t (grouped, as the app's tables), else one or two
 * decimals; at least `minDecimals` where a sentence needs them to tell its numbers apart.
 */
export function fmtTonnes(t: number, display: NumberDisplay = { thousandsGrouping: true }, minDecimals = 0): string {
  const a = Math.abs(t);
  return `${formatFixed(t, Math.max(a >= 10 ? 0 : a >= 1 ? 1 : 2, minDecimals), display)} t`;
}

/**
 * A quantity given in tonnes, written in kg for a message: whole kg from 10 kg (grouped, as the
 * app's tables), else one or two decimals. 1 t = 1000 kg (SI).
 */
export function fmtKgOfTonnes(t: number, display: NumberDisplay = { thousandsGrouping: true }, minDecimals = 0): string {
  const kg = t * 1000;
  const a = Math.abs(kg);
  return `${formatFixed(kg, Math.max(a >= 10 ? 0 : a >= 1 ? 1 : 2, minDecimals), display)} kg`;
}

/**
 * The fewest decimals (at least; 0–6) with which a sentence's numbers read apart: the shortfall not
 * as zero, and the quantity on offer not equal to the quantity needed (a shortfall of 3 kg of 73 t
 * read "short by 0.00 t (73 t on offer; the plan needs at least 73 t)"; now "0.003 t (73.478 t on
 * offer; … 73.481 t)").
 */
function decimalsApart(q: (t: number, minDecimals: number) => string, short: number, a: number, b: number): number {
  for (let d = 0; d < 6; d++) {
    if (q(short, d) !== q(0, d) && q(a, d) !== q(b, d)) return d;
  }
  return 6;
}

/**
 * Diagnose an infeasible line plan.
 *
 * @param J - the line plan (already known to be infeasible)
 * @param labels - grade and stock wording
 * @param maxLps - LP limit of the exact stock-count search
 * @returns the reason and what it names
 */
export function diagnoseLinePlan(J: JointProblem, labels: PlanLabels, maxLps = 4000): PlanDiagnosis {
  const display: NumberDisplay = { thousandsGrouping: true, ...labels.display };
  const inTonnes = (t: number, minDecimals = 0) => fmtTonnes(t, display, minDecimals);
  const inKg = (t: number, minDecimals = 0) => fmtKgOfTonnes(t, display, minDecimals);
  let lpCount = 0;
  const out = (d: Omit<PlanDiagnosis, 'lpCount' | 'grade' | 'short' | 'minStocks'> & Partial<PlanDiagnosis>): PlanDiagnosis => ({
    grade: null,
    short: [],
    minStocks: null,
    ...d,
    lpCount,
  });

  // 1. Each grade alone.
  for (let g = 0; g < J.grades.length; g++) {
    const P = J.grades[g]!;
    const r = solvePrepared(P);
    lpCount += r.lpCount;
    if (r.status === 'optimal') continue;
    // Possible without its minimum probability in band: that minimum is the reason.
    if ((P.targets.minInBandProbability ?? 0) > 0) {
      const r0 = solvePrepared(P, null, { nominal: true });
      lpCount += r0.lpCount;
      if (r0.status === 'optimal') {
        const band = { min: P.targets.kv40Min, max: P.targets.kv40Max };
        return out({ kind: 'grade', grade: g, reason: `${labels.grades[g]!.product} cannot be made, even on its own: ${inBandInfeasibleReason(P, band, null, labels.grades[g]!.display ?? labels.display)}` });
      }
    }
    const d = diagnoseInfeasible(withInBandProbability(P, null), labels.grades[g]!);
    lpCount += d.lpCount;
    const why = d.binding === 'kv40-min' || d.binding === 'kv40-max' ? d.reason : `${d.reason} ${d.suggestion}`;
    return out({ kind: 'grade', grade: g, reason: `${labels.grades[g]!.product} cannot be made, even on its own: ${why}` });
  }

  // 2. Supply shortfall.
  const n = J.grades[0]!.n;
  const sf = solveJoint(J, { mode: 'shortfall' });
  lpCount += sf.lpCount;
  if (sf.status === 'optimal' && sf.objective > 1e-6) {
    const short: { stock: number; tonnes: number }[] = [];
    const users: number[][] = [];
    for (let i = 0; i < n; i++) {
      users.push(J.grades.map((_, g) => g).filter((g) => sf.fractions[g]![i]! > 1e-6));
      if (sf.supplyShortT![i]! > 1e-6) short.push({ stock: i, tonnes: sf.supplyShortT![i]! });
      if (sf.useShortT![i]! > 1e-6) short.push({ stock: i, tonnes: sf.useShortT![i]! });
    }
    // The sentences, with the quantities written by `q` (in tonnes, or the same numbers in kg).
    // Each sentence's numbers get the decimals that tell them apart (decimalsApart).
    const supplyText = (q0: (t: number, minDecimals: number) => string): string[] => {
      const parts: string[] = [];
      for (let i = 0; i < n; i++) {
        const s = sf.supplyShortT![i]!;
        if (!(s > 1e-6)) continue;
        const offer = J.supplyKg[i]! / 1000;
        const need = offer + s;
        const x = decimalsApart(q0, s, offer, need);
        const q = (t: number) => q0(t, x);
        const by = users[i]!;
        parts.push(
          `${labels.stocks[i]} is short by ${q(s)} (${q(offer)} on offer; ` +
            `the plan needs at least ${q(need)}${by.length ? ` for ${by.map((g) => labels.grades[g]!.product).join(', ')}` : ''})`,
        );
      }
      return parts;
    };
    const useText = (q0: (t: number, minDecimals: number) => string): string[] => {
      const parts: string[] = [];
      for (let i = 0; i < n; i++) {
        const u = sf.useShortT![i]!;
        if (!(u > 1e-6)) continue;
        const least = J.minUseKg[i]! / 1000;
        const x = decimalsApart(q0, u, least - u, least);
        const q = (t: number) => q0(t, x);
        parts.push(
          `${labels.stocks[i]} can be used at most ${q(least - u)} over the period, ` +
            `${q(u)} less than the ${q(least)} it must stay in use for`,
        );
      }
      return parts;
    };
    if (supplyText(inTonnes).length > 0) {
      const supplyReason = (q: (t: number, minDecimals: number) => string) => {
        const parts = supplyText(q);
        return (
          `The limited supply does not cover the demand: ${parts.join('; ')}. ` +
          (parts.length > 1 ? 'These shortfalls together are the least that closes the gap. ' : '') +
          'Secure more of it, lower the demand of the grades that need it, or allow a stock that can replace it.'
        );
      };
      return out({ kind: 'supply', short, reason: supplyReason(inTonnes), reasonKg: supplyReason(inKg) });
    }
    return out({
      kind: 'min-use',
      short,
      reason: `${useText(inTonnes).join('; ')}. Lower the tonnage that must stay in use, or raise the demand of grades that can take it.`,
      reasonKg: `${useText(inKg).join('; ')}. Lower the quantity that must stay in use, or raise the demand of grades that can take it.`,
    });
  }

  // 3. Tank limit.
  if (J.maxStocks !== null) {
    const c = solveJoint(J, { mode: 'count', maxLps });
    lpCount += c.lpCount;
    if (c.status === 'optimal' && c.objective > J.maxStocks) {
      const used: string[] = [];
      for (let i = 0; i < n; i++) if (c.fractions.some((w) => w[i]! > 1e-6) || J.keep[i]) used.push(labels.stocks[i]!);
      return out({
        kind: 'tanks',
        minStocks: c.objective,
        reason:
          `The line cannot be made from ${J.maxStocks} distinct stocks: it needs at least ${c.objective} ` +
          `(for example ${used.join(', ')}). Allow more stocks, or relax a grade's limits.`,
      });
    }
    if (c.status === 'limit') {
      return out({
        kind: 'tanks',
        reason:
          `The line could not be made from ${J.maxStocks} distinct stocks, and the search for the least number ` +
          `stopped after ${c.lpCount} LPs. Allow more stocks.`,
      });
    }
  }
  return out({
    kind: 'unknown',
    reason: 'No plan meets every grade, supply and stock limit together, although each grade can be made on its own. Relax a limit and plan again.',
  });
}
