/** Recipes store: recipes, their solve targets, the active recipe. Persisted, with undo/redo. */
import { create } from 'zustand';
import { persist } from 'zustand/middleware';
import { temporal } from 'zundo';
import type { BlendTargets, Component, Recipe, RecipeLine, ReleaseSpecification, StockBasis } from '../core/formulation/model';
import { BLANK_SPECIFICATION, newRecipeLifecycle } from '../core/formulation/model';
import { recordStockBasis } from '../core/recipes/stock-basis';
import { approvalRefusal } from '../core/recipes/approval';
import { inferSpecificationGrades, isBlankSpecification } from '../core/recipes/specification-grade';
import { ISO_GRADE_NUMBERS } from '../core/viscosity/iso-grades';
import { idbPersistStorage, type StoreSpec } from './persistence';
import { demoRecipes, demoTargets, demoRecipeId } from './demo';
import { newId } from './ids';
import { useLibraryStore } from './library';
import {
  FieldRuleError,
  TEXT_RULES,
  checkCount,
  firstProblem,
  recipeProblems,
  recipeWho,
  sheetProblems,
  qcProblems,
  targetsProblems,
  type QcInputs,
} from './field-rules';

export type { QcInputs };
import { emptyLinePlan, type LinePlanInputs } from './lineplan';
import { sayRefusal } from './messages';

/** Added to the name of a duplicated recipe. */
const COPY_MARK = ' (copy)';

export interface RecipesData {
  recipes: Recipe[];
  /** Solve targets per recipe id (optional: a recipe without targets uses defaults). */
  targets: Record<string, BlendTargets>;
  /** The recipe the designer / sheet opens on; not part of undo history. */
  activeRecipeId: string | null;
  /** Blend-sheet header fields and edited instructions per recipe id (schema 3); not part of undo history. */
  sheets: Record<string, SheetInputs>;
  /** The line plan's inputs (schema 6; see `lineplan.ts`); part of undo history. */
  linePlan: LinePlanInputs;
  /** QC-loop entries per recipe id (schema 8): lots, heel, QC result, correction; not part of undo history. */
  qc: Record<string, QcInputs>;
}

export const DEFAULT_QC_INPUTS: QcInputs = {
  aimKv40: null,
  lots: {},
  heel: { massKg: null, kv40: null, kv100: null, density15: null, additiveFraction: null, source: '' },
  correction: { kv40: null, kv100: null, massKg: null, vesselLimitKg: null, bandPct: null, objective: 'cost', onHandKg: {}, stockIds: [] },
};

/** What the plant types on a recipe's blend sheet, remembered between visits. */
export interface SheetInputs {
  /** Batch or lot number. */
  lot: string;
  /** Batch size as typed (a positive number up to NUMBER_RULES.batchSize; the sheet checks it). */
  batchSize: string;
  /** Unit of the batch size: kg, or litres at 15 °C. */
  batchUnit: 'kg' | 'litres';
  vessel: string;
  /** Edited blending instructions (one step per line); null → the sheet's defaults. */
  instructions: string | null;
}

export const DEFAULT_SHEET_INPUTS: SheetInputs = { lot: '', batchSize: '1000', batchUnit: 'kg', vessel: '', instructions: null };

export interface NewRecipe {
  name: string;
  grade: number;
  lines?: RecipeLine[];
  isReference?: boolean;
  notes?: string;
  specification?: ReleaseSpecification;
  /** The stock data the lines were solved with (record it with `recordStockBasis`). */
  stockBasis?: StockBasis | null;
  reasonForChange?: string;
  /**
   * The recipe's saved targets (constraints), stored with it in the same step, so that one undo
   * removes both (a recipe is never left without the targets it was saved with).
   */
  targets?: BlendTargets;
  /** Make it the active recipe in the same step (saved with it: a reload at once still opens it). */
  activate?: boolean;
}

