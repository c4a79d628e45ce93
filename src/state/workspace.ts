/**
 * Workspace store (issue 10 item 5): the designer's unsaved drafts (targets, per-stock limits,
 * objective, lines, name), the editing habits, and the explorer's session (reference recipe, withdrawn
 * set, combination size, ranking, polymer cap, the ranked candidates with the scenario they belong to,
 * the selection and adopted candidates), kept in IndexedDB so a reload restores them. Schema-versioned
 * and validated like the other stores; not part of backups.
 *
 * Drafts belong to the tab (s21 item 1): each tab keeps its draft under its own key (tab-draft.ts,
 * held in the tab's sessionStorage, so a reload of that tab finds it), and the tabs merge their saves
 * per draft, so one tab's draft never replaces another's. A draft is kept only while it has unsaved
 * edits: saving or discarding it removes it. The explorer's session is still the tab's own (the last
 * one saved is what a reload restores), and a merge from another tab tells no one (nothing on screen
 * changes: a tab shows only its own draft).
 *
 * The feature stores own these values while a screen is open; they copy them here when they change
 * and read them back once at the first visit after a start. An explorer result carries the
 * fingerprint of what it was computed from (library, targets, blending rule): when the library or
 * targets have changed since, the explorer marks it stale instead of showing it as current.
 */
import { create } from 'zustand';
import { persist } from 'zustand/middleware';
import type { BlendTargets, Objective, RecipeLine } from '../core/formulation/model';
import type { SubstituteSearchResult } from '../core/search/substitutes';
import { idbPersistStorage, type StoreSpec } from './persistence';

/**
 * The saved version of its recipe a draft began from: that recipe's `updatedAt` as the draft was
 * opened or last saved, or unknown (a draft kept by workspace schema 1, which did not record it).
 * Saving a draft in place is refused when its recipe was saved since, or when this is not known.
 */
export type DraftBasedOn = { updatedAt: string } | { unknown: true };

/** The mark of a draft whose starting version was not recorded (workspace schema 1). */
export const UNKNOWN_VERSION: { unknown: true } = Object.freeze({ unknown: true as const });

/** The designer's draft as kept between visits. */
export interface DesignerDraft {
  targets: BlendTargets;
  lines: RecipeLine[];
  name: string;
  /** The saved recipe the draft came from (null for a new draft). */
  sourceRecipeId: string | null;
  /** The version of the source recipe the draft began from (null for a new draft). */
  basedOn: DraftBasedOn | null;
  basis: 'mass' | 'volume';
  rebalanceMode: 'balance' | 'proportional';
  balanceId: string | null;
  /** Lines or targets changed since the draft was loaded or saved. */
  dirty: boolean;
}

/** The scenario a search ran with. */
export interface ExplorerScenario {
  referenceId: string;
  polymerCap?: number | null | undefined;
  minInBandProbability?: number | null | undefined;
  /** The prices the search ran with (see the explorer's store). */
  pricingKey?: string | undefined;
  /** The blend-viscosity method the search ran with. */
  method?: 'refutas' | 'astm-d7152' | 'd7152-wright' | undefined;
  referenceCost?: number | null | undefined;
  withdrawn: string[];
  maxComponents: number;
  objective: Objective;
}

/** The explorer's session as kept between visits. */
export interface ExplorerSession {
  referenceId: string | null;
  withdrawn: string[];
  maxComponents: number;
  objective: Objective;
  /** null → no cap; undefined → the reference recipe's own cap (see the explorer). */
  polymerCap: number | null | undefined;
  /** Least probability in the plant band (0–1); null → none; undefined → the reference recipe's own. */
  minInBandProbability?: number | null | undefined;
  result: SubstituteSearchResult | null;
  resultFor: ExplorerScenario | null;
  /** Fingerprint of the library, targets and blending rule the result was computed from. */
  resultBasis: string | null;
  selectedKey: string | null;
  sort: { key: string; dir: 'asc' | 'desc' };
  adopted: Record<string, string>;
}

/** A draft as kept for its tab, with when it was last written (null: kept by schema 2, time not recorded). */
export interface KeptDraft extends DesignerDraft {
  keptAt: string | null;
}

/** How the designer edits shares (the last tab's choice; not a draft). */
export interface EditingHabits {
  basis: 'mass' | 'volume';
  rebalanceMode: 'balance' | 'proportional';
}

