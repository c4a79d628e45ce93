/** Recipes store: recipes, their solve targets, the active recipe. Persisted, with undo/redo. */
import { create } from 'zustand';
import { persist } from 'zustand/middleware';
import { temporal } from 'zundo';
import type { BlendTargets, Recipe, RecipeLine } from '../core/model';
import { idbPersistStorage, type StoreSpec } from './persistence';
import { recipesDataSchema } from './schemas';
import { demoRecipes, demoTargets, demoRecipeId } from './demo';
import { newId } from './ids';

export interface RecipesData {
  recipes: Recipe[];
  /** Solve targets per recipe id (optional: a recipe without targets uses defaults). */
  targets: Record<string, BlendTargets>;
  /** The recipe the designer / sheet opens on; not part of undo history. */
  activeRecipeId: string | null;
}

export interface NewRecipe {
  name: string;
  grade: number;
  lines?: RecipeLine[];
  isReference?: boolean;
  notes?: string;
}

export interface RecipesState extends RecipesData {
  /** Create a recipe (revision 1); returns its id. Does not change the active recipe. */
  addRecipe: (init: NewRecipe) => string;
  /** Change fields of a recipe; stamps `updatedAt`. Does not raise the revision. */
  updateRecipe: (id: string, patch: Partial<Omit<Recipe, 'id' | 'updatedAt'>>) => void;
  /** Replace a recipe's lines (mass fractions, summing to 1 — the caller's responsibility). */
  setLines: (id: string, lines: RecipeLine[]) => void;
  /** Raise the revision number (a change the plant must know about). */
  raiseRevision: (id: string) => void;
  /** Copy a recipe (revision 1, not a reference); returns the new id. */
  duplicateRecipe: (id: string, name?: string) => string | null;
  /** Delete a recipe and its targets. */
  removeRecipe: (id: string) => void;
  setActiveRecipe: (id: string | null) => void;
  /** Store solve targets for a recipe. */
  setTargets: (recipeId: string, targets: BlendTargets) => void;
  /** Replace everything (reset demo, import-all backup). */
  replaceAll: (data: RecipesData) => void;
}

export const RECIPES_SPEC: StoreSpec<RecipesData> = {
  key: 'recipes',
  version: 2,
  schema: recipesDataSchema,
  migrations: {
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
});

type Tracked = Pick<RecipesData, 'recipes' | 'targets'>;

export const useRecipesStore = create<RecipesState>()(
  persist(
    temporal(
      (set, get) => ({
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
          set((s) => ({ recipes: [...s.recipes, recipe] }));
          return id;
        },
        updateRecipe: (id, patch) =>
          set((s) => ({ recipes: s.recipes.map((r) => (r.id === id ? { ...r, ...patch, id, updatedAt: now() } : r)) })),
        setLines: (id, lines) =>
          set((s) => ({ recipes: s.recipes.map((r) => (r.id === id ? { ...r, lines, updatedAt: now() } : r)) })),
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
            name: name ?? `${src.name} (copy)`,
            revision: 1,
            isReference: false,
            updatedAt: now(),
          };
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
        setTargets: (recipeId, targets) => set((s) => ({ targets: { ...s.targets, [recipeId]: targets } })),
        replaceAll: (data) => set({ recipes: data.recipes, targets: data.targets, activeRecipeId: data.activeRecipeId }),
      }),
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
      partialize: (s): RecipesData => ({ recipes: s.recipes, targets: s.targets, activeRecipeId: s.activeRecipeId }),
      skipHydration: true,
    },
  ),
);