/** What a saved change of a recipe may carry (any subset). */
export interface RecipeChanges {
  name?: string;
  grade?: number;
  lines?: RecipeLine[];
  notes?: string;
  specification?: ReleaseSpecification;
  /** The solve targets (constraints) saved with the recipe. */
  targets?: BlendTargets;
  /** The stock data the new lines were solved with. */
  stockBasis?: StockBasis | null;
}

/** The refusal when content of an approved or superseded recipe would be overwritten. */
export function approvedMessage(r: Pick<Recipe, 'name' | 'revision' | 'status'>): string {
  return `${recipeWho(r.name)}, revision ${r.revision}, is ${r.status}: it is never overwritten — save a new revision instead`;
}

/**
 * Every action that writes a stored field checks it with the field rules (field-rules.ts) first: one
 * that returns `string | null` refuses a value the rules refuse, keeps the stored value and returns the
 * message (null = stored); one that returns an id throws `FieldRuleError` instead. Entry forms check
 * with the same rules beforehand, so these are the last guard, never the first message.
 *
 * Lifecycle (issue 10, item 15): an approved or superseded recipe is never overwritten. Its content
 * (lines, grade, specification, stock basis, status, supersedes, reason, revision) and its targets
 * are refused by `updateRecipe`, `setLines` and `setTargets` (with {@link approvedMessage});
 * `saveChanges` / `saveRevision` make a new draft revision instead.
 */
export interface RecipesState extends RecipesData {
  /** Create a recipe (a draft, revision 1); returns its id. Does not change the active recipe. Throws FieldRuleError. */
  addRecipe: (init: NewRecipe) => string;
  /**
   * Change fields of a recipe; stamps `updatedAt`. Null, or why it was refused. Name, notes, archived
   * and isReference can always change; content only while the recipe is a draft.
   */
  updateRecipe: (id: string, patch: Partial<Omit<Recipe, 'id' | 'updatedAt'>>) => string | null;
  /** Replace a draft's lines (mass fractions summing to 1). Null, or why it was refused. */
  setLines: (id: string, lines: RecipeLine[]) => string | null;
  /**
   * Save changes to a recipe, the safe way: a draft is changed in place (same id, same revision; a
   * blank reason keeps the draft's reason); an approved or superseded recipe is never overwritten — a
   * new draft revision that supersedes it is created instead (see `saveRevision`). Returns the id of
   * the recipe now holding the changes. Throws FieldRuleError when the changes break a field rule.
   * `basedOn` is the draft's `updatedAt` when the changes were begun from it: a draft saved since
   * (in another tab, or on another screen) is not overwritten — RecipeChangedError says so.
   * `{ unknown: true }` (a kept draft that did not record it) is refused too, with
   * RecipeVersionUnknownError: it cannot be told whether the draft was saved since.
   */
  saveChanges: (id: string, changes: RecipeChanges, reason: string, basedOn?: SavedVersionMark | null) => string;
  /**
   * Create a new draft revision of a recipe: a copy with `changes` applied, the next revision number,
   * status draft, `supersedes` = id, the reason for change, the same targets (unless changed) and
   * blend-sheet fields (batch, vessel, instructions; not the lot). The old recipe is untouched until
   * the new one is approved. Returns the new id, or null when `id` is unknown; throws FieldRuleError.
   * (The line plan's "adopt" calls this.)
   */
  saveRevision: (id: string, changes: RecipeChanges, reason: string) => string | null;
  /**
   * Approve a draft: status approved, approval time stamped. The recipe it supersedes, if approved,
   * becomes superseded (and hands over the reference mark). No-op for a recipe that is not a draft.
   * Returns null, or why the approval was refused (nothing changes then): a draft made from a revision
   * that another approved revision already superseded (one approved revision per recipe, `approvalRefusal`).
   */
  approveRecipe: (id: string) => string | null;
  /** Rename a recipe (any status). Null, or why the name was refused. */
  renameRecipe: (id: string, name: string) => string | null;
  /**
   * Record the grade a specification of unknown grade (left so by the schema 8 → 9 upgrade) was written
   * for, as the blender confirms it: one step, one undo step, on a recipe of any status — no limit
   * changes, it only names the grade the specification already had. Null, or why it was refused (the
   * link is already known, the specification is blank, the grade is not an ISO grade).
   */
  confirmSpecificationGrade: (id: string, grade: number) => string | null;
  /** Archive (hide from the pickers) or restore a recipe. */
  setArchived: (id: string, archived: boolean) => void;
  /** Copy a recipe as a new, unlinked draft (revision 1, not a reference); returns the new id. Throws FieldRuleError. */
  duplicateRecipe: (id: string, name?: string) => string | null;
  /** Delete a recipe and its targets (one undo step; its blend-sheet fields are kept so undo restores them). */
  removeRecipe: (id: string) => void;
  setActiveRecipe: (id: string | null) => void;
  /** Store solve targets for a draft recipe. Null, or why they were refused (an approved recipe's are kept). */
  setTargets: (recipeId: string, targets: BlendTargets) => string | null;
  /**
   * Remember blend-sheet fields of a recipe (merged into its saved ones; not an undo step). Null, or
   * why they were refused (nothing is stored then). `parseBatch` reads the batch size as the form does.
   */
  setSheetInputs: (recipeId: string, patch: Partial<SheetInputs>, parseBatch?: (text: string) => number | null) => string | null;
  /**
   * Record the stock data of every recipe that has none yet (recipes saved before stock data were
   * recorded, on first load). Not an undo step. Returns how many were recorded.
   */
  recordMissingStockBasis: (components: readonly Component[]) => number;
  /** Replace everything (reset demo, import-all backup). */
  replaceAll: (data: RecipesData) => void;
  /** Remember QC-loop entries of a recipe (merged into its saved ones; not an undo step). Null, or why refused. */
  setQcInputs: (recipeId: string, patch: Partial<QcInputs>) => string | null;
}

