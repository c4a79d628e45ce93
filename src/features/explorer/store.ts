/**
 * The explorer's session state: the scenario (reference recipe, stocks treated as withdrawn,
 * combination size, ranking), the run's progress and result, the table's sort and selection. Adopted
 * recipes go to the recipes store. The session (all but the run's progress) is copied to the
 * workspace store, so a reload restores it (`restoreSession`); a restored result keeps the fingerprint
 * of what it was computed from, and the screen marks it stale when the library or targets changed.
 */
import { create } from 'zustand';
import { fingerprint, useWorkspaceStore, type ExplorerSession } from '../../state';
import type { BlendMethod } from '../../core/blending/blend-viscosity';
import type { BlendTargets, Component, Objective, Recipe } from '../../core/formulation/model';
import type { SubstituteSearchProgress, SubstituteSearchResult } from '../../core/search/substitutes';

export type RunStatus = 'idle' | 'running' | 'done' | 'cancelled' | 'error';
export type SortKey = 'rank' | 'cost' | 'kv40' | 'vi' | 'aniline' | 'oxidation' | 'size' | 'inBand';
const SORT_KEYS: readonly SortKey[] = ['rank', 'cost', 'kv40', 'vi', 'aniline', 'oxidation', 'size', 'inBand'];

export interface Scenario {
  referenceId: string;
  /** Polymer cap the search ran with (mass fraction; null → none). */
  polymerCap?: number | null;
  /** Least probability in the plant band the search asked for (0–1; null → none). */
  minInBandProbability?: number | null;
  withdrawn: string[];
  maxComponents: number;
  objective: Objective;
  /**
   * The prices the search ran with (base currency, every price restated in it): a result is stale
   * when they change, and its costs are never set against costs at other prices.
   */
  pricingKey?: string;
  /** The reference recipe's cost per litre at those prices, in the base currency; null → not costed. */
  referenceCost?: number | null;
  /** Blend-viscosity method the search ran with (named beside the results). */
  method?: BlendMethod;
}

export interface ExplorerState {
  referenceId: string | null;
  /** Stocks treated as withdrawn in this exploration (besides those withdrawn in the library). */
  withdrawn: string[];
  maxComponents: number;
  objective: Objective;
  /**
   * Polymer cap for the search (mass fraction); null → no cap; undefined → the reference recipe's own
   * cap, or the common-practice default when it has none.
   */
  polymerCap: number | null | undefined;
  /**
   * Least probability in the plant band (0–1) for the search; null → none; undefined → the
   * reference recipe's own target.
   */
  minInBandProbability: number | null | undefined;
  status: RunStatus;
  progress: SubstituteSearchProgress | null;
  result: SubstituteSearchResult | null;
  /** The scenario the result belongs to. */
  resultFor: Scenario | null;
  error: string;
  selectedKey: string | null;
  /** The user picked `selectedKey` (then it is kept as results stream in); otherwise the best candidate is shown. */
  selectedByUser: boolean;
  sort: { key: SortKey; dir: 'asc' | 'desc' };
  /** Candidate key → id of the recipe it was adopted as. */
  adopted: Record<string, string>;
  /** Fingerprint of the library, targets and blending rule the result was computed from (state/workspace.ts). */
  resultBasis: string | null;
  /** True once the session kept from the last visit was looked at (restored or absent). */
  restored: boolean;
  /** The result was restored from the last session (not computed in this one). */
  fromLastSession: boolean;

  setReference: (id: string | null) => void;
  toggleWithdrawn: (id: string, on: boolean) => void;
  setMaxComponents: (k: number) => void;
  setObjective: (o: Objective) => void;
  setPolymerCap: (cap: number | null | undefined) => void;
  setMinInBandProbability: (p: number | null | undefined) => void;
  /** A search starts; `basis` fingerprints the library, targets and rule it runs on. */
  started: (scenario: Scenario, basis?: string | null) => void;
  /** Once per start: take the session kept in the workspace store, if any. */
  restoreSession: () => void;
  progressed: (p: SubstituteSearchProgress) => void;
  /** Ranked candidates while the search runs (final for recipes of up to `completedSize` stocks). */
  ranked: (r: SubstituteSearchResult) => void;
  finished: (r: SubstituteSearchResult) => void;
  cancelled: () => void;
  failed: (message: string) => void;
  select: (key: string | null) => void;
  sortBy: (key: SortKey) => void;
  markAdopted: (key: string, recipeId: string) => void;
}

