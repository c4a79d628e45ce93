/**
 * Line-plan actions: edits of the plan's inputs and "adopt", each ONE undo step of the recipes
 * store (the plan lives there, see `lineplan.ts`).
 *
 * Adopt is written here, in one place, against the recipes store as it is: each planned recipe gets
 * the plan's lines as its next revision (revision + 1, a note saying where it came from). When
 * recipes get a lifecycle of their own (draft / approved / superseded), only `adoptPlanRevisions`
 * changes.
 */
import type { RecipeLine } from '../core/formulation/model';
import { useRecipesStore } from './recipes';
import type { LinePlanInputs } from './lineplan';
import { TEXT_RULES, firstProblem, linePlanProblems, recipeProblems, recipeWho } from './field-rules';

/** Change the plan if the result passes the field rules; returns the refusal in words, or null. */
function patchPlan(f: (p: LinePlanInputs) => Partial<LinePlanInputs>): string | null {
  const cur = useRecipesStore.getState().linePlan;
  const next = { ...cur, ...f(cur) };
  const refused = firstProblem(linePlanProblems(next));
  if (refused) return refused;
  useRecipesStore.setState({ linePlan: next });
  return null;
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
  /** Why, in words (appended to the recipe's notes with the new revision number). */
  note: string;
}

/** Each action returns null when done, or why the entry was refused (entry forms check first). */
export const linePlanActions = {
  /** Demand of a recipe over the period [kg]; null takes it out of the plan. */
  setDemand: (recipeId: string, kg: number | null) =>
    patchPlan((p) => ({ demands: kg === null ? without(p.demands, recipeId) : { ...p.demands, [recipeId]: kg } })),
  /** Supply of a limited stock over the period [kg]; null → limited, supply not entered. */
  setSupply: (componentId: string, kg: number | null) => patchPlan((p) => ({ supplies: { ...p.supplies, [componentId]: kg } })),
  /** Limit a stock in this plan (it is then gone in the plan after the limited stocks). */
  limitStock: (componentId: string) =>
    patchPlan((p) => (componentId in p.supplies ? {} : { supplies: { ...p.supplies, [componentId]: null } })),
  /** Drop a stock's entry from the plan's supplies (a stock limited in the library stays limited). */
  unlimitStock: (componentId: string) => patchPlan((p) => ({ supplies: without(p.supplies, componentId) })),
  /** A stock that must stay in use, with its least use [kg]; null → no longer required. */
  setKeep: (componentId: string, kg: number | null) =>
    patchPlan((p) => ({ keep: kg === null ? without(p.keep, componentId) : { ...p.keep, [componentId]: kg } })),
  setMaxStocks: (n: number | null) => patchPlan(() => ({ maxStocks: n })),
  setPeriod: (period: string) => patchPlan(() => ({ period })),
  setDemandUnit: (demandUnit: 'kg' | 't') => patchPlan(() => ({ demandUnit })),
  /** Empty the plan (one undo step). */
  clear: () => patchPlan(() => ({ demands: {}, supplies: {}, keep: {}, maxStocks: null })),
};

const NOTES_MAX = TEXT_RULES.recipeNotes.max;

/**
 * Save the plan's recipes as new revisions, all in one undo step: lines replaced, revision + 1,
 * the note appended to the recipe's notes (older notes are shortened from the start if the notes
 * would exceed their limit). Nothing changes unless every new revision passes the field rules.
 *
 * @returns the new revision number of each recipe, or the first refusal in words
 */
export function adoptPlanRevisions(
  revisions: readonly PlanRevision[],
  now: string = new Date().toISOString(),
): { ok: true; revisions: Record<string, number> } | { ok: false; message: string } {
  const byId = new Map(revisions.map((r) => [r.recipeId, r]));
  const out: Record<string, number> = {};
  const recipes = useRecipesStore.getState().recipes.map((r) => {
    const rev = byId.get(r.id);
    if (!rev) return r;
    const revision = r.revision + 1;
    out[r.id] = revision;
    const add = `Revision ${revision}: ${rev.note}`;
    let notes = r.notes.trim() ? `${r.notes.trim()}\n${add}` : add;
    if (notes.length > NOTES_MAX) notes = `…${notes.slice(notes.length - NOTES_MAX + 1)}`;
    return { ...r, lines: rev.lines.map((l) => ({ ...l })), revision, notes, updatedAt: now };
  });
  for (const r of recipes) {
    if (!byId.has(r.id)) continue;
    const refused = firstProblem(recipeProblems(r, recipeWho(r.name)));
    if (refused) return { ok: false, message: refused };
  }
  useRecipesStore.setState({ recipes });
  return { ok: true, revisions: out };
}