const QC_VALUE_WORDS: Record<string, string> = { kv40: 'ν40', kv100: 'ν100', density15: 'density' };
const QC_FIELD_WORDS: Record<string, string> = {
  aimKv40: 'the aim ν40',
  'heel/massKg': 'the heel mass',
  'heel/kv40': 'the heel ν40',
  'heel/kv100': 'the heel ν100',
  'heel/density15': 'the heel density',
  'heel/additiveFraction': 'the heel’s additive share',
  'heel/source': 'the heel’s source',
  'correction/kv40': 'the batch’s measured ν40',
  'correction/kv100': 'the batch’s measured ν100',
  'correction/massKg': 'the mass in the vessel',
  'correction/vesselLimitKg': 'the vessel limit',
  'correction/bandPct': 'the correction band',
  'correction/objective': 'the correction’s objective',
  'correction/stockIds': 'the stocks the correction may add',
};

/** One QC field in words ("the heel mass", "the measured ν40 of the lot of stock BW-190"), from its path. */
function qcFieldWords(path: readonly string[]): string {
  const stock = (sid: string | undefined) => {
    const c = useLibraryStore.getState().components.find((x) => x.id === sid);
    return c ? `stock ${c.code}` : 'a stock';
  };
  if (path[0] === 'lots') return `the measured ${QC_VALUE_WORDS[path[2] ?? ''] ?? 'values'} of the lot of ${stock(path[1])}`;
  if (path[0] === 'correction' && path[1] === 'onHandKg') return `the kg on hand of ${stock(path[2])}`;
  return QC_FIELD_WORDS[path.join('/')] ?? `the QC field ${path.join(' ')}`;
}

/**
 * Whether a QC field's value (at `path` inside a recipe's QC entries) is no entry: blank (null, empty
 * text, an empty list or map) or the field's default (DEFAULT_QC_INPUTS, e.g. the correction's
 * objective). The first entry of a recipe's QC loop, or of a lot, writes every other field blank
 * beside it; those blanks never replace an entry made in another tab (RecordLayout.blank).
 */
