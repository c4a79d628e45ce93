/**
 * Export-all / import-all backups: one JSON file holding the library, recipes and settings, each
 * with its schema version. Importing validates everything (older sections are migrated with the
 * stores' own migrations) and changes nothing until `applyBackup` is called with a valid backup.
 */
import * as schemas from './schemas';
import { z } from './schemas';
import { interpretStored, noteBackupTaken } from './persistence';
import { COLLECTION_LIMITS } from './field-rules';
import { sayRefusal } from './messages';
import { useLibraryStore, LIBRARY_SPEC, type LibraryData } from './library';
import { useRecipesStore, RECIPES_SPEC, type RecipesData } from './recipes';
import { useSettingsStore, SETTINGS_SPEC, type SettingsData } from './settings';

export const BACKUP_FORMAT = 'blendbench-backup';

export interface Backup {
  library: LibraryData;
  recipes: RecipesData;
  settings: SettingsData;
  exportedAt: string;
}

const envelopeSchema = z.object({
  format: z.literal(BACKUP_FORMAT),
  exportedAt: z.string().max(40),
  sections: z.object({
    library: z.object({ version: z.number().int(), data: z.unknown() }),
    recipes: z.object({ version: z.number().int(), data: z.unknown() }),
    settings: z.object({ version: z.number().int(), data: z.unknown() }),
  }),
});

/** The saved part of the recipes store (what a backup holds and a restore replaces). */
function recipesData(rec: RecipesData): RecipesData {
  return {
    recipes: rec.recipes,
    targets: rec.targets,
    activeRecipeId: rec.activeRecipeId,
    sheets: rec.sheets,
    linePlan: rec.linePlan,
    qc: rec.qc,
  };
}

/** The current saved work as a backup file's text (JSON). Records the backup time in settings. */
export function makeBackupText(now = new Date()): string {
  const lib = useLibraryStore.getState();
  const rec = useRecipesStore.getState();
  const exportedAt = now.toISOString();
  useSettingsStore.getState().updateSettings({ lastBackupAt: exportedAt });
  const set = useSettingsStore.getState();
  const body = {
    format: BACKUP_FORMAT,
    exportedAt,
    note: 'Blendbench backup: library, recipes and settings. Import it from Settings → Import a backup.',
    sections: {
      library: { version: LIBRARY_SPEC.version, data: { components: lib.components } },
      recipes: { version: RECIPES_SPEC.version, data: recipesData(rec) },
      settings: { version: SETTINGS_SPEC.version, data: { settings: set.settings } },
    },
  };
  noteBackupTaken();
  return JSON.stringify(body, null, 1);
}

export function backupFileName(now = new Date()): string {
  return `blendbench-backup-${now.toISOString().slice(0, 16).replace(/[:T]/g, '-')}.json`;
}

export type BackupParse =
  | { ok: true; backup: Backup; summary: string; warnings: string[] }
  | { ok: false; errors: string[] };

