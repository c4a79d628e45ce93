/**
 * The designer's working draft: targets, the recipe being edited and the editing habits. Saving
 * writes a recipe and its targets to the recipes store. The draft itself (targets, per-stock limits,
 * objective, lines, name, habits) is copied to the workspace store whenever it changes, so a reload
 * restores it (`restoreDraft`). Holds inputs; predicted properties are derived on render.
 */
import { create } from 'zustand';
import { registerDeferredWrite, UNKNOWN_VERSION, useLibrary, useRecipes, useWorkspaceStore, type DesignerDraft, type DraftBasedOn } from '../../state';
import { targetsProblems, checkText, checkNumber } from '../../state/field-rules';
import type { BlendTargets, Component, Recipe, RecipeLine } from '../../core/formulation/model';
import { addLine, editFraction, normalise, removeLine, type Basis, type Rebalance } from './fractions';

export type RebalanceMode = 'balance' | 'proportional';

/** What the last Solve said, kept until the next solve or edit of the targets. */
export type SolveNotice =
  | { kind: 'optimal'; message: string }
  | { kind: 'infeasible'; reason: string; binding: string; suggestion: string }
  | { kind: 'invalid-input'; field: string; message: string }
  | { kind: 'error'; message: string };

export interface DesignerState {
  targets: BlendTargets;
  lines: RecipeLine[];
  name: string;
  /** The saved recipe the draft came from (null for a new draft). */
  sourceRecipeId: string | null;
  basis: Basis;
  rebalanceMode: RebalanceMode;
  balanceId: string | null;
  /** Why the last hand edit was limited; empty when it was not. */
  editNote: string;
  notice: SolveNotice | null;
  /** True when lines or targets changed since the last save or load. */
  dirty: boolean;
  /** False until the draft was first loaded (the screen opens the active recipe then). */
  initialised: boolean;
  /** The recipes store's active recipe when last looked at (a change made elsewhere opens it). */
  seenActiveId: string | null;
  /**
   * `updatedAt` of the source recipe as the draft was loaded or saved: a draft without unsaved edits
   * whose recipe has since changed (an undo on another screen, another tab) opens it as it is now.
   */
  sourceStamp: string | null;
  /**
   * True for a draft restored from a kept copy that did not record the version it began from
   * (workspace schema 1): saving it in place is refused, since a save made since cannot be ruled out.
   */
  stampUnknown: boolean;
  setSeenActiveId: (id: string | null) => void;

  load: (recipe: Recipe, targets: BlendTargets) => void;
  startBlank: (targets: BlendTargets) => void;
  setTargets: (patch: Partial<BlendTargets>) => void;
  setBound: (componentId: string, bound: { min?: number; max?: number } | null) => void;
  setName: (name: string) => void;
  setBasis: (basis: Basis) => void;
  setRebalanceMode: (mode: RebalanceMode) => void;
  setBalanceId: (id: string) => void;
  editLine: (componentId: string, fraction: number, density: (id: string) => number) => void;
  addComponent: (componentId: string) => void;
  removeComponent: (componentId: string) => void;
  applySolution: (lines: RecipeLine[], message: string) => void;
  setNotice: (notice: SolveNotice | null) => void;
  markSaved: (recipeId: string) => void;
  /**
   * Take the draft kept from the last session, if there is one with unsaved edits and this tab has
   * none yet; lines and limits of stocks no longer in the library are left out (and the note says so).
   * True if restored. A draft without unsaved edits only hands back the editing habits (false): the
   * screen then opens the saved recipe as it is now.
   */
  restoreDraft: () => boolean;
}

/** The heaviest base stock in the recipe is the natural balance (it sets the viscosity). */
export function pickBalance(lines: readonly RecipeLine[], additiveId: string | null): string | null {
  const candidates = lines.filter((l) => l.componentId !== additiveId);
  if (candidates.length === 0) return null;
  return candidates.reduce((best, l) => (l.massFraction > best.massFraction ? l : best)).componentId;
}

export function rebalanceOf(s: Pick<DesignerState, 'rebalanceMode' | 'balanceId' | 'targets'>): Rebalance {
  if (s.rebalanceMode === 'balance' && s.balanceId) return { mode: 'balance', balanceId: s.balanceId };
  return { mode: 'proportional', lockedIds: s.targets.additive ? [s.targets.additive.componentId] : [] };
}

const EMPTY_TARGETS: BlendTargets = {
  grade: 320,
  targetKv40: null,
  tolerancePct: 5,
  minVi: null,
  maxAnilinePoint: null,
  maxPolymerFraction: null,
  maxPourPoint: null,
  minFlashPoint: null,
  additive: null,
  bounds: {},
  objective: 'cost',
  referenceRecipeId: null,
  minInBandProbability: null,
};