export function isBlankQcValue(path: readonly string[], value: unknown): boolean {
  if (value === null || value === '') return true;
  if (Array.isArray(value)) return value.length === 0;
  if (typeof value === 'object') return Object.keys(value).length === 0;
  let def: unknown = DEFAULT_QC_INPUTS;
  for (const p of path) def = typeof def === 'object' && def !== null && !Array.isArray(def) ? (def as Record<string, unknown>)[p] : undefined;
  return def !== undefined && value === def;
}

/** Fields of a recipe that an approved or superseded recipe keeps for good. */
const CONTENT_FIELDS = ['lines', 'grade', 'specification', 'stockBasis', 'status', 'supersedes', 'reasonForChange', 'revision', 'approvedAt'] as const;

export const RECIPES_SPEC: StoreSpec<RecipesData> = {
  key: 'recipes',
  version: 9,
  schema: (m) => m.recipesDataSchema,
  // Each recipe, each recipe's targets and blend sheet, each field of its QC entries (a lot's measured
  // value, a field of the heel or of the correction: s21 item 2, two tabs typing different results of
  // one batch keep both), and each entry of the line plan (period, unit, tank limit, a grade's demand,
  // a stock's supply or least use) are records of their own when tabs merge their saves; the active
  // recipe belongs to the tab.
  layout: {
    lists: { recipes: 'id' },
    maps: ['targets', 'sheets'],
    deep: ['qc'],
    parts: { linePlan: ['demands', 'supplies', 'keep'] },
    local: ['activeRecipeId'],
    // The blank QC fields a first entry writes are no entries (s22 item 3: two tabs making the first
    // QC entries of one batch at once keep both).
    blank: (key, v) => key.startsWith('qc/') && isBlankQcValue(key.split('/').slice(2).map(decodeURIComponent), v),
    label: (key, v) => {
      const [field, id, entry] = key.split('/') as [string, string | undefined, string | undefined];
      const nameOf = (rid: string) => {
        const r = useRecipesStore.getState().recipes.find((x) => x.id === rid);
        return r ? recipeWho(r.name) : 'a deleted recipe';
      };
      if (field === 'recipes') return v ? recipeWho(String((v as { name?: unknown }).name ?? '')) : 'a deleted recipe';
      if (field === 'targets' && id) return `the targets of ${nameOf(id)}`;
      if (field === 'sheets' && id) return `the blend sheet of ${nameOf(id)}`;
      if (field === 'qc' && id) {
        const path = key.split('/').slice(2).map(decodeURIComponent);
        const of = `the QC entries of ${nameOf(decodeURIComponent(id))}`;
        return path.length ? `${qcFieldWords(path)} in ${of}` : of;
      }
      if (field === 'linePlan' && id === 'demands' && entry !== undefined) return `the line plan’s demand of ${nameOf(entry)}`;
      if (field === 'linePlan' && id === 'supplies') return 'the line plan’s supply of a limited stock';
      if (field === 'linePlan' && id === 'keep') return 'the line plan’s least use of a stock';
      if (field === 'linePlan' && id === 'period') return 'the line plan’s period';
      if (field === 'linePlan') return 'the line plan';
      return field;
    },
  },
  migrations: {
    // Schema 8 had no link from a specification to its grade: inferred where unambiguous (a blank one,
    // a reference naming one grade, the same limits only on recipes of one grade), else null and the
    // recipe is flagged "grade of specification unknown — check". Every record is kept.
    8: (d) => {
      const data = d as { recipes?: unknown };
      if (!Array.isArray(data.recipes)) throw new Error('recipes is not a list');
      const recipes = data.recipes as Array<Record<string, unknown> & Pick<Recipe, 'grade' | 'specification'>>;
      // Every clue the stored records hold: the recipe's grade, the ν100 limits against the ISO 3448
      // bands, and the recipe the specification was first saved on (its revisions' `supersedes`).
      const grades = inferSpecificationGrades(
        recipes.map((r) => ({
          id: typeof r.id === 'string' ? r.id : undefined,
          supersedes: typeof r.supersedes === 'string' ? r.supersedes : null,
          grade: r.grade,
          specification: { ...BLANK_SPECIFICATION, ...r.specification },
        })),
      );
      return { ...(d as object), recipes: recipes.map((r, i) => ({ ...r, specification: { ...r.specification, grade: grades[i] } })) };
    },
    // Schema 7 had no QC-loop entries: every recipe starts with none.
    7: (d) => ({ ...(d as object), qc: {} }),
    // Schema 6 → 7: targets may ask for the least cost per kg ('cost-kg'). Existing data are valid as they are.
    6: (d) => d,
    // Schema 5 had no line plan: start with an empty one.
    5: (d) => ({ ...(d as object), linePlan: emptyLinePlan() }),
    // Schema 4 had no minimum probability in band: every recipe's targets ask for none.
    4: (d) => {
      const targets = (d as { targets?: unknown }).targets;
      if (typeof targets !== 'object' || targets === null) throw new Error('targets is not a record');
      const next: Record<string, unknown> = {};
      for (const [id, t] of Object.entries(targets as Record<string, object>)) next[id] = { minInBandProbability: null, ...t };
      return { ...(d as object), targets: next };
    },
    // Schema 3 had no lifecycle. A reference recipe (the one currently made at the plant) becomes
    // approved; every other recipe becomes a draft, to be approved by a person. Blank specification,
    // nothing superseded, no stock data recorded yet (recorded from the library at first load).
    3: (d) => {
      const data = d as { recipes?: unknown };
      if (!Array.isArray(data.recipes)) throw new Error('recipes is not a list');
      return {
        ...(d as object),
        recipes: data.recipes.map((r: Record<string, unknown>) => ({
          ...newRecipeLifecycle(),
          status: r.isReference === true ? 'approved' : 'draft',
          ...r,
        })),
      };
    },
    // Schema 2 had no blend-sheet fields: start every recipe with the defaults.
    2: (d) => ({ ...(d as object), sheets: {} }),
    // Schema 1 (first development builds) stored recipes only, without targets or an active recipe.
    1: (d) => {
      const recipes = (d as { recipes?: unknown }).recipes;
      if (!Array.isArray(recipes)) throw new Error('recipes is not a list');
      return { recipes, targets: {}, activeRecipeId: null };
    },
  },
};

