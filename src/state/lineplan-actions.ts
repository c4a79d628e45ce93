/**
 * Line-plan actions: edits of the plan's inputs and "adopt", each ONE undo step of the recipes
 * store (the plan lives there, see `lineplan.ts`).
 *
 * Adopt saves each planned recipe's new lines as a draft revision through the recipes store's own
 * `saveRevision` (the recipe lifecycle), all in one undo step.
 */
import type { RecipeLine, StockBasis } from '../core/formulation/model';
import { useRecipesStore } from './recipes';
import { leastUseAboveSupply, type LinePlanInputs } from './lineplan';
import { FieldRuleError, firstProblem, fmtRuleNumber, linePlanProblems } from './field-rules';
import { sayRefusal } from './messages';

/**
 * Change the plan if the result passes the field rules (and `check`, a rule across fields of the
 * record being edited); returns the refusal in words, or null.
 */
function patchPlan(f: (p: LinePlanInputs) => Partial<LinePlanInputs>, check?: (next: LinePlanInputs) => string | null): string | null {
  const cur = useRecipesStore.getState().linePlan;
  const next = { ...cur, ...f(cur) };
  const refused = firstProblem(linePlanProblems(next)) ?? check?.(next) ?? null;
  if (refused) return sayRefusal(refused);
  useRecipesStore.setState({ linePlan: next });
  return null;
}

/**
 * The store's own guard (the screen refuses first, with the stock's code and the user's unit): kg
 * written plainly, as the field rules' messages are.
 */
function aboveSupply(p: LinePlanInputs, componentId: string): string | null {
  const over = leastUseAboveSupply(p, componentId);
  return over && `the least use (${fmtRuleNumber(over.leastUseKg)} kg) is above the stock's supply (${fmtRuleNumber(over.supplyKg)} kg) over the period`;
}

function without<T>(rec: Record<string, T>, key: string): Record<string, T> {
  const out = { ...rec };
  delete out[key];
  return out;
}

/** One recipe's new revision from the plan. */
export interface PlanRevision {
  recipeId: string;
  /** Mass fractions summing to 1. */
  lines: RecipeLine[];
  /** The stock data the lines were planned with (`recordStockBasis`). */
  stockBasis: StockBasis | null;
}

export const linePlanActions = {
  /**
   * Demand of a recipe over the period [kg]; null takes it out of the plan. `replaces`: ids of the
   * recipe's earlier revisions whose demand this one takes over (their entries are dropped).
   */
  setDemand: (recipeId: string, kg: number | null, replaces: readonly string[] = []) =>
    patchPlan((p) => {
      let demands = p.demands;
      for (const id of replaces) if (id !== recipeId) demands = without(demands, id);
      return { demands: kg === null ? without(demands, recipeId) : { ...demands, [recipeId]: kg } };
    }),
  /**
   * Supply of a limited stock over the period [kg]; null → limited, supply not entered. Refused below
   * the stock's least use (`leastUseAboveSupply`; the entry field says so first, naming the stock).
   */
  setSupply: (componentId: string, kg: number | null) =>
    patchPlan((p) => ({ supplies: { ...p.supplies, [componentId]: kg } }), (p) => aboveSupply(p, componentId)),
  /** Limit a stock in this plan (it is then gone in the plan after the limited stocks). */
  limitStock: (componentId: string) =>
    patchPlan((p) => (componentId in p.supplies ? {} : { supplies: { ...p.supplies, [componentId]: null } })),
  /** Drop a stock's entry from the plan's supplies (a stock limited in the library stays limited). */
  unlimitStock: (componentId: string) => patchPlan((p) => ({ supplies: without(p.supplies, componentId) })),
  /**
   * A stock that must stay in use, with its least use [kg]; null → no longer required. Refused above
   * the stock's supply (`leastUseAboveSupply`; the entry field says so first, naming the stock).
   */
  setKeep: (componentId: string, kg: number | null) =>
    patchPlan((p) => ({ keep: kg === null ? without(p.keep, componentId) : { ...p.keep, [componentId]: kg } }), (p) => aboveSupply(p, componentId)),
  setMaxStocks: (n: number | null) => patchPlan(() => ({ maxStocks: n })),
  setPeriod: (period: string) => patchPlan(() => ({ period })),
  setDemandUnit: (demandUnit: 'kg' | 't') => patchPlan(() => ({ demandUnit })),
  /** Empty the plan (one undo step). */
  clear: () => patchPlan(() => ({ demands: {}, supplies: {}, keep: {}, maxStocks: null })),
};

/**
 * Save the plan's recipes as new revisions, all in ONE undo step. Each is a draft revision that
 * supersedes the recipe it replaces (the recipes store's `saveRevision`: next revision number,
 * the reason for change, the same targets and blend-sheet fields); the recipe it replaces stays as
 * it is until the new one is approved on Recipes. The plan's demands stay with the products: a
 * planned recipe's demand follows it to its approved successor (see `currentRecipe`).
 *
 * One undo step: history is paused while the revisions are saved, the state before is put back
 * unrecorded, and the whole change is then applied as one recorded update.
 *
 * @returns the new recipe id of each planned recipe, or the first refusal in words (nothing saved)
 */
export function adoptPlanRevisions(
  revisions: readonly PlanRevision[],
  reason: string,
): { ok: true; ids: Record<string, string> } | { ok: false; message: string } {
  const store = useRecipesStore;
  const history = store.temporal.getState();
  const before = store.getState();
  const snapshot = { recipes: before.recipes, targets: before.targets, sheets: before.sheets };
  const ids: Record<string, string> = {};
  history.pause();
  try {
    for (const r of revisions) {
      const id = store.getState().saveRevision(r.recipeId, { lines: r.lines, stockBasis: r.stockBasis }, reason);
      if (id === null) throw new Error(`the recipe ${r.recipeId} is no longer saved`);
      ids[r.recipeId] = id;
    }
  } catch (e) {
    store.setState(snapshot);
    history.resume();
    return { ok: false, message: e instanceof FieldRuleError ? sayRefusal(e.message)! : e instanceof Error ? e.message : String(e) };
  }
  const after = store.getState();
  const change = { recipes: after.recipes, targets: after.targets, sheets: after.sheets };
  store.setState(snapshot);
  history.resume();
  store.setState(change);
  return { ok: true, ids };
}
