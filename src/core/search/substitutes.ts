/**
 * Substitute search: every combination of up to k of the remaining stocks (plus the fixed additive
 * and any component with a minimum fraction), each solved to the targets, ranked, deduplicated by
 * the components actually used, with the cost–solvency Pareto frontier.
 *
 * Pure and chunked, so the app runs it in a Web Worker with progress and cancel:
 *
 * ```ts
 * const search = createSubstituteSearch({ components, targets, reference, withdrawn, maxComponents: 4 });
 * while (!cancelled) {
 *   const p = search.step(2000);           // solve up to 2000 combinations
 *   postMessage({ type: 'progress', ...p });
 *   if (p.done) break;
 *   await new Promise((r) => setTimeout(r, 0)); // let a 'cancel' message in
 * }
 * postMessage({ type: 'result', result: search.result() }); // plain data, structured-clone safe
 * ```
 *
 * Combinations are visited in a fixed order (size 0 or 1 upward, then lexicographic by library
 * index), so a chunked run gives exactly the one-shot answer, whatever the budgets.
 *
 * Deduplication: the optimum over a combination often leaves one of its components at zero; it is
 * then the same recipe as the optimum of a smaller combination. Candidates are keyed by the set of
 * components used (fraction > 1e-6) and the best objective value per set is kept.
 */
import type { BlendMethod } from '../blending/blend-viscosity';
import { BlendbenchInputError } from '../errors';
import type { BlendTargets, Component, Objective, Recipe, RecipeLine } from '../formulation/model';
import { paretoFrontier } from './frontier';
import { prepareComponents, solvePrepared, type PreparedProblem } from '../solver/solve-blend';
import { combinationCanMatter, sizeCanMatter, supportBound } from './support';

/** Default largest number of free components per combination (issue 3: k = 4). */
export const DEFAULT_MAX_COMPONENTS = 4;

/** A fraction above this counts as "used" (below it is weighing noise). */
export const USED_FRACTION = 1e-6;

export interface SubstituteSearchInput {
  /** The library, including withdrawn stocks (they are skipped). */
  components: readonly Component[];
  /** Targets and constraints; `objective` ranks the candidates (default use: 'cost'). */
  targets: BlendTargets;
  /** The recipe being replaced (needed only for the 'closest' objective; may use withdrawn stocks). */
  reference?: Recipe | null;
  /** Further component ids to treat as withdrawn (besides availability 'withdrawn'); unknown ids ignored. */
  withdrawn?: readonly string[];
  /** Largest number of free components per combination (default 4); forced ones do not count. */
  maxComponents?: number;
  method?: BlendMethod;
  /** Keep at most this many ranked candidates in the result (default: all). The frontier is always complete. */
  limit?: number;
  /** Run one shard of the combinations (parallel workers); default: all. */
  shard?: SearchShard;
}

/** One distinct substitute recipe. */
export interface SubstituteCandidate {
  /** Stable key: the used component ids, library order, joined by '+'. */
  key: string;
  /** Used component ids (fraction > 1e-6), library order. */
  componentIds: string[];
  /** Recipe lines of the used components, library order, summing to 1. */
  lines: RecipeLine[];
  /** Value of the ranking objective (cost/L, aniline °C, oxidation rating, or closeness distance). */
  objectiveValue: number;
  costPerLitre: number;
  /** Aniline point [°C]; null if no used component has one. */
  anilinePoint: number | null;
  kv40: number;
  kv100: number;
  /** Unrounded VI; null where ν100 < 2.0 mm²/s. */
  vi: number | null;
  density15: number;
  /** Base-fluid oxidation rating (Blendbench 1–5 scale). */
  oxidationRating: number | null;
  /** 1-based rank by the objective. */
  rank: number;
  /** On the cost–aniline Pareto frontier. */
  onFrontier: boolean;
  /**
   * Sequence number of the combination that produced it (sizes ascending, lexicographic): the
   * tie-break when the results of parallel shards are merged.
   */
  foundAt: number;
}

