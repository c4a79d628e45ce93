/**
 * Blendbench state — the public API for features (designer, explorer, charts, blend sheet).
 *
 * Stores hold INPUTS only (components, recipes, targets, settings); derive every result by calling
 * src/core in a selector or useMemo. All three stores are saved to IndexedDB automatically (schema
 * version + migrations + validation, see persistence.ts); the app shell waits for `useSavedWorkReady()`
 * before showing screens, so features always see loaded data.
 *
 * Reading (React hooks; pass a selector to avoid needless re-renders):
 *   useLibrary(s => s.components)            Component[] (demo on first start)
 *   useComponentsById() / componentsById(list) Map<id, Component> (memoised per library array)
 *   usePricedLibrary() / pricedLibrary(list, settings)  the library with prices in the base currency
 *                                            (Settings → exchange rates) + the stocks without a rate;
 *                                            every cost figure and solve uses it (solvableLibrary(…)
 *                                            from core leaves the unpriced stocks out of solves)
 *   useRecipes(s => s.recipes)               Recipe[];  useRecipes(s => s.targets[id]) BlendTargets | undefined
 *   useActiveRecipe()                        Recipe | null (the one the designer / sheet opens on)
 *   useSettings()                            Settings (units, currency symbol, number format, company,
 *                                            operatingTempC, coldStartTempC, blendMethod)
 *   useFormat()                              number / temperature / money formatters for the settings
 *                                            (from src/components/format.ts)
 * Writing (actions; call from event handlers; every library/recipe action is one undo step). Every action
 * that writes a stored field checks it with the field rules (./field-rules.ts) and refuses what they
 * refuse, keeping the stored value: actions returning `string | null` return the message (null = stored),
 * actions returning an id throw FieldRuleError. Check with the same rules at entry to say it first.
 *   libraryActions: addComponent(init?) → id | updateComponent(id, patch) | cloneComponent(id) → id
 *     | setAvailability(id, 'available'|'limited'|'withdrawn') | removeComponent(id)
 *     (also useLibrary.getState().…)
 *   libraryRoomProblem(count, adding, 'entry'|'import', say?) → why the library has no room (one stock limit) | null
 *   recipeActions: addRecipe({ name, grade, lines?, isReference?, notes?, specification?, stockBasis?, targets?, activate? }) → id (a draft; with its targets, and made active, in one step)
 *     | updateRecipe(id, patch) | setLines(id, lines)   (drafts only for content; otherwise returns approvedMessage)
 *     | saveChanges(id, changes, reason, basedOn?) → id  (a draft in place, unless saved since `basedOn` or `basedOn` is { unknown: true }; an approved recipe → a new draft revision)
 *     | saveRevision(id, changes, reason) → new id  (always a new draft revision that supersedes id)
 *     | approveRecipe(id) → null | why refused (the recipe it supersedes becomes superseded) | renameRecipe(id, name)
 *     | setArchived(id, bool) | duplicateRecipe(id, name?) → id | removeRecipe(id) (undoable)
 *     | confirmSpecificationGrade(id, grade) → null | why refused (names the grade of a specification left unknown by the upgrade; any status)
 *     | setActiveRecipe(id) | setTargets(recipeId, BlendTargets) (drafts only; returns a refusal message otherwise)
 *     | setSheetInputs(recipeId, Partial<SheetInputs>) (blend-sheet lot, batch size/unit, vessel, edited
 *       instructions; saved, not an undo step; read with useRecipes(s => s.sheets[id]))
 *     (also available as useRecipes.getState().addRecipe … )
 *   linePlanActions: setDemand(recipeId, kg|null) | setSupply(stockId, kg|null) | limitStock(id) | unlimitStock(id)
 *     | setKeep(stockId, kg|null) | setMaxStocks(n|null) | setPeriod(text) | setDemandUnit('kg'|'t') | clear()
 *     (the line plan's inputs, read with useRecipes(s => s.linePlan); each one undo step of the recipes)
 *   adoptPlanRevisions([{ recipeId, lines, note }]) → { recipeId: new revision } (one undo step)
 *   settingsActions.updateSettings(patch)
 *   defaultTargets(grade, additiveId, referenceRecipeId) → BlendTargets
 * Undo/redo (zundo), one history per store:
 *   useLibraryHistory() / useRecipesHistory() → { canUndo, canRedo, undo, redo }
 * Workspace (designer drafts, one per tab; editing habits; explorer session; kept across reloads, not in backups):
 *   useWorkspaceStore(s => s.drafts | s.habits | s.explorer), .getState().keepDraft(key, draft | null) /
 *   setHabits(habits) / setExplorer(session); ownDraftKey() this tab's draft key, adoptDraftKey(key),
 *   newDraftKey() a key no tab holds (a draft set aside before another recipe is opened over it),
 *   draftKeysOfOpenTabs() → the keys other open tabs hold (their drafts are not offered here), askOpenTabs(onKey)
 *   the same, hearing late answers too (a busy tab); with Web Locks draftKeysLocked() → the keys open tabs hold,
 *   as the browser knows them, and claimDraftKey(key) → whether this tab took a kept draft's key before opening it,
 *   releaseDraftClaim(key) lets go of a claimed key whose draft vanished before it was opened;
 *   fingerprint(value) → short hash telling whether an explorer result still matches the library and targets
 * Leaving: holdLeave(() => boolean) asks for the browser's leave-page warning while a screen holds unsaved
 *   typed work of its own (the focused field's typed text and refused entries are followed by themselves).
 *   The focused field's typed text is put back into its field after a reload, uncommitted: useTypedNote()
 *   says so (or gives the text when its field was not drawn), dismissTypedNote() closes that notice.
 * Demo: resetDemo() restores the invented demo library and recipes (undoable); isDemoComponent(c).
 * Saved-work status (banners): useStorageStatus(); backups in ./backup.ts; library CSV/JSON in ./library-io.ts;
 * entry checks shared by screens and imports in ./checks.ts; every stored field's limits in ./field-rules.ts.
 */
