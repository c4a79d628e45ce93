/**
 * The designer's working draft: targets, the recipe being edited and the editing habits. Saving
 * writes a recipe and its targets to the recipes store. The draft itself (targets, per-stock limits,
 * objective, lines, name, habits) is copied to the workspace store whenever it changes, so a reload
 * restores it (`restoreDraft`). Holds inputs; predicted properties are derived on render.
 */
import { create } from 'zustand';
import {
  adoptDraftKey,
  newDraftKey,
  ownDraftKey,
  registerDeferredWrite,
  UNKNOWN_VERSION,
  useLibrary,
  useRecipes,
  useWorkspaceStore,
  type DesignerDraft,
  type DraftBasedOn,
  type KeptDraft,
} from '../../state';
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
  /**
   * Sets a line's share in the editing basis. `densityNotEntered` gives a stock's code when its density
   * is still a placeholder (Component.notEntered): a volume % is then refused, not converted with it.
   */
  editLine: (componentId: string, fraction: number, density: (id: string) => number, densityNotEntered?: (id: string) => string | null) => void;
  addComponent: (componentId: string) => void;
  removeComponent: (componentId: string) => void;
  applySolution: (lines: RecipeLine[], message: string) => void;
  setNotice: (notice: SolveNotice | null) => void;
  markSaved: (recipeId: string) => void;
  /**
   * Take this tab's draft kept from before its reload, if there is one with unsaved edits and this tab
   * has none yet; lines and limits of stocks no longer in the library are left out (and the note says
   * so). True if restored. Otherwise only the editing habits come back (false): the screen then opens
   * the saved recipe as it is now, and offers the drafts kept by other tabs (see KeptDrafts).
   */
  restoreDraft: () => boolean;
  /**
   * Open a draft kept by another tab (closed since) or an earlier session: it becomes this tab's draft
   * (this tab takes its key). This tab's own draft, if any, must have no unsaved edits (the screen
   * offers kept drafts only then). False when no draft is kept under `key`.
   */
  openKeptDraft: (key: string) => boolean;
  /**
   * Keep this tab's draft, unsaved edits and all, as a kept draft of its own (s22 item 2), before
   * another recipe is opened in its place: offered again by name and time like a closed tab's draft
   * (see KeptDrafts). False when it cannot be kept (a value breaks a field rule, so it could not be
   * read back); nothing is kept then.
   */
  setAside: () => boolean;
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
  setBasis: (basis) => set({ basis, editNote: '' }),
  setRebalanceMode: (rebalanceMode) => set({ rebalanceMode, editNote: '' }),
  setBalanceId: (balanceId) => set({ balanceId, editNote: '' }),
  editLine: (componentId, fraction, density, densityNotEntered) => {
    const s = get();
    if (s.basis === 'volume' && densityNotEntered) {
      // Every line's density (the edited line's and those charged) enters its volume share.
      const pending = s.lines
        .filter((l) => l.massFraction > 0 || l.componentId === componentId)
        .map((l) => densityNotEntered(l.componentId))
        .find((code) => code !== null);
      if (pending) {
        set({
          editNote: `Volume % cannot be set while the density of ${pending} is not entered (it would be converted with a placeholder): enter its density on Stocks first, or edit as mass %.`,
        });
        return;
      }
    }
    const r = editFraction(s.lines, density, s.basis, componentId, fraction, rebalanceOf(s));
    // A "Solved" message describes the solver's recipe: drop it once the recipe is edited by hand.
    set({ lines: r.lines, editNote: r.message, dirty: true, notice: s.notice?.kind === 'optimal' ? null : s.notice });
  },
  addComponent: (componentId) =>
    set((s) => {
      const pkg = s.targets.additive;
      // A blank recipe holds only the additive package (100 % until another stock is added): the first
      // other stock takes the rest once the package is set to its treat rate, so the shares can be typed.
      const onlyPackage = pkg !== null && s.lines.length === 1 && s.lines[0]!.componentId === pkg.componentId && componentId !== pkg.componentId;
      const lines = onlyPackage
        ? [
            { componentId: pkg.componentId, massFraction: pkg.massFraction },
            { componentId, massFraction: 1 - pkg.massFraction },
          ]
        : addLine(s.lines, componentId);
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
    const ws = useWorkspaceStore.getState();
    const kept = ws.drafts[ownDraftKey()];
    if (get().initialised) return false;
    const habits = kept ?? ws.habits;
    if (habits) set({ basis: habits.basis, rebalanceMode: habits.rebalanceMode });
    if (!kept) return false;
    // A draft without unsaved edits is its saved recipe: open that recipe as it is now (it may have
    // changed in another tab since), keeping only the editing habits.
    const sourceSaved = kept.sourceRecipeId !== null && useRecipes.getState().recipes.some((r) => r.id === kept.sourceRecipeId);
    if (!kept.dirty && sourceSaved) return false;
    set(restored(kept, 'Restored the draft from your last session.'));
    return true;
  },
  openKeptDraft: (key) => {
    const kept = useWorkspaceStore.getState().drafts[key];
    if (!kept) return false;
    adoptDraftKey(key);
    set(restored(kept, `Opened the draft kept ${keptWhen(kept.keptAt)}.`));
    return true;
  },
  setAside: () => {
    const draft = draftOf(get());
    if (!keepable(draft)) return false;
    useWorkspaceStore.getState().keepDraft(newDraftKey(), { ...draft, dirty: true, keptAt: new Date().toISOString() });
    return true;
  },
}));

/** Whether this tab's draft could be kept as it is (see `setAside`). */
export function draftKeepable(s: DesignerState): boolean {
  return keepable(draftOf(s));
}

/** When a draft was kept, in words ("at 23:12", "on 2026-12-02 at 23:12", or "by an earlier version"). */
export function keptWhen(keptAt: string | null, now: Date = new Date()): string {
  if (keptAt === null) return 'by an earlier version (time not recorded)';
  const t = new Date(keptAt);
  const pad = (n: number) => String(n).padStart(2, '0');
  const day = (d: Date) => `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}`;
  const time = `${pad(t.getHours())}:${pad(t.getMinutes())}`;
  return day(t) === day(now) ? `at ${time}` : `on ${day(t)} at ${time}`;
}

/** The designer's state for a kept draft, with the note the screen shows (stocks gone, saved since). */
function restored(kept: KeptDraft, note: string): Partial<DesignerState> {
  const sourceSaved = kept.sourceRecipeId !== null && useRecipes.getState().recipes.some((r) => r.id === kept.sourceRecipeId);
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
  return {
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
    editNote: note + (dropped ? ` ${dropped} line${dropped > 1 ? 's' : ''} of stocks no longer in the library ${dropped > 1 ? 'were' : 'was'} left out.` : '') + since,
    initialised: true,
    seenActiveId: useRecipes.getState().activeRecipeId,
  };
}

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

/**
 * Write the changed draft to the workspace store now (its save starts at once), if one is pending:
 * under this tab's key while it has unsaved edits; once saved or discarded (no unsaved edits) it is
 * removed, and only the editing habits are kept.
 */
function writeDraft(): void {
  if (draftTimer === null) return;
  clearTimeout(draftTimer);
  draftTimer = null;
  const draft = draftOf(useDesignerStore.getState());
  if (!keepable(draft)) return;
  const ws = useWorkspaceStore.getState();
  ws.setHabits({ basis: draft.basis, rebalanceMode: draft.rebalanceMode });
  ws.keepDraft(ownDraftKey(), draft.dirty ? { ...draft, keptAt: new Date().toISOString() } : null);
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