export interface SubstituteSearchProgress {
  /** Combinations solved so far. */
  evaluated: number;
  /** Combinations in all. */
  total: number;
  /** Combinations with a feasible optimum so far. */
  feasible: number;
  /** Distinct candidates so far. */
  distinct: number;
  /** LPs solved so far (a combination can need several for the VI condition, or none when pruned). */
  lpCount: number;
  /**
   * Combinations settled without solving: proven to be no cheaper than their best sub-combination
   * (least-cost objective only), so they add no new candidate.
   */
  skipped: number;
  done: boolean;
  /**
   * Every combination of this many free stocks or fewer has been settled: the candidates so far are
   * final for recipes of up to this many free stocks (0 before the first size is through).
   */
  completedSize: number;
}

export interface SubstituteSearchResult extends SubstituteSearchProgress {
  objective: Objective;
  /** Ranked candidates (best first), at most `limit`. */
  candidates: SubstituteCandidate[];
  /** The cost–aniline Pareto frontier over ALL candidates, cost ascending. */
  frontier: SubstituteCandidate[];
  /** Ids left out of every combination: withdrawn, or not usable for these targets (an additive
   * package other than the targets' additive, a missing pour/flash point under such a limit). */
  excludedIds: string[];
  /** Ids always included (fixed additive, minimum fractions). */
  forcedIds: string[];
  /** Ids the combinations were drawn from. */
  poolIds: string[];
  maxComponents: number;
  /** ν40 band solved to [mm²/s]. */
  band: { min: number; max: number };
}

export interface SubstituteSearch {
  /** Combinations in all. */
  readonly total: number;
  /** Solve up to `budget` further combinations (≥ 1); returns the progress. */
  step(budget: number): SubstituteSearchProgress;
  /** Progress so far without solving. */
  progress(): SubstituteSearchProgress;
  /** Ranked candidates and frontier of the combinations solved so far (complete once done). */
  result(): SubstituteSearchResult;
}

/** Binomial coefficient C(n, k) (exact for the sizes used here). */
export function binomial(n: number, k: number): number {
  if (k < 0 || k > n) return 0;
  let r = 1;
  for (let i = 1; i <= k; i++) r = (r * (n - k + i)) / i;
  return Math.round(r);
}

/**
 * Iterator over all combinations of 0/1…k elements of [0, m), size ascending, lexicographic.
 * `next()` fills `out` with the next combination and returns its size, or −1 when exhausted.
 */
export class CombinationCursor {
  private size: number;
  private readonly idx: number[] = [];
  private started = false;
  constructor(
    private readonly m: number,
    private readonly minSize: number,
    private readonly maxSize: number,
  ) {
    this.size = minSize;
  }
  next(): number[] | null {
    const { m } = this;
    for (;;) {
      if (this.size > this.maxSize || this.size > m) return null;
      const k = this.size;
      if (!this.started) {
        this.idx.length = k;
        for (let i = 0; i < k; i++) this.idx[i] = i;
        this.started = true;
        return this.idx;
      }
      // Advance lexicographically.
      let i = k - 1;
      while (i >= 0 && this.idx[i] === m - k + i) i--;
      if (i < 0) {
        this.size++;
        this.started = false;
        continue;
      }
      this.idx[i]!++;
      for (let j = i + 1; j < k; j++) this.idx[j] = this.idx[j - 1]! + 1;
      return this.idx;
    }
  }
}

interface Found {
  key: string;
  used: number[];
  w: Float64Array;
  objectiveValue: number;
  costPerLitre: number;
  anilinePoint: number | null;
  kv40: number;
  kv100: number;
  vi: number | null;
  density15: number;
  /** Sequence number of the combination that produced it. */
  foundAt: number;
}

/**
 * Create a chunked substitute search.
 *
 * @param input Library, targets, reference, extra withdrawn ids, k (default 4), mixing rule, limit.
 * @returns A search object: `step(budget)`, `progress()`, `result()`.
 * @throws BlendbenchInputError (or a subclass) naming the field, at creation: invalid targets or
 *   components (as `solveBlend`), maxComponents not a whole number ≥ 0, limit < 1.
 * @example
 * const s = createSubstituteSearch({ components: lib, targets, withdrawn: ['bs150'] });
 * while (!s.step(1000).done) {}
 * s.result().candidates[0] // → the least-cost substitute
 */