import { useMemo } from 'react';
import { create, useStore } from 'zustand';
import type { Component, Recipe } from '../core/formulation/model';
import { priceLibraryInBase, type ExchangeRate, type PricedLibrary } from '../core/currency/exchange-rates';
import { useLibraryStore, LIBRARY_SPEC, type LibraryData } from './library';
import { useRecipesStore, RECIPES_SPEC, demoRecipesData, type RecipeChanges, type RecipesData, type SavedVersionMark } from './recipes';
import { useSettingsStore, SETTINGS_SPEC, type Settings } from './settings';
import { useWorkspaceStore, WORKSPACE_SPEC, type WorkspaceData } from './workspace';
import { answerDraftQuestions, leaveSharedKey } from './tab-draft';
import { installLeaveWarning } from './leave-guard';
import { installTypedCopy } from './typed-copy';
import {
  useStorageStatus,
  saveNow,
  noteEdit,
  onSavedInOtherTab,
  mergeFromOtherTab,
  registerApplier,
  requestPersistentStorage,
  type StoreKey,
} from './persistence';
import { demoComponents, demoSettingsPatch } from './demo';

export type { Settings } from './settings';
export type { LibraryState, LibraryData } from './library';
export type { RecipesState, RecipesData, NewRecipe, SheetInputs, QcInputs, RecipeChanges, SavedVersionMark } from './recipes';
export { DEFAULT_SHEET_INPUTS, DEFAULT_QC_INPUTS, RecipeChangedError, RecipeVersionUnknownError, approvedMessage, nextRevisionNumber } from './recipes';
export type { LinePlanInputs } from './lineplan';
export { emptyLinePlan, leastUseAboveSupply } from './lineplan';
export { linePlanActions, adoptPlanRevisions, type PlanRevision } from './lineplan-actions';
export { blankComponent, freeCode, libraryRoomProblem } from './library';
export { enteredKvPatch, enteredPatch } from './stock-defaults';
/** Today's date as YYYY-MM-DD, local time (the date printed on sheets and summaries). */
export { today as todayIso } from './ids';
export { defaultTargets, isDemoComponent, DEMO_LABEL, DEMO_PLANT } from './demo';
export { DEFAULT_SETTINGS, baseChangeProblem } from './settings';
export {
  useWorkspaceStore,
  fingerprint,
  UNKNOWN_VERSION,
  OLD_DRAFT_DAYS,
  type DraftBasedOn,
  type DesignerDraft,
  type KeptDraft,
  type EditingHabits,
  type ExplorerSession,
  type ExplorerScenario,
  type WorkspaceData,
} from './workspace';
export { ownDraftKey, adoptDraftKey, askOpenTabs, claimDraftKey, releaseDraftClaim, draftKeysLocked, draftKeysOfOpenTabs, newDraftKey, ANSWER_WAIT_MS as DRAFT_ANSWER_WAIT_MS } from './tab-draft';
export { holdLeave } from './leave-guard';
export { useTypedNote, dismissTypedNote, RESTORED_ATTR as TYPED_RESTORED_ATTR, type TypedNote } from './typed-copy';
export { useStorageStatus, requestPersistentStorage, registerDeferredWrite, flushDeferredWrites, type StoreKey } from './persistence';
export { setRefusalWords, sayRefusal } from './messages';

