/**
 * Equivalent sources: stocks that are interchangeable for blending — the same category with
 * viscosities, density and aniline point within a stated tolerance, typically a first and a second
 * source of the same grade. The substitute explorer groups candidates that differ only by such
 * alternatives into one row, so twenty near-identical recipes do not bury the different ones.
 *
 * Default tolerance (common practice (no source)): ν40 and ν100 within 8 % of the lower value — two
 * sources of one nominal grade commonly differ by several per cent, inside a grade's ±10 % band —
 * density at 15 °C within 0.005 kg/L, aniline point within 3 °C (both missing also agrees).
 * Viscosities are the blending values (a calibration's effective values where calibrated).
 *
 * Grouping is complete-linkage: a stock joins a group only when it is equivalent to every member,
 * so a chain of small differences never links two distant stocks. Deterministic: stocks are taken
 * in library order and join the first group that accepts them.
 */
import type { Component } from '../formulation/model';
import { blendingViscosities } from '../formulation/blend-properties';

export interface EquivalenceTolerance {
  /** Largest difference of ν40 and of ν100, in % of the lower of the two values. */
  viscosityPct: number;
  /** Largest difference of density at 15 °C [kg/L]. */
  densityKgL: number;
  /** Largest difference of aniline point [°C]. */
  anilineC: number;
}

export const DEFAULT_EQUIVALENCE_TOLERANCE: Readonly<EquivalenceTolerance> = Object.freeze({
  viscosityPct: 8,
  densityKgL: 0.005,
  anilineC: 3,
});

interface Props {
  kv40: number;
  kv100: number;
}

function props(c: Component): Props | null {
  try {
    const v = blendingViscosities(c);
    return Number.isFinite(v.kv40) && Number.isFinite(v.kv100) ? v : null;
  } catch {
    return null; // a stock without usable viscosities is equivalent to nothing
  }
}

const withinPct = (a: number, b: number, pct: number) => Math.abs(a - b) <= (pct / 100) * Math.min(a, b) + 1e-12;

/**
 * Whether two stocks are equivalent sources: same category, ν40 and ν100 within `viscosityPct` % of
 * the lower value, density within `densityKgL`, aniline point within `anilineC` (or both unknown).
 *
 * @param a - a stock
 * @param b - another stock
 * @param tol - tolerance (default {@link DEFAULT_EQUIVALENCE_TOLERANCE})
 * @returns true when interchangeable within the tolerance
 * @example equivalentSources(pao6, pao6SecondSource) // → true (ν40 31 vs 30.2 mm²/s: 2.6 %)
 */
export function equivalentSources(a: Component, b: Component, tol: EquivalenceTolerance = DEFAULT_EQUIVALENCE_TOLERANCE): boolean {
  return equivalent(a, props(a), b, props(b), tol);
}

function equivalent(a: Component, pa: Props | null, b: Component, pb: Props | null, tol: EquivalenceTolerance): boolean {
  if (a.category !== b.category || !pa || !pb) return false;
  if (!withinPct(pa.kv40, pb.kv40, tol.viscosityPct) || !withinPct(pa.kv100, pb.kv100, tol.viscosityPct)) return false;
  if (Math.abs(a.density15 - b.density15) > tol.densityKgL + 1e-12) return false;
  if ((a.anilinePoint === null) !== (b.anilinePoint === null)) return false;
  if (a.anilinePoint !== null && b.anilinePoint !== null && Math.abs(a.anilinePoint - b.anilinePoint) > tol.anilineC + 1e-12) return false;
  return true;
}

/**
 * Groups stocks into equivalent sources (complete linkage, in the order given). Cost grows with
 * the number of stocks times the number of groups: pass the stocks of interest (e.g. those the
 * candidates use), not a 20,000-stock library.
 *
 * @param components - the stocks to group
 * @param tol - tolerance
 * @returns a map from stock id to its group number (0-based, in order of each group's first
 *   member); a stock with no equivalent has a group of its own
 */
export function sourceGroups(components: readonly Component[], tol: EquivalenceTolerance = DEFAULT_EQUIVALENCE_TOLERANCE): Map<string, number> {
  const groups: { c: Component; p: Props | null }[][] = [];
  const out = new Map<string, number>();
  for (const c of components) {
    const p = props(c);
    let g = groups.findIndex((members) => members.every((m) => equivalent(m.c, m.p, c, p, tol)));
    if (g < 0) {
      g = groups.length;
      groups.push([]);
    }
    groups[g]!.push({ c, p });
    out.set(c.id, g);
  }
  return out;
}

/** Candidates that use the same stocks up to equivalent sources. */
export interface CandidateGroup<T> {
  /** Key of the group: the sorted source-group numbers of the stocks used, joined by '+'. */
  key: string;
  /** The first candidate of the group in the given order (the best ranked when given ranked). */
  lead: T;
  /** The other candidates of the group, in the given order. */
  alternatives: T[];
}

/**
 * Groups candidates whose stocks are the same up to equivalent sources (e.g. A + B and A + B′ where
 * B′ is B's second source). Order is kept: groups follow their lead's position.
 *
 * @param candidates - candidates in display order, each listing the stock ids it uses
 * @param groupOf - from {@link sourceGroups}; ids not in it count as a group of their own
 * @returns the groups
 */
export function groupCandidates<T extends { componentIds: readonly string[] }>(
  candidates: readonly T[],
  groupOf: ReadonlyMap<string, number>,
): CandidateGroup<T>[] {
  const byKey = new Map<string, CandidateGroup<T>>();
  const out: CandidateGroup<T>[] = [];
  for (const c of candidates) {
    const key = c.componentIds
      .map((id) => (groupOf.has(id) ? `g${groupOf.get(id)}` : `id:${id}`))
      .sort()
      .join('+');
    const g = byKey.get(key);
    if (g) g.alternatives.push(c);
    else {
      const ng: CandidateGroup<T> = { key, lead: c, alternatives: [] };
      byKey.set(key, ng);
      out.push(ng);
    }
  }
  return out;
}