export const useDesignerStore = create<DesignerState>()((set, get) => ({
  targets: EMPTY_TARGETS,
  lines: [],
  name: '',
  sourceRecipeId: null,
  basis: 'mass',
  rebalanceMode: 'proportional',
  balanceId: null,
  editNote: '',
  notice: null,
  dirty: false,
  initialised: false,
  seenActiveId: null,
  sourceStamp: null,
  stampUnknown: false,

  load: (recipe, targets) => {
    const lines = normalise(recipe.lines);
    set({
      targets: structuredClone(targets),
      lines,
      name: recipe.name,
      sourceRecipeId: recipe.id,
      sourceStamp: recipe.updatedAt,
      stampUnknown: false,
      balanceId: pickBalance(lines, targets.additive?.componentId ?? null),
      editNote: '',
      notice: null,
      dirty: false,
      initialised: true,
    });
  },
  startBlank: (targets) =>
    set({
      targets: structuredClone(targets),
      lines: targets.additive ? [{ componentId: targets.additive.componentId, massFraction: 1 }] : [],
      name: '',
      sourceRecipeId: null,
      sourceStamp: null,
      stampUnknown: false,
      balanceId: null,
      editNote: '',
      notice: null,
      dirty: false,
      initialised: true,
    }),
  // A change of constraints alone is a change that can be saved.
  setTargets: (patch) => set((s) => ({ targets: { ...s.targets, ...patch }, dirty: true })),
  setBound: (componentId, bound) =>
    set((s) => {
      const bounds = { ...s.targets.bounds };
      if (bound === null || (bound.min === undefined && bound.max === undefined)) delete bounds[componentId];
      else bounds[componentId] = bound;
      return { targets: { ...s.targets, bounds }, dirty: true };
    }),
  setName: (name) => set({ name }),
  setBasis: (basis) => set({ basis }),
  setRebalanceMode: (rebalanceMode) => set({ rebalanceMode, editNote: '' }),
  setBalanceId: (balanceId) => set({ balanceId, editNote: '' }),
  editLine: (componentId, fraction, density) => {
    const s = get();
    const r = editFraction(s.lines, density, s.basis, componentId, fraction, rebalanceOf(s));
    // A "Solved" message describes the solver's recipe: drop it once the recipe is edited by hand.
    set({ lines: r.lines, editNote: r.message, dirty: true, notice: s.notice?.kind === 'optimal' ? null : s.notice });
  },
  addComponent: (componentId) =>
    set((s) => {
      const lines = addLine(s.lines, componentId);
      return { lines, dirty: true, balanceId: s.balanceId ?? pickBalance(lines, s.targets.additive?.componentId ?? null) };
    }),
  removeComponent: (componentId) =>
    set((s) => {
      const lines = removeLine(s.lines, componentId, rebalanceOf(s));
      const balanceId = s.balanceId === componentId ? pickBalance(lines, s.targets.additive?.componentId ?? null) : s.balanceId;
      return { lines, balanceId, dirty: true, editNote: '' };
    }),
  applySolution: (lines, message) =>
    set((s) => ({
      lines,
      balanceId: pickBalance(lines, s.targets.additive?.componentId ?? null),
      notice: { kind: 'optimal', message },
      editNote: '',
      dirty: true,
    })),
  setNotice: (notice) => set({ notice }),
  markSaved: (recipeId) =>
    set({
      sourceRecipeId: recipeId,
      sourceStamp: useRecipes.getState().recipes.find((r) => r.id === recipeId)?.updatedAt ?? null,
      stampUnknown: false,
      dirty: false,
      seenActiveId: recipeId,
    }),
  setSeenActiveId: (seenActiveId) => set({ seenActiveId }),
  restoreDraft: () => {
    const kept = useWorkspaceStore.getState().designer;
    if (get().initialised || !kept) return false;
    // A draft without unsaved edits is its saved recipe: open that recipe as it is now (it may have
    // changed in another tab since), keeping only the editing habits.
    const sourceSaved = kept.sourceRecipeId !== null && useRecipes.getState().recipes.some((r) => r.id === kept.sourceRecipeId);
    if (!kept.dirty && sourceSaved) {
      set({ basis: kept.basis, rebalanceMode: kept.rebalanceMode });
      return false;
    }
    const known = new Set(useLibrary.getState().components.map((c) => c.id));
    const lines = kept.lines.filter((l) => known.has(l.componentId));
    const bounds = Object.fromEntries(Object.entries(kept.targets.bounds).filter(([id]) => known.has(id)));
    const additive = kept.targets.additive && known.has(kept.targets.additive.componentId) ? kept.targets.additive : null;
    const dropped = kept.lines.length - lines.length;
    // The version of its recipe the draft began from, as kept with it (never the version saved now:
    // a save made since in another tab must not be overwritten by this draft).
    const source = sourceSaved ? useRecipes.getState().recipes.find((r) => r.id === kept.sourceRecipeId)! : null;
    const stamp = source && kept.basedOn && 'updatedAt' in kept.basedOn ? kept.basedOn.updatedAt : null;
    const stampUnknown = source !== null && stamp === null;
    const since =
      source && source.status === 'draft'
        ? stampUnknown
          ? ` It was kept by an earlier version, which does not record which saved version of “${source.name}” it began from: Save as new recipe keeps both.`
          : stamp !== source.updatedAt
            ? ` “${source.name}” was changed and saved after this draft began (in another tab or on another screen): Save changes will not overwrite it; Save as new recipe keeps both.`
            : ''
        : '';
    set({
      targets: { ...EMPTY_TARGETS, ...structuredClone(kept.targets), bounds, additive },
      lines: dropped ? normalise(lines) : lines,
      name: kept.name,
      sourceRecipeId: sourceSaved ? kept.sourceRecipeId : null,
      sourceStamp: stamp,
      stampUnknown,
      basis: kept.basis,
      rebalanceMode: kept.rebalanceMode,
      balanceId: kept.balanceId && known.has(kept.balanceId) ? kept.balanceId : pickBalance(lines, additive?.componentId ?? null),
      dirty: kept.dirty || dropped > 0,
      notice: null,
      editNote:
        'Restored the draft from your last session.' +
        (dropped ? ` ${dropped} line${dropped > 1 ? 's' : ''} of stocks no longer in the library ${dropped > 1 ? 'were' : 'was'} left out.` : '') +
        since,
      initialised: true,
      seenActiveId: useRecipes.getState().activeRecipeId,
    });
    return true;
  },
}));