/** The library store hook (zustand): `useLibrary(s => s.components)`; `useLibrary.getState()` for actions. */
export const useLibrary = useLibraryStore;
/** The recipes store hook (zustand). */
export const useRecipes = useRecipesStore;
/** The settings store hook (raw zustand; prefer `useSettings()` for the settings object). */
export const useSettingsState = useSettingsStore;

/** Current settings. */
export function useSettings(): Settings {
  return useSettingsStore((s) => s.settings);
}

export const settingsActions = {
  updateSettings: (patch: Partial<Settings>) => useSettingsStore.getState().updateSettings(patch),
};

/** Recipe actions, callable outside React. */
export const recipeActions = {
  addRecipe: (...a: Parameters<ReturnType<typeof useRecipesStore.getState>['addRecipe']>) =>
    useRecipesStore.getState().addRecipe(...a),
  updateRecipe: (...a: Parameters<ReturnType<typeof useRecipesStore.getState>['updateRecipe']>) =>
    useRecipesStore.getState().updateRecipe(...a),
  setLines: (...a: Parameters<ReturnType<typeof useRecipesStore.getState>['setLines']>) =>
    useRecipesStore.getState().setLines(...a),
  saveChanges: (id: string, changes: RecipeChanges, reason: string, basedOn?: SavedVersionMark | null) =>
    useRecipesStore.getState().saveChanges(id, changes, reason, basedOn),
  saveRevision: (id: string, changes: RecipeChanges, reason: string) => useRecipesStore.getState().saveRevision(id, changes, reason),
  approveRecipe: (id: string): string | null => useRecipesStore.getState().approveRecipe(id),
  renameRecipe: (id: string, name: string) => useRecipesStore.getState().renameRecipe(id, name),
  confirmSpecificationGrade: (id: string, grade: number) => useRecipesStore.getState().confirmSpecificationGrade(id, grade),
  setArchived: (id: string, archived: boolean) => useRecipesStore.getState().setArchived(id, archived),
  duplicateRecipe: (id: string, name?: string) => useRecipesStore.getState().duplicateRecipe(id, name),
  removeRecipe: (id: string) => useRecipesStore.getState().removeRecipe(id),
  setActiveRecipe: (id: string | null) => useRecipesStore.getState().setActiveRecipe(id),
  setTargets: (...a: Parameters<ReturnType<typeof useRecipesStore.getState>['setTargets']>) =>
    useRecipesStore.getState().setTargets(...a),
  setSheetInputs: (...a: Parameters<ReturnType<typeof useRecipesStore.getState>['setSheetInputs']>) =>
    useRecipesStore.getState().setSheetInputs(...a),
  setQcInputs: (...a: Parameters<ReturnType<typeof useRecipesStore.getState>['setQcInputs']>) =>
    useRecipesStore.getState().setQcInputs(...a),
};

/** Library actions, callable outside React. */
export const libraryActions = {
  addComponent: (...a: Parameters<ReturnType<typeof useLibraryStore.getState>['addComponent']>) =>
    useLibraryStore.getState().addComponent(...a),
  updateComponent: (...a: Parameters<ReturnType<typeof useLibraryStore.getState>['updateComponent']>) =>
    useLibraryStore.getState().updateComponent(...a),
  cloneComponent: (id: string) => useLibraryStore.getState().cloneComponent(id),
  setAvailability: (...a: Parameters<ReturnType<typeof useLibraryStore.getState>['setAvailability']>) =>
    useLibraryStore.getState().setAvailability(...a),
  removeComponent: (id: string) => useLibraryStore.getState().removeComponent(id),
};

