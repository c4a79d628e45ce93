/** Library store: the plant's components (stocks). Persisted, with undo/redo (zundo). */
import { create } from 'zustand';
import { persist } from 'zustand/middleware';
import { temporal } from 'zundo';
import type { Availability, Component } from '../core/formulation/model';
import { idbPersistStorage, type StoreSpec } from './persistence';
import { demoComponents } from './demo';
import { newId } from './ids';
import { OLDER_SCHEMA_STOCK_DEFAULTS, blankComponent, freeCode } from './stock-defaults';

export { blankComponent, freeCode } from './stock-defaults';
import { COLLECTION_LIMITS, FieldRuleError, TEXT_RULES, checkCount, firstProblem, stockProblems, stockWho } from './field-rules';
import { sayRefusal } from './messages';

/** Throws FieldRuleError when a library of `count` stocks would exceed COLLECTION_LIMITS.stocks. */
function refuseIfFull(count: number): void {
  const full = checkCount('stocks', count, 'the library');
  if (full) throw new FieldRuleError([{ path: ['components'], message: full }]);
}

/**
 * Why `adding` more stocks cannot join a library of `count` (the one stock limit,
 * COLLECTION_LIMITS.stocks), in the user's words, or null when there is room. `via` says where the
 * user acted: 'entry' (Add stock, Clone) or 'import'. `say` writes counts in the user's format.
 */
export function libraryRoomProblem(count: number, adding: number, via: 'entry' | 'import', say: (n: number) => string = String): string | null {
  const max = COLLECTION_LIMITS.stocks;
  if (count + adding <= max) return null;
  return via === 'entry'
    ? `The library holds ${say(count)} stocks, the most Blendbench keeps; delete stocks no longer in use before adding another.`
    : `This import would add ${say(adding)} stocks to the library’s ${say(count)}; Blendbench keeps at most ${say(max)}. Delete stocks no longer in use, or import fewer rows; nothing was imported.`;
}

export interface LibraryData {
  components: Component[];
}

/**
 * Every action that writes a stored field checks it with the field rules (field-rules.ts) first: one
 * that returns `string | null` refuses what the rules refuse, keeps the stored value and returns the
 * message (null = stored); one that returns an id throws `FieldRuleError` instead (also when the
 * library would exceed COLLECTION_LIMITS.stocks). Entry forms check with the same rules beforehand.
 */
export interface LibraryState extends LibraryData {
  /** Add a component (defaults fill what is not given); returns its id. Throws FieldRuleError. */
  addComponent: (init?: Partial<Omit<Component, 'id'>>) => string;
  /**
   * Change fields of one component. Null, or why the change was refused (nothing changed then). A
   * value entered for a field listed in `notEntered` clears it only when the patch says so (the
   * entry forms pass the remaining list): a placeholder is never taken for an entered value.
   */
  updateComponent: (id: string, patch: Partial<Omit<Component, 'id'>>) => string | null;
  /**
   * Copy a component under a new id and a free code ("BW-190 copy"); returns the new id. The copy's
   * values not yet entered are the source's. Throws FieldRuleError when full.
   */
  cloneComponent: (id: string) => string | null;
  setAvailability: (id: string, availability: Availability) => void;
  removeComponent: (id: string) => void;
  /** Add or update by stock code (import): existing codes keep their id. Throws FieldRuleError when full. */
  upsertByCode: (components: Component[]) => void;
  /** Replace the whole library (reset demo, import-all backup). Throws FieldRuleError when too many. */
  replaceComponents: (components: Component[]) => void;
}

