/**
 * The explorer's session state (in memory): the scenario (reference recipe, stocks treated as
 * withdrawn, combination size, ranking), the run's progress and result, the table's sort and
 * selection. Saved work (adopted recipes) goes to the recipes store.
 */
import { create } from 'zustand';
import type { Objective } from '../../core/formulation/model';
import type { BlendMethod } from '../../core/blending/blend-viscosity';
import type { SubstituteSearchProgress, SubstituteSearchResult } from '../../core/search/substitutes';

export type RunStatus = 'idle' | 'running' | 'done' | 'cancelled' | 'error';
export type SortKey = 'rank' | 'cost' | 'kv40' | 'vi' | 'aniline' | 'oxidation' | 'size' | 'inBand';

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

  setReference: (id: string | null) => void;
  toggleWithdrawn: (id: string, on: boolean) => void;
  setMaxComponents: (k: number) => void;
  setObjective: (o: Objective) => void;
  setPolymerCap: (cap: number | null | undefined) => void;
  setMinInBandProbability: (p: number | null | undefined) => void;
  started: (scenario: Scenario) => void;
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

  // Another reference brings its own polymer cap.
  setReference: (referenceId) => set({ referenceId, polymerCap: undefined, minInBandProbability: undefined }),
  toggleWithdrawn: (id, on) =>
    set((s) => ({ withdrawn: on ? [...new Set([...s.withdrawn, id])] : s.withdrawn.filter((x) => x !== id) })),
  setMaxComponents: (maxComponents) => set({ maxComponents }),
  setObjective: (objective) => set({ objective }),
  setPolymerCap: (polymerCap) => set({ polymerCap }),
  setMinInBandProbability: (minInBandProbability) => set({ minInBandProbability }),
  started: (scenario) =>
    set({ status: 'running', progress: null, error: '', resultFor: scenario, result: null, selectedKey: null, selectedByUser: false, sort: { key: 'rank', dir: 'asc' }, adopted: {} }),
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