const byIdCache = new WeakMap<readonly Component[], Map<string, Component>>();
/** Components by id, memoised per library state (safe to call in selectors). */
export function componentsById(components: readonly Component[]): Map<string, Component> {
  let m = byIdCache.get(components);
  if (!m) {
    m = new Map(components.map((c) => [c.id, c]));
    byIdCache.set(components, m);
  }
  return m;
}

const pricedCache = new WeakMap<readonly Component[], { base: string; rates: readonly ExchangeRate[]; value: PricedLibrary }>();
/**
 * The library with every price restated in the base currency (exchange rates from the settings),
 * and the stocks whose currency has no rate — the boundary every cost figure and solve goes through.
 * Memoised per library array and rates.
 */
export function pricedLibrary(
  components: readonly Component[],
  settings: Pick<Settings, 'baseCurrency' | 'exchangeRates'>,
): PricedLibrary {
  const hit = pricedCache.get(components);
  if (hit && hit.base === settings.baseCurrency && hit.rates === settings.exchangeRates) return hit.value;
  const value = priceLibraryInBase(components, settings.baseCurrency, settings.exchangeRates);
  pricedCache.set(components, { base: settings.baseCurrency, rates: settings.exchangeRates, value });
  return value;
}

/** {@link pricedLibrary} of the current library and settings (React hook). */
export function usePricedLibrary(): PricedLibrary {
  const components = useLibraryStore((s) => s.components);
  const base = useSettingsStore((s) => s.settings.baseCurrency);
  const rates = useSettingsStore((s) => s.settings.exchangeRates);
  return useMemo(() => pricedLibrary(components, { baseCurrency: base, exchangeRates: rates }), [components, base, rates]);
}

export function useComponentsById(): Map<string, Component> {
  const components = useLibraryStore((s) => s.components);
  return componentsById(components);
}

export function useActiveRecipe(): Recipe | null {
  return useRecipesStore((s) => s.recipes.find((r) => r.id === s.activeRecipeId) ?? null);
}

export interface History {
  canUndo: boolean;
  canRedo: boolean;
  undo: () => void;
  redo: () => void;
}

export function useLibraryHistory(): History {
  const past = useStore(useLibraryStore.temporal, (t) => t.pastStates.length);
  const future = useStore(useLibraryStore.temporal, (t) => t.futureStates.length);
  return useMemo(
    () => ({
      canUndo: past > 0,
      canRedo: future > 0,
      undo: () => useLibraryStore.temporal.getState().undo(),
      redo: () => useLibraryStore.temporal.getState().redo(),
    }),
    [past, future],
  );
}

export function useRecipesHistory(): History {
  const past = useStore(useRecipesStore.temporal, (t) => t.pastStates.length);
  const future = useStore(useRecipesStore.temporal, (t) => t.futureStates.length);
  return useMemo(
    () => ({
      canUndo: past > 0,
      canRedo: future > 0,
      undo: () => useRecipesStore.temporal.getState().undo(),
      redo: () => useRecipesStore.temporal.getState().redo(),
    }),
    [past, future],
  );
}

/** Restore the invented demo library, recipes and company name (library and recipes undoable). */
export function resetDemo(): void {
  useLibraryStore.getState().replaceComponents(demoComponents());
  useRecipesStore.getState().replaceAll(demoRecipesData());
  useSettingsStore.getState().updateSettings(demoSettingsPatch());
}

/**
 * True once every store has read its saved copy (or found none / an unusable one) and holds it: a
 * store's phase turns 'ready' as its copy is read, a few microtasks before the copy is in the store,
 * and React may render in between (a screen drawn then would not see the designer's kept draft).
 */
export function useSavedWorkReady(): boolean {
  const read = useStorageStatus((s) => Object.values(s.stores).every((st) => st.phase === 'ready'));
  return useStore(useHydration, (s) => s.done) && read;
}

/** Whether startSavedWork has put every store's saved copy into the store. */
const useHydration = create<{ done: boolean }>(() => ({ done: false }));

/** Current persisted data of a store (what `saveNow` writes). */
export function persistedData(key: StoreKey): unknown {
  if (key === 'library') return { components: useLibraryStore.getState().components };
  if (key === 'recipes') {
    const { recipes, targets, activeRecipeId, sheets, linePlan, qc } = useRecipesStore.getState();
    return { recipes, targets, activeRecipeId, sheets, linePlan, qc };
  }
  if (key === 'workspace') {
    const { drafts, habits, explorer } = useWorkspaceStore.getState();
    return { drafts, habits, explorer };
  }
  return { settings: useSettingsStore.getState().settings };
}