/** The draft as kept in the workspace store. */
export function draftOf(s: DesignerState): DesignerDraft {
  return {
    targets: s.targets,
    lines: s.lines,
    name: s.name,
    sourceRecipeId: s.sourceRecipeId,
    basedOn: basedOnOf(s),
    basis: s.basis,
    rebalanceMode: s.rebalanceMode,
    balanceId: s.balanceId,
    dirty: s.dirty,
  };
}

/** The version of its recipe the draft began from, as kept with it (unknown when not recorded). */
export function basedOnOf(s: Pick<DesignerState, 'sourceRecipeId' | 'sourceStamp' | 'stampUnknown'>): DraftBasedOn | null {
  if (s.sourceRecipeId === null) return null;
  return s.stampUnknown || s.sourceStamp === null ? UNKNOWN_VERSION : { updatedAt: s.sourceStamp };
}

/** True when the draft can be kept (the field rules accept it), so what is kept can be read back. */
function keepable(d: DesignerDraft): boolean {
  return (
    targetsProblems(d.targets).length === 0 &&
    checkText('recipeName', d.name) === null &&
    d.lines.every((l) => checkNumber('massFraction', l.massFraction) === null)
  );
}

/** How long after the last change the draft is written to the workspace store [ms]. */
const DRAFT_WRITE_DELAY_MS = 300;
let draftTimer: ReturnType<typeof setTimeout> | null = null;

/** Write the changed draft to the workspace store now (its save starts at once), if one is pending. */
function writeDraft(): void {
  if (draftTimer === null) return;
  clearTimeout(draftTimer);
  draftTimer = null;
  const draft = draftOf(useDesignerStore.getState());
  if (keepable(draft)) useWorkspaceStore.getState().setDesigner(draft);
}
registerDeferredWrite(writeDraft);

// Keep the draft in the workspace store whenever a part of it changes: written shortly after the
// last change, off the input's path (an edit's frame does not wait for the save); written at once
// when the page is hidden or left, before another screen shows and before a save is awaited
// (registerDeferredWrite), so an edit followed at once by a reload is kept.
useDesignerStore.subscribe((s, p) => {
  if (!s.initialised) return;
  const same =
    s.targets === p.targets &&
    s.lines === p.lines &&
    s.name === p.name &&
    s.sourceRecipeId === p.sourceRecipeId &&
    s.sourceStamp === p.sourceStamp &&
    s.stampUnknown === p.stampUnknown &&
    s.basis === p.basis &&
    s.rebalanceMode === p.rebalanceMode &&
    s.balanceId === p.balanceId &&
    s.dirty === p.dirty &&
    s.initialised === p.initialised;
  if (same) return;
  if (draftTimer !== null) clearTimeout(draftTimer);
  draftTimer = setTimeout(writeDraft, DRAFT_WRITE_DELAY_MS);
});

/** Density lookup over a library [kg/L]; unknown ids fall back to 0.88 so a stale line cannot crash. */
export function densityLookup(components: readonly Component[]): (id: string) => number {
  const m = new Map(components.map((c) => [c.id, c.density15]));
  return (id) => m.get(id) ?? 0.88;
}