export const LIBRARY_SPEC: StoreSpec<LibraryData> = {
  key: 'library',
  version: 6,
  schema: (m) => m.libraryDataSchema,
  // Each stock is a record of its own when tabs merge their saves.
  layout: {
    lists: { components: 'id' },
    label: (_key, v) => `stock ${String((v as { code?: unknown } | undefined)?.code ?? 'deleted')}`,
  },
  migrations: {
    // Schema 5 → 6: a stock may list the measured values not yet entered (optional `notEntered`, a stock
    // just added). Stocks saved before carry no list and count as complete: the data are unchanged. The
    // version moves so that an older build refuses a library holding such a list instead of dropping
    // it (its placeholders would then be solved with as if measured).
    5: (d) => d,
    // Schema 4 → 5: calibrations may name the D7152 Wright method, and a polymer may carry a measured
    // ν40 shear loss (optional field, `shearLoss40Pct`). Existing data are valid as they are.
    4: (d) => d,
    // Schema 3 had no lot spread of ν40: every stock takes its category's common-practice default.
    3: (d) => {
      const comps = (d as { components?: unknown }).components;
      if (!Array.isArray(comps)) throw new Error('components is not a list');
      return { ...(d as object), components: comps.map((c: Record<string, unknown>) => ({ kv40LotSpreadPct: null, ...c })) };
    },
    // Schema 3 holds up to 25,000 stocks (schema 2: 5,000) and checks every field with the field
    // rules (field-rules.ts); the data themselves are unchanged.
    2: (d) => d,
    // Schema 1 (first development builds) stored components without the optional scoring fields.
    1: (d) => {
      const comps = (d as { components?: unknown }).components;
      if (!Array.isArray(comps)) throw new Error('components is not a list');
      return {
        components: comps.map((c: Record<string, unknown>) => {
          // Schema 3's lot spread is added by the next migration.
          const { kv40LotSpreadPct: _later, ...schema1 } = OLDER_SCHEMA_STOCK_DEFAULTS;
          return { ...schema1, ...c };
        }),
      };
    },
  },
};

export const useLibraryStore = create<LibraryState>()(
  persist(
    temporal(
      (set, get) => ({
        components: demoComponents(),
        addComponent: (init = {}) => {
          const c = blankComponent(init);
          if (!c.code) c.code = freeCode(get().components, 'NEW');
          refuseIfFull(get().components.length + 1);
          const problems = stockProblems(c);
          if (problems.length) throw new FieldRuleError(problems);
          set((s) => ({ components: [...s.components, c] }));
          return c.id;
        },
        updateComponent: (id, patch) => {
          const old = get().components.find((c) => c.id === id);
          if (!old) return null;
          const next: Component = { ...old, ...patch, id };
          // An emptied list of values to enter is no list: the stock is complete (as older data).
          if (!next.notEntered?.length) delete next.notEntered;
          const refused = firstProblem(stockProblems(next, stockWho(old.code)));
          if (refused) return sayRefusal(refused);
          set((s) => ({ components: s.components.map((c) => (c.id === id ? next : c)) }));
          return null;
        },
        cloneComponent: (id) => {
          const src = get().components.find((c) => c.id === id);
          if (!src) return null;
          refuseIfFull(get().components.length + 1);
          const copy: Component = structuredClone(src);
          copy.id = newId('c');
          copy.code = freeCode(get().components, `${src.code}-copy`.slice(0, TEXT_RULES.stockCode.max - 3));
          copy.name = src.name ? `${src.name} (copy)`.slice(0, TEXT_RULES.stockName.max) : '';
          const at = get().components.indexOf(src) + 1;
          set((s) => ({ components: [...s.components.slice(0, at), copy, ...s.components.slice(at)] }));
          return copy.id;
        },
        setAvailability: (id, availability) =>
          set((s) => ({ components: s.components.map((c) => (c.id === id ? { ...c, availability } : c)) })),
        removeComponent: (id) => set((s) => ({ components: s.components.filter((c) => c.id !== id) })),
        upsertByCode: (incoming) =>
          set((s) => {
            // One pass with an index by code (a whole library of 20,000 rows is imported at once).
            const at = new Map<string, number>();
            s.components.forEach((c, i) => {
              const k = c.code.trim().toLowerCase();
              if (!at.has(k)) at.set(k, i);
            });
            const next = [...s.components];
            for (const inc of incoming) {
              const k = inc.code.trim().toLowerCase();
              const i = at.get(k);
              if (i !== undefined) {
                next[i] = { ...inc, id: next[i]!.id };
              } else {
                at.set(k, next.length);
                next.push(inc);
              }
            }
            refuseIfFull(next.length);
            return { components: next };
          }),
        replaceComponents: (components) => {
          refuseIfFull(components.length);
          set({ components });
        },
      }),
      {
        partialize: (s): LibraryData => ({ components: s.components }),
        equality: (a, b) => a.components === b.components,
        limit: 100,
      },
    ),
    {
      name: 'library',
      version: LIBRARY_SPEC.version,
      storage: idbPersistStorage(LIBRARY_SPEC),
      partialize: (s): LibraryData => ({ components: s.components }),
      skipHydration: true,
    },
  ),
);