export function createSubstituteSearch(input: SubstituteSearchInput): SubstituteSearch {
  const fn = 'createSubstituteSearch';
  const k = input.maxComponents ?? DEFAULT_MAX_COMPONENTS;
  if (typeof k !== 'number' || !Number.isInteger(k) || k < 0) {
    throw new BlendbenchInputError('maxComponents', k, `${fn}: maxComponents = ${String(k)}; it must be a whole number ≥ 0`);
  }
  const limit = input.limit ?? Number.POSITIVE_INFINITY;
  if (!(limit >= 1)) throw new BlendbenchInputError('limit', limit, `${fn}: limit = ${String(limit)}; it must be at least 1`);
  const extra = new Set(input.withdrawn ?? []);
  const library = input.components.map((c) => (extra.has(c.id) && c.availability !== 'withdrawn' ? { ...c, availability: 'withdrawn' as const } : c));
  const P = prepareComponents(library, input.targets, input.method ?? 'refutas', input.reference ?? null);
  return searchPrepared(P, k, limit, input.shard);
}

/** One of `count` shards of a search: the combinations whose sequence number ≡ index (mod count). */
export interface SearchShard {
  index: number;
  count: number;
}

/**
 * The chunked search over an already prepared problem (shared by the plain API).
 *
 * Per combination (sizes ascending, lexicographic within a size; sequence numbers from 0):
 * 1. sizes that no combination can fully use (the support bound, `support.ts`) are settled whole;
 * 2. a combination that cannot use all its members (same bound, with its polymer and bounded
 *    members) is settled without an LP;
 * 3. least cost only: a combination whose cheapest conceivable blend (`pairLowerBounds`) is no
 *    cheaper than a sub-combination's optimum is settled without an LP;
 * 4. every other combination is solved (`solvePrepared`).
 * Settled combinations add no recipe: their optimum is a sub-combination's, found earlier.
 *
 * @param P Prepared problem (`prepareComponents`, or `preparePlain` for the plain API).
 * @param k Largest number of free components per combination.
 * @param limit Candidates kept in the result.
 * @param shard Run only one shard of the combinations (parallel workers; merge the shards'
 *   results with {@link mergeSubstituteResults}). Default: all of them.
 */