const now = () => new Date().toISOString();

/**
 * Saving a draft over a version of it that was saved after the edits began (two tabs editing the same
 * recipe): refused, so neither tab's saved work is overwritten unseen.
 */
export class RecipeChangedError extends Error {
  constructor(readonly recipe: Recipe) {
    super(
      `“${recipe.name}” was changed and saved after this draft was opened (${recipe.updatedAt.slice(0, 16).replace('T', ' ')} UTC, in another tab or on another screen); ` +
        `saving here would overwrite that change. Save as a new recipe to keep both, or open “${recipe.name}” again to start from what is saved`,
    );
    this.name = 'RecipeChangedError';
  }
}

/**
 * Saving over a draft from changes whose starting version is not known (a designer draft kept by an
 * earlier version, which did not record it): refused, since a save made meanwhile in another tab
 * cannot be ruled out.
 */
export class RecipeVersionUnknownError extends Error {
  constructor(readonly recipe: Recipe) {
    super(
      `this draft was kept by an earlier version of Blendbench, which does not record which saved version of “${recipe.name}” it began from, ` +
        `so it cannot tell whether “${recipe.name}” was changed since (last saved ${recipe.updatedAt.slice(0, 16).replace('T', ' ')} UTC); ` +
        `saving here could overwrite such a change. Save as a new recipe to keep both, or open “${recipe.name}” again to start from what is saved`,
    );
    this.name = 'RecipeVersionUnknownError';
  }
}

/** The saved version changes began from: its `updatedAt`, or not known. */
export type SavedVersionMark = string | { unknown: true };

export const demoRecipesData = (): RecipesData => ({
  recipes: demoRecipes(),
  targets: demoTargets(),
  activeRecipeId: demoRecipeId(320),
  sheets: {},
  linePlan: emptyLinePlan(),
  qc: {},
});

