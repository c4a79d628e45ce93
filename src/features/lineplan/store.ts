/**
 * Screen state of the line plan (not saved): the last run and what it was computed from, the
 * adopt confirmation and the summary's choices. The plan's inputs are saved work (recipes store).
 */
import { create } from 'zustand';
import type { LinePlanScenarios } from '../../core/lineplan/plan';
import type { BlendTargets, Component, Recipe } from '../../core/formulation/model';
import type { LinePlanInputs, Settings } from '../../state';

/** What a result was computed from (compared by identity: the stores replace what they change). */
export interface PlanBasis {
  components: readonly Component[];
  recipes: readonly Recipe[];
  targets: Readonly<Record<string, BlendTargets>>;
  linePlan: LinePlanInputs;
  settings: Settings;
}

export type PlanWhich = 'lasting' | 'after';

interface LinePlanScreenState {
  status: 'idle' | 'planning' | 'done' | 'error';
  result: LinePlanScenarios | null;
  basis: PlanBasis | null;
  /** Ids of the limited stocks of the run, and the supplies entered [kg]. */
  limited: string[];
  supplyKg: Record<string, number>;
  error: string | null;
  /** Wall time of the last run [ms]. */
  ms: number | null;
  /** Number of finished runs (the result carries it as data-run, for tests and the bench). */
  runs: number;
  /** The plan whose adoption is being confirmed. */
  confirming: PlanWhich | null;
  /**
   * The last adoption: which plan, the id of each planned recipe's new draft revision, and the
   * recipes and targets as the adoption left them (a change the plan itself made does not put it out of date).
   */
  adopted: { which: PlanWhich; ids: Record<string, string>; after?: Pick<PlanBasis, 'recipes' | 'targets'> } | null;
  summaryOf: PlanWhich;
  paper: 'a4' | 'letter';
}

const initial: LinePlanScreenState = {
  status: 'idle',
  result: null,
  basis: null,
  limited: [],
  supplyKg: {},
  error: null,
  ms: null,
  runs: 0,
  confirming: null,
  adopted: null,
  summaryOf: 'lasting',
  paper: 'a4',
};

export const useLinePlanScreen = create<LinePlanScreenState>()(() => ({ ...initial }));

export const screenActions = {
  started: () => useLinePlanScreen.setState({ status: 'planning', error: null, confirming: null }),
  finished: (result: LinePlanScenarios, basis: PlanBasis, limited: string[], supplyKg: Record<string, number>, ms: number) =>
    useLinePlanScreen.setState((s) => ({ status: 'done', result, basis, limited, supplyKg, ms, adopted: null, runs: s.runs + 1 })),
  failed: (error: string) => useLinePlanScreen.setState({ status: 'error', error }),
  cancelled: () => useLinePlanScreen.setState((s) => ({ status: s.result ? 'done' : 'idle' })),
  confirm: (which: PlanWhich | null) => useLinePlanScreen.setState({ confirming: which }),
  adopted: (which: PlanWhich, ids: Record<string, string>, after?: Pick<PlanBasis, 'recipes' | 'targets'>) =>
    useLinePlanScreen.setState({ adopted: { which, ids, ...(after ? { after } : {}) }, confirming: null }),
  /** The adoption was undone. */
  unadopted: () => useLinePlanScreen.setState({ adopted: null }),
  summaryOf: (summaryOf: PlanWhich) => useLinePlanScreen.setState({ summaryOf }),
  paper: (paper: 'a4' | 'letter') => useLinePlanScreen.setState({ paper }),
  /** Tests only. */
  reset: () => useLinePlanScreen.setState({ ...initial }),
};