export function searchPrepared(
  P: PreparedProblem,
  k: number,
  limit = Number.POSITIVE_INFINITY,
  shard: SearchShard = { index: 0, count: 1 },
): SubstituteSearch {
  const forcedSet = new Set(P.forced.filter((i) => P.components[i]!.usable));
  const forced = [...forcedSet].sort((a, b) => a - b);
  const pool = P.usableIndices.filter((i) => !forcedSet.has(i));
  const m = pool.length;
  const minSize = forcedSet.size > 0 ? 0 : 1;
  const maxSize = Math.min(k, m);
  const { index: shardIndex, count: shardCount } = shard;
  if (!(Number.isInteger(shardCount) && shardCount >= 1 && Number.isInteger(shardIndex) && shardIndex >= 0 && shardIndex < shardCount)) {
    throw new BlendbenchInputError('shard', shard, `searchPrepared: shard ${shardIndex} of ${shardCount} does not exist`);
  }
  /** How many of the sequence numbers [from, from + n) belong to this shard. */
  const share = (from: number, n: number): number => {
    if (shardCount === 1) return n;
    const first = from + ((shardIndex - (from % shardCount) + shardCount) % shardCount);
    return first >= from + n ? 0 : Math.floor((from + n - 1 - first) / shardCount) + 1;
  };
  let allCombinations = 0;
  for (let s = minSize; s <= maxSize; s++) allCombinations += binomial(m, s);
  const total = share(0, allCombinations);
  const sense = P.targets.objective === 'oxidation' ? -1 : 1;
  const support = supportBound(P, pool);
  // Exact pruning (least cost only): see pairLowerBounds. Combination codes in base m + 1 must stay
  // exact integers; beyond 2^53 that pruning is left out (it is an acceleration, not a rule).
  const base = m + 1;
  const codesExact = Math.pow(base, maxSize) < Number.MAX_SAFE_INTEGER;
  const bound = P.targets.objective === 'cost' && maxSize >= 2 && codesExact ? pairLowerBounds(P, pool) : null;
  // The largest size with combinations to solve; optima are kept only for the sizes below it.
  let lastSize = maxSize;
  while (lastSize > minSize && !sizeCanMatter(support, lastSize)) lastSize--;
  /** Optimum cost per combination of size < lastSize (+∞ if infeasible), by combination code. */
  const optOf = new Map<number, number>();
  // Keys of used sets: a number (indices in base n + 1) while exact, else the joined ids.
  const keyBase = P.n + 1;
  const numericKeys = Math.pow(keyBase, maxSize + forced.length) < Number.MAX_SAFE_INTEGER;
  const found = new Map<number | string, Found>();
  let skipped = 0;
  let evaluated = 0;
  let feasible = 0;
  let lpCount = 0;
  let done = total === 0;
  // Cursor state: the current size, its combination (pool positions), the next sequence number.
  let size = minSize;
  const comb: number[] = [];
  let levelOpen = false;
  let seq = 0;
  let completedSize = minSize - 1;
  const subset: number[] = [];
  const used: number[] = [];

  /** Move to the next combination; false when every size is through. */
  const advance = (): boolean => {
    for (;;) {
      if (!levelOpen) {
        if (size > maxSize) return false;
        const count = binomial(m, size);
        if (!sizeCanMatter(support, size)) {
          // No combination of this size can need all its members: settle the size whole.
          const mine = share(seq, count);
          evaluated += mine;
          skipped += mine;
          seq += count;
          completedSize = size++;
          continue;
        }
        comb.length = size;
        for (let j = 0; j < size; j++) comb[j] = j;
        levelOpen = true;
        return true;
      }
      let i = size - 1;
      while (i >= 0 && comb[i] === m - size + i) i--;
      if (i < 0) {
        levelOpen = false;
        completedSize = size++;
        continue;
      }
      comb[i]!++;
      for (let j = i + 1; j < size; j++) comb[j] = comb[j - 1]! + 1;
      return true;
    }
  };

  const progress = (): SubstituteSearchProgress => ({
    evaluated,
    total,
    feasible,
    distinct: found.size,
    lpCount,
    skipped,
    done,
    completedSize: Math.max(0, Math.min(completedSize, maxSize)),
  });

  const step = (budget: number): SubstituteSearchProgress => {
    let left = Math.max(1, Math.floor(budget));
    while (!done && left > 0) {
      if (!advance()) {
        done = true;
        break;
      }
      const order = seq++;
      if (shardCount > 1 && order % shardCount !== shardIndex) continue;
      evaluated++;
      left--;
      let code = 0;
      if (bound && size <= lastSize) for (let j = 0; j < size; j++) code = code * base + comb[j]! + 1;
      const fullyUsable = combinationCanMatter(support, comb, size);
      // Skip when no blend of the combination can be cheaper than its best sub-combination: then its
      // optimum IS that sub-combination's recipe, already found (one component fewer, size order).
      const keep = bound !== null && size < lastSize;
      if (bound && size > minSize && (fullyUsable || keep)) {
        let bestSub = Number.POSITIVE_INFINITY;
        let allSubsKnown = true;
        let lb = Number.POSITIVE_INFINITY;
        for (let j = 0; j < size; j++) {
          let sub = 0;
          for (let q = 0; q < size; q++) if (q !== j) sub = sub * base + comb[q]! + 1;
          const v = optOf.get(sub);
          if (v === undefined) allSubsKnown = false;
          else if (v < bestSub) bestSub = v;
          if (!fullyUsable) continue;
          for (let q = j + 1; q < size; q++) {
            const b = bound.pair[comb[j]! * m + comb[q]!]!;
            if (b < lb) lb = b;
          }
        }
        if (!fullyUsable) {
          // Settled by the support bound: its optimum is the best sub-combination's.
          skipped++;
          if (keep && allSubsKnown) optOf.set(code, bestSub);
          continue;
        }
        if (size === 1) lb = bound.pair[comb[0]! * m + comb[0]!]!;
        lb = Math.min(lb, bound.withForced(comb));
        // (With a partial view of the sub-combinations — a shard — one known sub-combination at
        // least as cheap as the bound still proves the optimum equal to it.)
        if (Number.isFinite(bestSub) ? lb >= bestSub * (1 - 1e-9) : allSubsKnown && lb === Number.POSITIVE_INFINITY) {
          skipped++;
          if (keep) optOf.set(code, bestSub);
          continue;
        }
      } else if (!fullyUsable) {
        skipped++;
        continue;
      }
      subset.length = size;
      for (let j = 0; j < size; j++) subset[j] = pool[comb[j]!]!;
      const r = solvePrepared(P, subset);
      lpCount += r.lpCount;
      if (keep) optOf.set(code, r.status === 'optimal' ? r.costPerLitre : Number.POSITIVE_INFINITY);
      if (r.status !== 'optimal') continue;
      feasible++;
      // Used components, library order: the subset (ascending) merged with the forced ones.
      used.length = 0;
      let a = 0;
      let f = 0;
      while (a < size || f < forced.length) {
        const i = f >= forced.length || (a < size && subset[a]! < forced[f]!) ? subset[a++]! : forced[f++]!;
        if (r.massFractions[i]! > USED_FRACTION) used.push(i);
      }
      let key: number | string;
      if (numericKeys) {
        key = 0;
        for (const i of used) key = key * keyBase + i + 1;
      } else key = used.map((i) => P.components[i]!.id).join('+');
      const objectiveValue = P.targets.objective === 'cost' ? r.costPerLitre : r.objectiveValue;
      const prev = found.get(key);
      if (prev && sense * prev.objectiveValue <= sense * objectiveValue) continue;
      found.set(key, {
        key: typeof key === 'string' ? key : used.map((i) => P.components[i]!.id).join('+'),
        used: used.slice(),
        w: r.massFractions,
        objectiveValue,
        costPerLitre: r.costPerLitre,
        anilinePoint: r.anilinePoint,
        kv40: r.kv40,
        kv100: r.kv100,
        vi: r.vi,
        density15: r.density15,
        foundAt: order,
      });
    }
    // Every combination of this shard settled: the rest of the sequence belongs to other shards.
    if (evaluated >= total) done = true;
    if (done) completedSize = maxSize;
    return progress();
  };

  const result = (): SubstituteSearchResult => {
    const toCandidate = (f: Found): SubstituteCandidate => {
      let bw = 0;
      let bo = 0;
      for (const i of f.used) {
        if (!P.components[i]!.baseFluid) continue;
        bw += f.w[i]!;
        bo += f.w[i]! * P.ox[i]!;
      }
      return {
        key: f.key,
        componentIds: f.used.map((i) => P.components[i]!.id),
        lines: f.used.map((i) => ({ componentId: P.components[i]!.id, massFraction: f.w[i]! })),
        objectiveValue: f.objectiveValue,
        costPerLitre: f.costPerLitre,
        anilinePoint: f.anilinePoint,
        kv40: f.kv40,
        kv100: f.kv100,
        vi: f.vi,
        density15: f.density15,
        oxidationRating: bw > 0 ? bo / bw : null,
        rank: 0,
        onFrontier: false,
        foundAt: f.foundAt,
      };
    };
    const ranked = rankCandidates([...found.values()].map(toCandidate), P.targets.objective);
    return {
      ...progress(),
      objective: P.targets.objective,
      candidates: Number.isFinite(limit) ? ranked.candidates.slice(0, limit) : ranked.candidates,
      frontier: ranked.frontier,
      excludedIds: P.components.filter((c) => !c.usable).map((c) => c.id),
      forcedIds: forced.map((i) => P.components[i]!.id),
      poolIds: pool.map((i) => P.components[i]!.id),
      maxComponents: k,
      band: { min: P.targets.kv40Min, max: P.targets.kv40Max },
    };
  };

  return { total, step, progress, result };
}