/** Validate a backup file's text. Never throws; changes nothing. */
export function parseBackupText(text: string): BackupParse {
  const maxChars = COLLECTION_LIMITS.backupFileChars;
  if (text.length > maxChars) return { ok: false, errors: [`The file is larger than ${maxChars / 1e6} MB; it is not a Blendbench backup.`] };
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    return { ok: false, errors: [`The file is not valid JSON: ${(e as Error).message}`] };
  }
  const env = envelopeSchema.safeParse(json);
  if (!env.success) {
    // The Stocks screen's own JSON export chosen here: said for what it is, and where it goes.
    const rec = typeof json === 'object' && json !== null ? (json as Record<string, unknown>) : {};
    if (rec.format === 'blendbench-library') {
      const n = Array.isArray(rec.components) ? rec.components.length : 0;
      return {
        ok: false,
        errors: [`The file is a stock library exported from the Stocks screen (${n} stock${n === 1 ? '' : 's'}), not a backup of everything: import it on Stocks → Import CSV / JSON. Nothing was changed.`],
      };
    }
    return { ok: false, errors: ['The file is not a Blendbench backup (expected "format": "blendbench-backup" with library, recipes and settings sections).'] };
  }
  const errors: string[] = [];
  const s = env.data.sections;
  const lib = interpretStored(LIBRARY_SPEC, { state: s.library.data, version: s.library.version }, schemas);
  const rec = interpretStored(RECIPES_SPEC, { state: s.recipes.data, version: s.recipes.version }, schemas);
  const set = interpretStored(SETTINGS_SPEC, { state: s.settings.data, version: s.settings.version }, schemas);
  const sections = [
    ['library', lib],
    ['recipes', rec],
    ['settings', set],
  ] as const;
  for (const [name, r] of sections) {
    if (r.kind === 'empty') errors.push(`The backup’s ${name} section is empty.`);
    if (r.kind !== 'problem') continue;
    // Every refused field on its own line, naming the record and the field (the same rules as entry).
    if (r.issues?.length) {
      const total = r.issues.length;
      errors.push(`The backup’s ${name} section has ${total === 200 ? 'at least 200' : total} refused value${total > 1 ? 's' : ''}:`);
      errors.push(...r.issues.map((m) => sayRefusal(m)!));
    } else errors.push(sayRefusal(r.problem.message.replace('The saved', 'The backup’s'))!);
  }
  if (lib.kind !== 'ok' || rec.kind !== 'ok' || set.kind !== 'ok') return { ok: false, errors };
  // Cross-checks: unique codes and ids; every recipe line names a component in the backup.
  const ids = new Set<string>();
  const codes = new Set<string>();
  for (const c of lib.data.components) {
    if (ids.has(c.id)) errors.push(`Component id ${c.id} appears twice.`);
    const code = c.code.trim().toLowerCase();
    if (codes.has(code)) errors.push(`Stock code ${c.code} appears twice.`);
    ids.add(c.id);
    codes.add(code);
  }
  for (const r of rec.data.recipes) {
    r.lines.forEach((l, i) => {
      if (!ids.has(l.componentId)) errors.push(`Recipe “${r.name}”, line ${i + 1}: its component is not in the backup’s library.`);
    });
  }
  if (errors.length) return { ok: false, errors };
  const warnings: string[] = [];
  if (rec.data.activeRecipeId && !rec.data.recipes.some((r) => r.id === rec.data.activeRecipeId)) {
    warnings.push('The active recipe named in the backup is missing; none will be active.');
    rec.data.activeRecipeId = null;
  }
  // Entries that name a stock or recipe the backup does not hold are kept, but they do nothing (the
  // plan and the QC loop skip them): say so before the import rather than drop them unannounced.
  const recipeIds = new Set(rec.data.recipes.map((r) => r.id));
  const few = (xs: readonly string[]) => (xs.length > 5 ? `${xs.slice(0, 5).join(', ')} …` : xs.join(', '));
  const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;
  const plan = rec.data.linePlan;
  const planStocks = [...new Set([...Object.keys(plan.supplies), ...Object.keys(plan.keep)])].filter((id) => !ids.has(id)).sort();
  if (planStocks.length) {
    warnings.push(
      `The line plan names ${plural(planStocks.length, 'stock', 'stocks')} that ${planStocks.length === 1 ? 'is' : 'are'} not in the backup’s library (${few(planStocks)}); ${planStocks.length === 1 ? 'it is' : 'they are'} ignored.`,
    );
  }
  const planRecipes = Object.keys(plan.demands).filter((id) => !recipeIds.has(id));
  if (planRecipes.length) {
    warnings.push(`The line plan holds a demand for ${plural(planRecipes.length, 'recipe', 'recipes')} that ${planRecipes.length === 1 ? 'is' : 'are'} not in the backup; ${planRecipes.length === 1 ? 'it is' : 'they are'} not planned.`);
  }
  for (const r of rec.data.recipes) {
    const q = rec.data.qc[r.id];
    if (!q) continue;
    const named = [...new Set([...Object.keys(q.lots), ...Object.keys(q.correction.onHandKg), ...q.correction.stockIds])].filter((id) => !ids.has(id)).sort();
    if (named.length) {
      warnings.push(
        `The QC entries of “${r.name}” name ${named.length === 1 ? 'a stock' : `${named.length} stocks`} that ${named.length === 1 ? 'is' : 'are'} not in the backup’s library (${few(named)}); ${named.length === 1 ? 'it is' : 'they are'} ignored.`,
      );
    }
  }
  return {
    ok: true,
    backup: { library: lib.data, recipes: rec.data, settings: set.data, exportedAt: env.data.exportedAt },
    summary: `${lib.data.components.length} components, ${rec.data.recipes.length} recipes and the settings, exported ${env.data.exportedAt.slice(0, 16).replace('T', ' ')}`,
    warnings,
  };
}

/** The library, recipes and settings a restore replaced, to put back with `putBackReplaced`. */
export interface ReplacedWork {
  library: LibraryData;
  recipes: RecipesData;
  settings: SettingsData;
}

/**
 * Replace the library, recipes and settings with a validated backup. Returns the work it replaced,
 * so the whole restore can be taken back in one step (the settings have no undo history of their
 * own; library and recipes are also undoable step by step).
 */
export function applyBackup(b: Backup): ReplacedWork {
  const replaced: ReplacedWork = {
    library: { components: useLibraryStore.getState().components },
    recipes: recipesData(useRecipesStore.getState()),
    settings: { settings: useSettingsStore.getState().settings },
  };
  putBackReplaced({ library: b.library, recipes: b.recipes, settings: b.settings });
  return replaced;
}

/** Put back work a restore replaced (or write any validated work): library, recipes and settings. */
export function putBackReplaced(w: ReplacedWork): void {
  useLibraryStore.getState().replaceComponents(w.library.components);
  useRecipesStore.getState().replaceAll(w.recipes);
  useSettingsStore.getState().replaceSettings(w.settings.settings);
}