/**
 * A recipe whose grade changes keeps its specification only when that is blank or was written for
 * the new grade; otherwise it starts with a blank specification of the new grade ("Per specification",
 * to be entered on Recipes), so that another grade's limits are never carried along. A specification
 * given with the change is kept as given.
 */
export function specificationForGrade(before: Pick<Recipe, 'grade'>, after: Recipe, specificationGiven: boolean): Recipe {
  if (specificationGiven || after.grade === before.grade) return after;
  const spec = after.specification;
  if (isBlankSpecification(spec)) return { ...after, specification: { ...spec, grade: after.grade } };
  if (spec.grade === after.grade) return after;
  return { ...after, specification: { ...BLANK_SPECIFICATION, grade: after.grade } };
}

type Tracked = Pick<RecipesData, 'recipes' | 'targets' | 'linePlan'>;

/** The revision number a new revision of `old` gets: one above every revision made from it so far. */
export function nextRevisionNumber(recipes: readonly Recipe[], old: Recipe): number {
  let max = old.revision;
  for (const r of recipes) if (r.supersedes === old.id && r.revision > max) max = r.revision;
  return max + 1;
}

export const useRecipesStore = create<RecipesState>()(
  persist(
    temporal(
      (set, get) => {
        const whoOf = (id: string) => {
          const r = get().recipes.find((x) => x.id === id);
          return r ? recipeWho(r.name) : undefined;
        };
        /** Change one recipe if the result passes the field rules; stamps `updatedAt`. */
        const changeRecipe = (id: string, change: (r: Recipe) => Recipe): string | null => {
          const r = get().recipes.find((x) => x.id === id);
          if (!r) return null;
          const next = { ...change(r), updatedAt: now() };
          const refused = firstProblem(recipeProblems(next, recipeWho(r.name)));
          if (refused) return sayRefusal(refused);
          set((s) => ({ recipes: s.recipes.map((x) => (x.id === id ? next : x)) }));
          return null;
        };
        /** A new recipe must pass the field rules and fit the collection limit; throws FieldRuleError. */
        const addChecked = (recipe: Recipe): void => {
          const problems = recipeProblems(recipe);
          const full = checkCount('recipes', get().recipes.length + 1);
          if (full) problems.push({ path: ['recipes'], message: full });
          if (problems.length) throw new FieldRuleError(problems);
        };
        return {
          ...demoRecipesData(),
          addRecipe: (init) => {
            const id = newId('r');
            const recipe: Recipe = {
              ...newRecipeLifecycle(),
              id,
              name: init.name,
              grade: init.grade,
              lines: init.lines ?? [],
              revision: 1,
              isReference: init.isReference ?? false,
              notes: init.notes ?? '',
              updatedAt: now(),
              specification: init.specification ? structuredClone(init.specification) : { ...BLANK_SPECIFICATION, grade: init.grade },
              stockBasis: init.stockBasis ?? null,
              reasonForChange: init.reasonForChange ?? '',
            };
            addChecked(recipe);
            const t = init.targets;
            if (t) {
              const bad = targetsProblems(t, recipeWho(recipe.name));
              if (bad.length) throw new FieldRuleError(bad);
            }
            set((s) => ({
              recipes: [...s.recipes, recipe],
              targets: t ? { ...s.targets, [id]: structuredClone(t) } : s.targets,
              activeRecipeId: init.activate ? id : s.activeRecipeId,
            }));
            return id;
          },
          updateRecipe: (id, patch) => {
            const r = get().recipes.find((x) => x.id === id);
            if (r && r.status !== 'draft' && CONTENT_FIELDS.some((k) => k in patch)) return approvedMessage(r);
            return changeRecipe(id, (x) => specificationForGrade(x, { ...x, ...patch, id }, 'specification' in patch));
          },
          setLines: (id, lines) => get().updateRecipe(id, { lines }),
          saveChanges: (id, changes, reason, basedOn) => {
            const r = get().recipes.find((x) => x.id === id);
            if (!r) throw new Error(`no recipe ${id}`);
            if (r.status !== 'draft') return get().saveRevision(id, changes, reason)!;
            if (typeof basedOn === 'object' && basedOn !== null) throw new RecipeVersionUnknownError(r);
            if (typeof basedOn === 'string' && r.updatedAt !== basedOn) throw new RecipeChangedError(r);
            const { targets, ...fields } = changes;
            const next: Recipe = specificationForGrade(
              r,
              { ...r, ...structuredClone(fields), reasonForChange: reason.trim() ? reason : r.reasonForChange, id, updatedAt: now() },
              fields.specification !== undefined,
            );
            const problems = [...recipeProblems(next), ...(targets ? targetsProblems(targets, recipeWho(next.name)) : [])];
            if (problems.length) throw new FieldRuleError(problems);
            set((s) => ({
              recipes: s.recipes.map((x) => (x.id === id ? next : x)),
              targets: targets ? { ...s.targets, [id]: structuredClone(targets) } : s.targets,
            }));
            return id;
          },
          saveRevision: (id, changes, reason) => {
            const s0 = get();
            const old = s0.recipes.find((x) => x.id === id);
            if (!old) return null;
            const revId = newId('r');
            const { targets, ...fields } = changes;
            // A revision of another grade carries a specification of its own grade (or a blank one).
            const rev: Recipe = specificationForGrade(
              old,
              {
                ...structuredClone(old),
                ...structuredClone(fields),
                id: revId,
                revision: nextRevisionNumber(s0.recipes, old),
                status: 'draft',
                approvedAt: null,
                archived: false,
                isReference: false,
                supersedes: old.id,
                reasonForChange: reason,
                updatedAt: now(),
              },
              fields.specification !== undefined,
            );
            const t = targets ?? s0.targets[id];
            if (targets) {
              const bad = targetsProblems(targets, recipeWho(rev.name));
              if (bad.length) throw new FieldRuleError(bad);
            }
            addChecked(rev);
            const sheet = s0.sheets[id];
            set((s) => ({
              recipes: [...s.recipes, rev],
              targets: t ? { ...s.targets, [revId]: structuredClone(t) } : s.targets,
              sheets: sheet ? { ...s.sheets, [revId]: { ...sheet, lot: '' } } : s.sheets,
            }));
            return revId;
          },
          approveRecipe: (id) => {
            const r = get().recipes.find((x) => x.id === id);
            if (!r || r.status !== 'draft') return null;
            // One approved revision per recipe: a draft made from a revision that another approved
            // revision has already superseded is refused (it would drop that revision's changes).
            const refused = approvalRefusal(get().recipes, id);
            if (refused) return refused;
            const stamp = now();
            const old = r.supersedes ? get().recipes.find((x) => x.id === r.supersedes) : undefined;
            const replaces = old && old.status === 'approved' ? old : undefined;
            set((s) => ({
              recipes: s.recipes.map((x) => {
                if (x.id === id) {
                  return { ...x, status: 'approved', approvedAt: stamp, updatedAt: stamp, isReference: x.isReference || (replaces?.isReference ?? false) };
                }
                if (replaces && x.id === replaces.id) return { ...x, status: 'superseded', isReference: false, updatedAt: stamp };
                return x;
              }),
            }));
            return null;
          },
          renameRecipe: (id, name) => changeRecipe(id, (x) => ({ ...x, name })),
          confirmSpecificationGrade: (id, grade) => {
            const r = get().recipes.find((x) => x.id === id);
            if (!r) return `no recipe ${id}`;
            if (!ISO_GRADE_NUMBERS.includes(grade)) return `VG ${grade} is not an ISO viscosity grade`;
            if (isBlankSpecification(r.specification)) return 'the specification is blank: it fits every grade';
            if (r.specification.grade !== null) return `the specification is already linked to VG ${r.specification.grade}`;
            return changeRecipe(id, (x) => ({ ...x, specification: { ...x.specification, grade } }));
          },
          setArchived: (id, archived) => void changeRecipe(id, (x) => ({ ...x, archived })),
          duplicateRecipe: (id, name) => {
            const src = get().recipes.find((r) => r.id === id);
            if (!src) return null;
            const copyId = newId('r');
            const copy: Recipe = {
              ...structuredClone(src),
              ...newRecipeLifecycle(),
              specification: structuredClone(src.specification),
              stockBasis: structuredClone(src.stockBasis),
              id: copyId,
              // A name at its limit keeps the " (copy)" mark: the copy never reads exactly as its source.
              name: name ?? `${src.name.slice(0, TEXT_RULES.recipeName.max - COPY_MARK.length)}${COPY_MARK}`,
              revision: 1,
              isReference: false,
              updatedAt: now(),
            };
            addChecked(copy);
            const t = get().targets[id];
            set((s) => ({
              recipes: [...s.recipes, copy],
              targets: t ? { ...s.targets, [copyId]: structuredClone(t) } : s.targets,
            }));
            return copyId;
          },
          removeRecipe: (id) =>
            set((s) => {
              const targets = { ...s.targets };
              delete targets[id];
              return {
                recipes: s.recipes.filter((r) => r.id !== id),
                targets,
                activeRecipeId: s.activeRecipeId === id ? null : s.activeRecipeId,
              };
            }),
          setActiveRecipe: (id) => set({ activeRecipeId: id }),
          setTargets: (recipeId, targets) => {
            const r = get().recipes.find((x) => x.id === recipeId);
            if (r && r.status !== 'draft') return approvedMessage(r);
            const refused = firstProblem(targetsProblems(targets, whoOf(recipeId)));
            if (refused) return sayRefusal(refused);
            set((s) => ({ targets: { ...s.targets, [recipeId]: targets } }));
            return null;
          },
          setSheetInputs: (recipeId, patch, parseBatch) => {
            const next = { ...DEFAULT_SHEET_INPUTS, ...get().sheets[recipeId], ...patch };
            const refused = firstProblem(sheetProblems(next, undefined, patch.batchSize === undefined ? undefined : parseBatch));
            if (refused) return sayRefusal(refused);
            set((s) => ({ sheets: { ...s.sheets, [recipeId]: next } }));
            return null;
          },
          recordMissingStockBasis: (components) => {
            const missing = get().recipes.filter((r) => r.stockBasis === null);
            if (missing.length === 0) return 0;
            const stamp = now();
            set((s) => ({
              recipes: s.recipes.map((r) => (r.stockBasis === null ? { ...r, stockBasis: recordStockBasis(components, r.lines, stamp) } : r)),
            }));
            return missing.length;
          },
          replaceAll: (data) =>
            set({
              recipes: data.recipes,
              targets: data.targets,
              activeRecipeId: data.activeRecipeId,
              sheets: data.sheets ?? {},
              linePlan: data.linePlan ?? emptyLinePlan(),
              qc: data.qc ?? {},
            }),
          setQcInputs: (recipeId, patch) => {
            const next: QcInputs = { ...DEFAULT_QC_INPUTS, ...get().qc[recipeId], ...patch };
            const refused = firstProblem(qcProblems(next, whoOf(recipeId)));
            if (refused) return sayRefusal(refused);
            set((s) => ({ qc: { ...s.qc, [recipeId]: next } }));
            return null;
          },
        };
      },
      {
        partialize: (s): Tracked => ({ recipes: s.recipes, targets: s.targets, linePlan: s.linePlan }),
        // Selecting another recipe is not an edit: skip history entries where nothing tracked changed.
        equality: (a, b) => a.recipes === b.recipes && a.targets === b.targets && a.linePlan === b.linePlan,
        limit: 100,
      },
    ),
    {
      name: 'recipes',
      version: RECIPES_SPEC.version,
      storage: idbPersistStorage(RECIPES_SPEC),
      partialize: (s): RecipesData => ({
        recipes: s.recipes,
        targets: s.targets,
        activeRecipeId: s.activeRecipeId,
        sheets: s.sheets,
        linePlan: s.linePlan,
        qc: s.qc,
      }),
      skipHydration: true,
    },
  ),
);