/**
 * Rank candidates by the objective (then cost per litre, then key), number them from 1 and mark the
 * cost–aniline Pareto frontier (over all of them).
 *
 * @param candidates - one per distinct key (rank and onFrontier are overwritten in copies)
 * @param objective - the ranking objective ('oxidation' ranks high first, the others low first)
 * @returns the ranked candidates and the frontier (cost ascending)
 */
export function rankCandidates(
  candidates: readonly SubstituteCandidate[],
  objective: Objective,
): { candidates: SubstituteCandidate[]; frontier: SubstituteCandidate[] } {
  const sense = objective === 'oxidation' ? -1 : 1;
  const all = [...candidates].sort(
    (a, b) => sense * (a.objectiveValue - b.objectiveValue) || a.costPerLitre - b.costPerLitre || (a.key < b.key ? -1 : a.key > b.key ? 1 : 0),
  );
  const frontierKeys = new Set(
    paretoFrontier(
      all.filter((f) => f.anilinePoint !== null),
      (f) => f.costPerLitre,
      (f) => f.anilinePoint!,
    ).map((f) => f.key),
  );
  const ranked = all.map((c, i) => ({ ...c, rank: i + 1, onFrontier: frontierKeys.has(c.key) }));
  const frontier = paretoFrontier(
    ranked.filter((c) => c.onFrontier),
    (c) => c.costPerLitre,
    (c) => c.anilinePoint!,
  );
  return { candidates: ranked, frontier };
}