export const useExplorerStore = create<ExplorerState>()((set) => ({
  referenceId: null,
  withdrawn: [],
  maxComponents: 4,
  objective: 'cost',
  polymerCap: undefined,
  minInBandProbability: undefined,
  status: 'idle',
  progress: null,
  result: null,
  resultFor: null,
  error: '',
  selectedKey: null,
  selectedByUser: false,
  sort: { key: 'rank', dir: 'asc' },
  adopted: {},
  resultBasis: null,
  restored: false,
  fromLastSession: false,

  // Another reference brings its own polymer cap.
  setReference: (referenceId) => set({ referenceId, polymerCap: undefined, minInBandProbability: undefined }),
  toggleWithdrawn: (id, on) =>
    set((s) => ({ withdrawn: on ? [...new Set([...s.withdrawn, id])] : s.withdrawn.filter((x) => x !== id) })),
  setMaxComponents: (maxComponents) => set({ maxComponents }),
  setObjective: (objective) => set({ objective }),
  setPolymerCap: (polymerCap) => set({ polymerCap }),
  setMinInBandProbability: (minInBandProbability) => set({ minInBandProbability }),
  started: (scenario, basis = null) =>
    set({
      status: 'running',
      progress: null,
      error: '',
      resultFor: scenario,
      result: null,
      selectedKey: null,
      selectedByUser: false,
      sort: { key: 'rank', dir: 'asc' },
      adopted: {},
      resultBasis: basis,
      fromLastSession: false,
    }),
  restoreSession: () => {
    if (useExplorerStore.getState().restored) return;
    const kept = useWorkspaceStore.getState().explorer;
    if (!kept) return set({ restored: true });
    set({
      restored: true,
      referenceId: kept.referenceId,
      withdrawn: [...kept.withdrawn],
      maxComponents: kept.maxComponents,
      objective: kept.objective,
      polymerCap: kept.polymerCap,
      minInBandProbability: kept.minInBandProbability,
      result: kept.result,
      resultFor: kept.resultFor
        ? { ...kept.resultFor, polymerCap: kept.resultFor.polymerCap ?? null, minInBandProbability: kept.resultFor.minInBandProbability ?? null }
        : null,
      resultBasis: kept.resultBasis,
      status: kept.result ? 'done' : 'idle',
      selectedKey: kept.selectedKey,
      sort: { key: (SORT_KEYS as readonly string[]).includes(kept.sort.key) ? (kept.sort.key as SortKey) : 'rank', dir: kept.sort.dir },
      adopted: { ...kept.adopted },
      fromLastSession: kept.result !== null,
    });
  },
  progressed: (progress) => set({ progress }),
  ranked: (result) => set((s) => ({ result, ...selectionIn(s, result) })),
  finished: (result) => set((s) => ({ status: 'done', result, ...selectionIn(s, result) })),
  cancelled: () => set({ status: 'cancelled' }),
  failed: (error) => set({ status: 'error', error }),
  select: (selectedKey) => set({ selectedKey, selectedByUser: selectedKey !== null }),
  sortBy: (key) =>
    set((s) => ({ sort: { key, dir: s.sort.key === key ? (s.sort.dir === 'asc' ? 'desc' : 'asc') : key === 'vi' || key === 'oxidation' || key === 'inBand' ? 'desc' : 'asc' } })),
  markAdopted: (key, recipeId) => set((s) => ({ adopted: { ...s.adopted, [key]: recipeId } })),
}));

/** The candidate to compare in a new (streamed or final) result: the user's pick while it is listed, else the best. */
function selectionIn(s: ExplorerState, result: SubstituteSearchResult): Pick<ExplorerState, 'selectedKey' | 'selectedByUser'> {
  if (s.selectedByUser && s.selectedKey && result.candidates.some((c) => c.key === s.selectedKey)) return { selectedKey: s.selectedKey, selectedByUser: true };
  return { selectedKey: result.candidates[0]?.key ?? null, selectedByUser: false };
}

/** The session as kept in the workspace store (everything but the run's progress). */
export function sessionOf(s: ExplorerState): ExplorerSession {
  return {
    referenceId: s.referenceId,
    withdrawn: s.withdrawn,
    maxComponents: s.maxComponents,
    objective: s.objective,
    polymerCap: s.polymerCap,
    minInBandProbability: s.minInBandProbability,
    // A run cut short is not kept: only a finished result is a result.
    result: s.status === 'done' ? s.result : null,
    resultFor: s.status === 'done' ? s.resultFor : null,
    resultBasis: s.status === 'done' ? s.resultBasis : null,
    selectedKey: s.selectedKey,
    sort: s.sort,
    adopted: s.adopted,
  };
}

// Keep the session in the workspace store whenever a part of it changes (not on every progress tick).
useExplorerStore.subscribe((s, p) => {
  if (!s.restored) return;
  const same =
    s.referenceId === p.referenceId &&
    s.withdrawn === p.withdrawn &&
    s.maxComponents === p.maxComponents &&
    s.objective === p.objective &&
    s.polymerCap === p.polymerCap &&
    s.minInBandProbability === p.minInBandProbability &&
    s.status === p.status &&
    s.result === p.result &&
    s.selectedKey === p.selectedKey &&
    s.sort === p.sort &&
    s.adopted === p.adopted &&
    s.restored === p.restored;
  if (!same) useWorkspaceStore.getState().setExplorer(sessionOf(s));
});

/**
 * Fingerprint of what a search result depends on beyond the scenario's own choices: the stocks searched
 * (prices in the base currency, withdrawals), the reference recipe (grade, lines) and its saved targets,
 * and the blending rule. A result whose basis differs from the one now in force is stale.
 */
export function resultBasis(components: readonly Component[], reference: Recipe | null, storedTargets: BlendTargets | undefined, method: BlendMethod): string {
  return fingerprint({
    components,
    reference: reference ? { id: reference.id, grade: reference.grade, lines: reference.lines } : null,
    targets: storedTargets ?? null,
    method,
  });
}