export const STORE_VERSION: Record<StoreKey, number> = {
  library: LIBRARY_SPEC.version,
  recipes: RECIPES_SPEC.version,
  settings: SETTINGS_SPEC.version,
  workspace: WORKSPACE_SPEC.version,
};

const rehydrate: Record<StoreKey, () => Promise<void>> = {
  library: () => useLibraryStore.persist.rehydrate(),
  recipes: () => useRecipesStore.persist.rehydrate(),
  settings: () => useSettingsStore.persist.rehydrate(),
  workspace: () => useWorkspaceStore.persist.rehydrate(),
};

let started: Promise<void> | null = null;
let stopWatching: Array<() => void> = [];

/**
 * Load saved work (all stores), save the demo on a first start, count edits for the backup
 * reminder, follow saves made in other tabs, and ask the browser for persistent storage.
 * Idempotent; the shell calls it once.
 *
 * `later` runs the work that the first screen does not wait for — the first start's save of the
 * demo, the duplicated-tab check of the draft key, the request for persistent storage — when the
 * caller says (the shell: after the first screen is painted); by default at once.
 */
export function startSavedWork(opts: { requestPersistence?: boolean; later?: (run: () => void) => void } = {}): Promise<void> {
  started ??= (async () => {
    await Promise.all([rehydrate.library(), rehydrate.recipes(), rehydrate.settings(), rehydrate.workspace()]);
    useHydration.setState({ done: true });
    // Recipes saved before stock data were recorded: record the library as it is now, once.
    useRecipesStore.getState().recordMissingStockBasis(useLibraryStore.getState().components);
    useLibraryStore.temporal.getState().clear();
    useRecipesStore.temporal.getState().clear();
    let external = false;
    stopWatching.push(
      useLibraryStore.subscribe((s, p) => {
        if (!external && s.components !== p.components) noteEdit();
      }),
      useRecipesStore.subscribe((s, p) => {
        if (!external && (s.recipes !== p.recipes || s.targets !== p.targets || s.linePlan !== p.linePlan)) noteEdit();
      }),
      // Records saved in another tab are merged in per record (persistence.ts says which changed).
      registerApplier('library', (d) => {
        external = true;
        try {
          useLibraryStore.setState(d as LibraryData);
          useLibraryStore.temporal.getState().clear();
        } finally {
          external = false;
        }
      }),
      registerApplier('recipes', (d) => {
        external = true;
        try {
          useRecipesStore.setState(d as Partial<RecipesData>);
          useRecipesStore.temporal.getState().clear();
        } finally {
          external = false;
        }
      }),
      registerApplier('settings', (d) => useSettingsStore.setState(d as { settings: Settings })),
      // The other tabs' drafts (this tab's explorer session is its own: not taken).
      registerApplier('workspace', (d) => {
        const { drafts, habits } = d as WorkspaceData;
        useWorkspaceStore.setState({ drafts, habits });
      }),
      answerDraftQuestions(),
      onSavedInOtherTab((key) => mergeFromOtherTab(key)),
    );
    // The browser's leave-page warning while typed text is not saved (leave-guard.ts).
    // The focused field's typed text is kept across a reload as typed text, never saved (typed-copy.ts).
    if (typeof window !== 'undefined' && typeof document !== 'undefined') stopWatching.push(installLeaveWarning(window), installTypedCopy(window));
    (opts.later ?? ((run) => run()))(() => {
      // A first start saves what it shows (the demo); an edit made meanwhile is saved with it.
      const status = useStorageStatus.getState().stores;
      for (const key of ['library', 'recipes', 'settings', 'workspace'] as const) {
        if (status[key].origin === 'fresh') saveNow(key, persistedData(key), STORE_VERSION[key]);
      }
      void leaveSharedKey();
      if (opts.requestPersistence !== false) void requestPersistentStorage();
    });
  })();
  return started;
}

/** Tests only: allow `startSavedWork` to run again. */
export function resetStartForTests(): void {
  started = null;
  useHydration.setState({ done: false });
  for (const stop of stopWatching) stop();
  stopWatching = [];
}