/**
 * Merge the results of the shards of one search (each run with no `limit`) into the result the
 * whole search would give: per key the better objective value (an exact tie goes to the candidate
 * found at the earlier combination, as in one run), counters added, ranked again.
 *
 * @param parts - one result per shard (any order; at least one)
 * @param limit - candidates kept (default: all)
 * @returns the merged result; `done` only when every shard is done, `completedSize` the least of theirs
 */
export function mergeSubstituteResults(parts: readonly SubstituteSearchResult[], limit = Number.POSITIVE_INFINITY): SubstituteSearchResult {
  const first = parts[0]!;
  const sense = first.objective === 'oxidation' ? -1 : 1;
  const best = new Map<string, SubstituteCandidate>();
  let evaluated = 0;
  let total = 0;
  let feasible = 0;
  let lpCount = 0;
  let skipped = 0;
  let done = true;
  let completedSize = Number.POSITIVE_INFINITY;
  for (const part of parts) {
    evaluated += part.evaluated;
    total += part.total;
    feasible += part.feasible;
    lpCount += part.lpCount;
    skipped += part.skipped;
    done &&= part.done;
    completedSize = Math.min(completedSize, part.completedSize);
    for (const c of part.candidates) {
      const prev = best.get(c.key);
      if (
        !prev ||
        sense * c.objectiveValue < sense * prev.objectiveValue ||
        (c.objectiveValue === prev.objectiveValue && c.foundAt < prev.foundAt)
      ) {
        best.set(c.key, c);
      }
    }
  }
  const ranked = rankCandidates([...best.values()], first.objective);
  return {
    ...first,
    evaluated,
    total,
    feasible,
    lpCount,
    skipped,
    done,
    completedSize: Number.isFinite(completedSize) ? completedSize : 0,
    distinct: best.size,
    candidates: Number.isFinite(limit) ? ranked.candidates.slice(0, limit) : ranked.candidates,
    frontier: ranked.frontier,
  };
}

/**
 * Run a whole search in one call (tests, Node scripts).
 *
 * @param input As {@link createSubstituteSearch}.
 * @returns The complete result.
 * @example searchSubstitutes({ components: lib, targets, withdrawn: ['bs150'] }).candidates.length // → 37
 */
export function searchSubstitutes(input: SubstituteSearchInput): SubstituteSearchResult {
  const s = createSubstituteSearch(input);
  while (!s.step(10_000).done) {
    /* keep solving */
  }
  return s.result();
}

