/** Recipes store: recipes, their solve targets, the active recipe. Persisted, with undo/redo. */
import { create } from 'zustand';
import { persist } from 'zustand/middleware';
import { temporal } from 'zundo';
import type { BlendTargets, Recipe, RecipeLine } from '../core/formulation/model';
import { idbPersistStorage, type StoreSpec } from './persistence';
import { recipesDataSchema } from './schemas';
import { demoRecipes, demoTargets, demoRecipeId } from './demo';
import { newId } from './ids';
import {
  FieldRuleError,
  TEXT_RULES,
  checkCount,
  firstProblem,
  recipeProblems,
  recipeWho,
  sheetProblems,
  targetsProblems,
} from './field-rules';

export interface RecipesData {
  recipes: Recipe[];
  /** Solve targets per recipe id (optional: a recipe without targets uses defaults). */
  targets: Record<string, BlendTargets>;
  /** The recipe the designer / sheet opens on; not part of undo history. */
  activeRecipeId: string | null;
  /** Blend-sheet header fields and edited instructions per recipe id (schema 3); not part of undo history. */
  sheets: Record<string, SheetInputs>;
}

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
}

/**
 * Every action that writes a stored field checks it with the field rules (field-rules.ts) first: one
 * that returns `string | null` refuses a value the rules refuse, keeps the stored value and returns the
 * message (null = stored); one that returns an id throws `FieldRuleError` instead. Entry forms check
 * with the same rules beforehand, so these are the last guard, never the first message.
 */
export interface RecipesState extends RecipesData {
  /** Create a recipe (revision 1); returns its id. Does not change the active recipe. Throws FieldRuleError. */
  addRecipe: (init: NewRecipe) => string;
  /** Change fields of a recipe; stamps `updatedAt`. Does not raise the revision. Null, or why it was refused. */
  updateRecipe: (id: string, patch: Partial<Omit<Recipe, 'id' | 'updatedAt'>>) => string | null;
  /** Replace a recipe's lines (mass fractions summing to 1). Null, or why it was refused. */
  setLines: (id: string, lines: RecipeLine[]) => string | null;
  /** Raise the revision number (a change the plant must know about). */
  raiseRevision: (id: string) => void;
  /** Copy a recipe (revision 1, not a reference); returns the new id. Throws FieldRuleError. */
  duplicateRecipe: (id: string, name?: string) => string | null;
  /** Delete a recipe and its targets. */
  removeRecipe: (id: string) => void;
  setActiveRecipe: (id: string | null) => void;
  /** Store solve targets for a recipe. Null, or why they were refused. */
  setTargets: (recipeId: string, targets: BlendTargets) => string | null;
  /**
   * Remember blend-sheet fields of a recipe (merged into its saved ones; not an undo step). Null, or
   * why they were refused (nothing is stored then). `parseBatch` reads the batch size as the form does.
   */
  setSheetInputs: (recipeId: string, patch: Partial<SheetInputs>, parseBatch?: (text: string) => number | null) => string | null;
  /** Replace everything (reset demo, import-all backup). */
  replaceAll: (data: RecipesData) => void;
}

export const RECIPES_SPEC: StoreSpec<RecipesData> = {
  key: 'recipes',
  version: 3,
  schema: recipesDataSchema,
  migrations: {
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

export const demoRecipesData = (): RecipesData => ({
  recipes: demoRecipes(),
  targets: demoTargets(),
  activeRecipeId: demoRecipeId(320),
  sheets: {},
});

type Tracked = Pick<RecipesData, 'recipes' | 'targets'>;

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
          if (refused) return refused;
          set((s) => ({ recipes: s.recipes.map((x) => (x.id === id ? next : x)) }));
          return null;
        };
        return {
          ...demoRecipesData(),
          addRecipe: (init) => {
            const id = newId('r');
            const recipe: Recipe = {
              id,
              name: init.name,
              grade: init.grade,
              lines: init.lines ?? [],
              revision: 1,
              isReference: init.isReference ?? false,
              notes: init.notes ?? '',
              updatedAt: now(),
            };
            const problems = recipeProblems(recipe);
            const full = checkCount('recipes', get().recipes.length + 1);
            if (full) problems.push({ path: ['recipes'], message: full });
            if (problems.length) throw new FieldRuleError(problems);
            set((s) => ({ recipes: [...s.recipes, recipe] }));
            return id;
          },
          updateRecipe: (id, patch) => changeRecipe(id, (r) => ({ ...r, ...patch, id })),
          setLines: (id, lines) => changeRecipe(id, (r) => ({ ...r, lines })),
          raiseRevision: (id) =>
            set((s) => ({
              recipes: s.recipes.map((r) => (r.id === id ? { ...r, revision: r.revision + 1, updatedAt: now() } : r)),
            })),
          duplicateRecipe: (id, name) => {
            const src = get().recipes.find((r) => r.id === id);
            if (!src) return null;
            const copyId = newId('r');
            const copy: Recipe = {
              ...structuredClone(src),
              id: copyId,
              name: name ?? `${src.name} (copy)`.slice(0, TEXT_RULES.recipeName.max),
              revision: 1,
              isReference: false,
              updatedAt: now(),
            };
            const problems = recipeProblems(copy);
            const full = checkCount('recipes', get().recipes.length + 1);
            if (full) problems.push({ path: ['recipes'], message: full });
            if (problems.length) throw new FieldRuleError(problems);
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
              const sheets = { ...s.sheets };
              delete sheets[id];
              return {
                recipes: s.recipes.filter((r) => r.id !== id),
                targets,
                sheets,
                activeRecipeId: s.activeRecipeId === id ? null : s.activeRecipeId,
              };
            }),
          setActiveRecipe: (id) => set({ activeRecipeId: id }),
          setTargets: (recipeId, targets) => {
            const refused = firstProblem(targetsProblems(targets, whoOf(recipeId)));
            if (refused) return refused;
            set((s) => ({ targets: { ...s.targets, [recipeId]: targets } }));
            return null;
          },
          setSheetInputs: (recipeId, patch, parseBatch) => {
            const next = { ...DEFAULT_SHEET_INPUTS, ...get().sheets[recipeId], ...patch };
            const refused = firstProblem(sheetProblems(next, undefined, patch.batchSize === undefined ? undefined : parseBatch));
            if (refused) return refused;
            set((s) => ({ sheets: { ...s.sheets, [recipeId]: next } }));
            return null;
          },
          replaceAll: (data) =>
            set({ recipes: data.recipes, targets: data.targets, activeRecipeId: data.activeRecipeId, sheets: data.sheets ?? {} }),
        };
      },
      {
        partialize: (s): Tracked => ({ recipes: s.recipes, targets: s.targets }),
        // Selecting another recipe is not an edit: skip history entries where nothing tracked changed.
        equality: (a, b) => a.recipes === b.recipes && a.targets === b.targets,
        limit: 100,
      },
    ),
    {
      name: 'recipes',
      version: RECIPES_SPEC.version,
      storage: idbPersistStorage(RECIPES_SPEC),
      partialize: (s): RecipesData => ({ recipes: s.recipes, targets: s.targets, activeRecipeId: s.activeRecipeId, sheets: s.sheets }),
      skipHydration: true,
    },
  ),
);