/** Key of the draft kept by workspace schema 2 (one draft for the whole browser), after the upgrade. */
export const SCHEMA2_DRAFT_KEY = 'kept-before-tabs';

/** Drafts kept longer than this are pointed out to the blender for discarding (never deleted silently) [days]. */
export const OLD_DRAFT_DAYS = 14;

export interface WorkspaceData {
  /** Every tab's draft with unsaved edits, by the tab's draft key. */
  drafts: Record<string, KeptDraft>;
  habits: EditingHabits | null;
  explorer: ExplorerSession | null;
}

export interface WorkspaceState extends WorkspaceData {
  /** Keep (or, with null, remove) the draft of a tab's key. */
  keepDraft: (key: string, draft: KeptDraft | null) => void;
  setHabits: (habits: EditingHabits) => void;
  setExplorer: (session: ExplorerSession | null) => void;
}

export const WORKSPACE_SPEC: StoreSpec<WorkspaceData> = {
  key: 'workspace',
  version: 3,
  // The zod schema is picked from the schemas module once it is loaded (persistence.loadSchemas).
  schema: (m) => m.workspaceDataSchema as unknown as ReturnType<StoreSpec<WorkspaceData>['schema']>,
  migrations: {
    // Schema 1 → 2: a draft records the saved version of its recipe it began from (`basedOn`). A
    // draft kept before has no such record: it is marked "based on an unknown version", so saving it
    // over its recipe is refused in words rather than overwriting a save made since. Every other
    // field and the explorer session are kept as they are.
    1: (d) => {
      const data = d as { designer?: Record<string, unknown> | null };
      if (typeof data !== 'object' || data === null) throw new Error('the workspace is not an object');
      const draft = data.designer;
      if (!draft) return data;
      return { ...data, designer: { ...draft, basedOn: draft.sourceRecipeId ? UNKNOWN_VERSION : null } };
    },
    // Schema 2 → 3: one draft for the whole browser becomes one kept draft among the tabs' drafts
    // (under SCHEMA2_DRAFT_KEY, time not recorded), offered by name to the next tab that opens the
    // designer; its editing habits become the habits. Every field of it and the explorer session are kept.
    2: (d) => {
      const data = d as { designer?: Record<string, unknown> | null; explorer?: unknown };
      if (typeof data !== 'object' || data === null) throw new Error('the workspace is not an object');
      const draft = data.designer ?? null;
      return {
        drafts: draft ? { [SCHEMA2_DRAFT_KEY]: { ...draft, keptAt: null } } : {},
        habits: draft ? { basis: draft.basis, rebalanceMode: draft.rebalanceMode } : null,
        explorer: data.explorer ?? null,
      };
    },
  },
  // Each tab's draft is a record of its own. The explorer's session is one record that another tab's
  // save never puts into this tab (see the applier in index.ts): the last one saved is what a reload restores.
  layout: { maps: ['drafts'] },
  crossTab: true,
  quiet: true,
  // Written with one blind put as the page leaves (a read-then-write would not finish).
  leaveWrite: true,
};

export const useWorkspaceStore = create<WorkspaceState>()(
  persist(
    (set) => ({
      drafts: {},
      habits: null,
      explorer: null,
      keepDraft: (key, draft) =>
        set((s) => {
          if (draft) return { drafts: { ...s.drafts, [key]: draft } };
          if (!(key in s.drafts)) return {};
          const drafts = { ...s.drafts };
          delete drafts[key];
          return { drafts };
        }),
      setHabits: (habits) => set((s) => (s.habits?.basis === habits.basis && s.habits.rebalanceMode === habits.rebalanceMode ? {} : { habits })),
      setExplorer: (explorer) => set({ explorer }),
    }),
    {
      name: 'workspace',
      version: WORKSPACE_SPEC.version,
      storage: idbPersistStorage(WORKSPACE_SPEC),
      partialize: (s): WorkspaceData => ({ drafts: s.drafts, habits: s.habits, explorer: s.explorer }),
      skipHydration: true,
    },
  ),
);

/**
 * A short fingerprint of any JSON-serialisable value (FNV-1a, 32 bits, over its JSON text, with the
 * text length): equal inputs give equal fingerprints; a change almost surely changes it. Used to tell
 * whether an explorer result was computed from the library and targets now in force.
 */
export function fingerprint(value: unknown): string {
  const text = JSON.stringify(value) ?? '';
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return `${text.length.toString(36)}-${h.toString(36)}`;
}