/**
 * Lower bounds on the least cost per litre of every pair of pool components, for exact pruning.
 *
 * Relaxation: keep only the normalisation, the fixed treat rates (components with min = max) and
 * the ν40 band; drop VI, aniline, polymer, pour/flash limits and other bounds (components forced
 * by a minimum become optional). Every combination's feasible set lies inside its relaxation, so
 * the relaxed optimum is a lower bound. The relaxed problem is a linear-fractional program with
 * three rows (normalisation, treat rates, one band side), so an optimal vertex uses at most two
 * free components: the bound of a combination T is the least pair bound within T (and with the
 * forced components).
 *
 * For a pair (i, j) with fixed part a: wᵢ = (1 − a)(1 − t), wⱼ = (1 − a)t, t ∈ [0, 1]. The blend X40
 * (Σ cw X / Σ cw) and the cost per litre (Σ wp / Σ w/ρ) are both linear-fractional in t, hence
 * monotone: the band cuts an interval of t, and the least cost lies at one of its ends.
 */
function pairLowerBounds(
  P: PreparedProblem,
  pool: readonly number[],
): { pair: Float64Array; withForced: (comb: readonly number[]) => number } {
  const m = pool.length;
  let a = 0;
  let fN = 0; // Σ c r X over fixed parts
  let fD = 0; // Σ c r
  let fP = 0; // Σ r p
  let fV = 0; // Σ r/ρ
  const optional: number[] = []; // forced-by-minimum components, optional in the relaxation
  for (const i of P.forced) {
    const k = P.components[i]!;
    if (!k.usable) continue;
    if (k.min === k.max) {
      a += k.min;
      fN += P.c[i]! * k.min * P.x40[i]!;
      fD += P.c[i]! * k.min;
      fP += k.min * P.price[i]!;
      fV += k.min * P.invRho[i]!;
    } else optional.push(i);
  }
  const free = 1 - a;
  const A = P.bandA;
  const B = P.bandB;
  const pairValue = (i: number, j: number): number => {
    if (!(free > 0)) return Number.POSITIVE_INFINITY;
    // X(t) = (N0 + t·N1)/(D0 + t·D1); cost(t) = (C0 + t·C1)/(V0 + t·V1).
    const N0 = fN + free * P.c[i]! * P.x40[i]!;
    const N1 = free * (P.c[j]! * P.x40[j]! - P.c[i]! * P.x40[i]!);
    const D0 = fD + free * P.c[i]!;
    const D1 = free * (P.c[j]! - P.c[i]!);
    let lo = 0;
    let hi = 1;
    // (N0 − K·D0) + t(N1 − K·D1) ≥ 0 for K = A, ≤ 0 for K = B.
    const cut = (K: number, sign: 1 | -1): void => {
      const c0 = sign * (N0 - K * D0);
      const c1 = sign * (N1 - K * D1);
      const eps = 1e-12 * (Math.abs(N0) + Math.abs(K * D0) + 1);
      if (Math.abs(c1) < 1e-15) {
        if (c0 < -eps) hi = -1;
        return;
      }
      const t = -c0 / c1;
      if (c1 > 0) lo = Math.max(lo, t - 1e-12);
      else hi = Math.min(hi, t + 1e-12);
    };
    cut(A, 1);
    cut(B, -1);
    if (lo > hi) return Number.POSITIVE_INFINITY;
    lo = Math.max(0, lo);
    hi = Math.min(1, hi);
    const cost = (t: number): number =>
      (fP + free * ((1 - t) * P.price[i]! + t * P.price[j]!)) / (fV + free * ((1 - t) * P.invRho[i]! + t * P.invRho[j]!));
    // Tiny downward slack keeps the bound on the safe side of round-off.
    return Math.min(cost(lo), cost(hi)) * (1 - 1e-12);
  };
  const pair = new Float64Array(m * m);
  for (let p = 0; p < m; p++) {
    for (let q = p; q < m; q++) {
      const v = pairValue(pool[p]!, pool[q]!);
      pair[p * m + q] = v;
      pair[q * m + p] = v;
    }
  }
  const withForced = (comb: readonly number[]): number => {
    let lb = Number.POSITIVE_INFINITY;
    for (const o of optional) {
      lb = Math.min(lb, pairValue(o, o));
      for (const o2 of optional) lb = Math.min(lb, pairValue(o, o2));
      for (const q of comb) lb = Math.min(lb, pairValue(o, pool[q]!));
    }
    return lb;
  };
  return { pair, withForced };
}
