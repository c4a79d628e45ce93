// Saved work: IndexedDB persistence (fake-indexeddb), schema versions, migrations, validation,
// refusal to overwrite unusable data, failed saves, undo/redo, backups.
import 'fake-indexeddb/auto';
import { IDBFactory } from 'fake-indexeddb';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { get, set, createStore } from 'idb-keyval';

type StateModule = typeof import('../../src/state');
type PersistenceModule = typeof import('../../src/state/persistence');
type BackupModule = typeof import('../../src/state/backup');

const db = () => createStore('blendbench', 'saved-work');

/** Fresh module instances (stores, status, database handle) over the current IndexedDB. */
let previous: StateModule | null = null;
async function load(): Promise<{ state: StateModule; persistence: PersistenceModule; backup: BackupModule }> {
  previous?.resetStartForTests(); // close the previous instance's cross-tab listener
  vi.resetModules();
  const state = await import('../../src/state');
  const persistence = await import('../../src/state/persistence');
  const backup = await import('../../src/state/backup');
  previous = state;
  return { state, persistence, backup };
}

beforeEach(() => {
  globalThis.indexedDB = new IDBFactory();
});
afterEach(() => {
  vi.restoreAllMocks();
});

describe('interpretStored (pure)', () => {
  it('classifies empty, current, older, newer and corrupt records', async () => {
    const { persistence } = await load();
    const { LIBRARY_SPEC } = await import('../../src/state/library');
    const { demoComponents } = await import('../../src/state/demo');
    const comps = demoComponents();
    await persistence.loadSchemas(); // zod and the schemas are loaded on demand
    expect(persistence.interpretStored(LIBRARY_SPEC, undefined).kind).toBe('empty');
    const ok = persistence.interpretStored(LIBRARY_SPEC, { state: { components: comps }, version: LIBRARY_SPEC.version });
    expect(ok.kind).toBe('ok');
    // Schema 3 had no lot spread of ν40; the migration gives every stock the category default (null).
    const v3 = comps.map(({ kv40LotSpreadPct: _k, ...rest }) => rest);
    const fromV3 = persistence.interpretStored(LIBRARY_SPEC, { state: { components: v3 }, version: 3 });
    expect(fromV3.kind === 'ok' && fromV3.data.components[0]!.kv40LotSpreadPct).toBeNull();
    // Schema 1 lacked the optional scoring fields; the migration fills them with null.
    const v1 = comps.map(({ oxidationRating: _o, shearLossPct: _s, calibration: _c, kv40LotSpreadPct: _k, ...rest }) => rest);
    const migrated = persistence.interpretStored(LIBRARY_SPEC, { state: { components: v1 }, version: 1 });
    expect(migrated.kind).toBe('ok');
    if (migrated.kind === 'ok') {
      expect(migrated.migratedFrom).toBe(1);
      expect(migrated.data.components[0]!.calibration).toBeNull();
    }
    const newer = persistence.interpretStored(LIBRARY_SPEC, { state: {}, version: LIBRARY_SPEC.version + 1 });
    expect(newer.kind === 'problem' && newer.problem.kind).toBe('newer-schema');
    const corrupt = persistence.interpretStored(LIBRARY_SPEC, { state: { components: [{ code: 'X' }] }, version: LIBRARY_SPEC.version });
    expect(corrupt.kind === 'problem' && corrupt.problem.kind).toBe('corrupt');
    expect(persistence.interpretStored(LIBRARY_SPEC, 'garbage').kind).toBe('problem');
    expect(persistence.interpretStored(LIBRARY_SPEC, { state: { components: 5 }, version: 1 }).kind).toBe('problem');
  });
});

describe('stores saved in IndexedDB', () => {
  it('a first start shows and saves the demo; edits are saved and read back after a reload', async () => {
    let m = await load();
    await m.state.startSavedWork({ requestPersistence: false });
    expect(m.persistence.useStorageStatus.getState().stores.library.origin).toBe('fresh');
    // 29 = size of the invented demo library (a count, not a check value)
    expect(m.state.useLibrary.getState().components.length).toBe(29);
    await m.persistence.whenSaved();
    expect(((await get('library', db())) as { version: number }).version).toBe(m.state.STORE_VERSION.library);

    m.state.libraryActions.updateComponent('demo-bw-190', { name: 'Renamed bright stock' });
    m.state.settingsActions.updateSettings({ temperatureUnit: 'F' });
    const id = m.state.recipeActions.addRecipe({ name: 'Trial', grade: 320 });
    await m.persistence.whenSaved();

    m = await load(); // a reload
    await m.state.startSavedWork({ requestPersistence: false });
    expect(m.persistence.useStorageStatus.getState().stores.library.origin).toBe('stored');
    expect(m.state.useLibrary.getState().components.find((c) => c.id === 'demo-bw-190')!.name).toBe('Renamed bright stock');
    expect(m.state.useSettingsState.getState().settings.temperatureUnit).toBe('F');
    expect(m.state.useRecipes.getState().recipes.some((r) => r.id === id)).toBe(true);
    // Loading is not an edit: nothing to undo.
    expect(m.state.useLibrary.temporal.getState().pastStates.length).toBe(0);
  });

  it('a first start whose shell holds the work the screen does not wait for saves the demo when released, with an edit made meanwhile', async () => {
    let m = await load();
    let release: (() => void) | null = null;
    await m.state.startSavedWork({ requestPersistence: false, later: (run) => (release = run) });
    expect(m.state.useLibrary.getState().components.length).toBe(29); // shown at once (29: the demo's size, a count)
    await m.persistence.whenSaved();
    expect(await get('library', db())).toBeUndefined(); // not written yet
    m.state.libraryActions.updateComponent('demo-bw-190', { name: 'Renamed before the first save' });
    expect(release).not.toBeNull();
    release!();
    await m.persistence.whenSaved();
    m = await load(); // a reload
    await m.state.startSavedWork({ requestPersistence: false });
    expect(m.persistence.useStorageStatus.getState().stores.library.origin).toBe('stored');
    expect(m.state.useLibrary.getState().components.length).toBe(29);
    expect(m.state.useLibrary.getState().components.find((c) => c.id === 'demo-bw-190')!.name).toBe('Renamed before the first save');
    expect(((await get('recipes', db())) as { version: number }).version).toBe(m.state.STORE_VERSION.recipes);
  });

  it('migrates an older stored schema, validates it and writes it back at the current version', async () => {
    const { demoComponents } = await import('../../src/state/demo');
    await set('library', { state: { components: demoComponents().slice(0, 3) }, version: 1 }, db());
    await set('settings', { state: { settings: { temperatureUnit: 'C', currencySymbol: '$', decimalSeparator: '.', thousandsGrouping: false, companyName: 'X', operatingTempC: 60, coldStartTempC: 0 } }, version: 1 }, db());
    const m = await load();
    await m.state.startSavedWork({ requestPersistence: false });
    await m.persistence.whenSaved();
    expect(m.persistence.useStorageStatus.getState().stores.library.origin).toBe('migrated');
    expect(m.state.useLibrary.getState().components.length).toBe(3);
    expect(m.state.useSettingsState.getState().settings.blendMethod).toBe('refutas');
    expect(((await get('library', db())) as { version: number }).version).toBe(m.state.STORE_VERSION.library);
    expect(((await get('settings', db())) as { version: number }).version).toBe(m.state.STORE_VERSION.settings);
    // Settings schema 2 → 3: the base currency is read from the symbol ($ → USD), with no rates yet.
    expect(m.state.useSettingsState.getState().settings.baseCurrency).toBe('USD');
    expect(m.state.useSettingsState.getState().settings.exchangeRates).toEqual([]);
    expect(m.state.useSettingsState.getState().settings.meteringTempC).toBe(60);
    expect(m.state.useSettingsState.getState().settings.deliveryTempC).toBe(15);
    // Settings schema 4 → 5: the D341 form, the full D341-20 Z the older data was computed with.
    expect(m.state.useSettingsState.getState().settings.d341Form).toBe('d341-20');
  });

  for (const [what, raw, kind] of [
    ['a newer schema', { state: { components: [] }, version: 99 }, 'newer-schema'],
    ['corrupted data', { state: { components: [{ id: 'x', code: '' }] }, version: 3 }, 'corrupt'],
  ] as const) {
    it(`keeps ${what} untouched, sets a copy aside, pauses saving and says so`, async () => {
      await set('library', raw, db());
      const m = await load();
      await m.state.startSavedWork({ requestPersistence: false });
      const st = m.persistence.useStorageStatus.getState().stores.library;
      expect(st.problem?.kind).toBe(kind);
      expect(st.savingPaused).toBe(true);
      expect(st.problem?.message).toMatch(/saved component library/);
      expect(st.problem?.keptAs).toBe('library.unusable-copy');
      // The demo is shown meanwhile; edits do not overwrite the stored copy.
      m.state.libraryActions.updateComponent('demo-bw-190', { name: 'edited' });
      await m.persistence.whenSaved();
      expect(await get('library', db())).toEqual(raw);
      expect(((await get('library.unusable-copy', db())) as { raw: unknown }).raw).toEqual(raw);
      // Only the user's decision replaces it.
      m.persistence.resumeSaving('library', m.state.persistedData('library'), m.state.STORE_VERSION.library);
      await m.persistence.whenSaved();
      expect(((await get('library', db())) as { version: number }).version).toBe(m.state.STORE_VERSION.library);
      expect(((await get('library.unusable-copy', db())) as { raw: unknown }).raw).toEqual(raw);
    });
  }

  it('a failed save (quota exceeded) is reported and cleared by the next good save', async () => {
    const m = await load();
    await m.state.startSavedWork({ requestPersistence: false });
    await m.persistence.whenSaved();
    // Make every IndexedDB write fail as a full disk would.
    const proto = globalThis.IDBObjectStore.prototype as { put: (...a: unknown[]) => unknown };
    const realPut = proto.put;
    const quota = new DOMException('The quota has been exceeded.', 'QuotaExceededError');
    proto.put = () => {
      throw quota;
    };
    try {
      m.state.libraryActions.updateComponent('demo-bw-190', { name: 'too big' });
      await m.persistence.whenSaved();
    } finally {
      proto.put = realPut;
    }
    const err = m.persistence.useStorageStatus.getState().stores.library.saveError;
    expect(err).toMatch(/quota exceeded/);
    expect(err).toMatch(/last saved copy is kept/);
    expect(((await get('library', db())) as { state: { components: { name: string }[] } }).state.components.some((c) => c.name === 'too big')).toBe(false);
    m.state.libraryActions.updateComponent('demo-bw-190', { name: 'fits' });
    await m.persistence.whenSaved();
    expect(m.persistence.useStorageStatus.getState().stores.library.saveError).toBeNull();
  });
});

describe('never store what cannot be read back (issue 10 item 1)', () => {
  it('the reproduction (5,000-character name, 500-character lot and vessel, 25,000 characters of instructions, a 40-digit batch) is refused, and the recipes load again', async () => {
    let m = await load();
    await m.state.startSavedWork({ requestPersistence: false });
    const id = 'demo-vg320';
    const act = m.state.recipeActions;
    expect(act.updateRecipe(id, { name: 'n'.repeat(5000) })).toMatch(/recipe name/);
    expect(act.setSheetInputs(id, { lot: 'L'.repeat(500) })).toMatch(/lot number/);
    expect(act.setSheetInputs(id, { vessel: 'V'.repeat(500) })).toMatch(/vessel/);
    expect(act.setSheetInputs(id, { instructions: 'i'.repeat(25_000) })).toMatch(/blending instructions/);
    expect(act.setSheetInputs(id, { batchSize: '1'.repeat(40) })).toMatch(/batch size/);
    expect(m.state.libraryActions.updateComponent('demo-bw-190', { density15: 1e-300 })).toMatch(/density at 15 °C/);
    expect(m.state.settingsActions.updateSettings({ companyName: 'c'.repeat(5000) })).toMatch(/company name/);
    expect(act.setSheetInputs(id, { lot: 'L-1' })).toBeNull();
    await m.persistence.whenSaved();

    m = await load(); // a reload
    await m.state.startSavedWork({ requestPersistence: false });
    const st = m.persistence.useStorageStatus.getState().stores;
    expect([st.library.origin, st.recipes.origin, st.settings.origin]).toEqual(['stored', 'stored', 'stored']);
    expect(m.state.useRecipes.getState().sheets[id]!.lot).toBe('L-1');
  });
});

describe('undo and redo', () => {
  it('undoes and redoes library and recipe edits, one step per action', async () => {
    const m = await load();
    await m.state.startSavedWork({ requestPersistence: false });
    const lib = m.state.useLibrary;
    const n = lib.getState().components.length;
    const copy = lib.getState().cloneComponent('demo-bw-190')!;
    expect(lib.getState().components.find((c) => c.id === copy)!.code).toBe('BW-190-copy');
    lib.getState().setAvailability('demo-bw-190', 'withdrawn');
    lib.getState().removeComponent(copy);
    expect(lib.getState().components.length).toBe(n);
    lib.temporal.getState().undo();
    expect(lib.getState().components.length).toBe(n + 1);
    lib.temporal.getState().undo();
    expect(lib.getState().components.find((c) => c.id === 'demo-bw-190')!.availability).toBe('limited');
    lib.temporal.getState().redo();
    expect(lib.getState().components.find((c) => c.id === 'demo-bw-190')!.availability).toBe('withdrawn');

    const rec = m.state.useRecipes;
    m.state.recipeActions.setActiveRecipe('demo-vg220'); // not an edit
    expect(rec.temporal.getState().pastStates.length).toBe(0);
    m.state.recipeActions.renameRecipe('demo-vg220', 'renamed');
    rec.temporal.getState().undo();
    expect(rec.getState().recipes.find((r) => r.id === 'demo-vg220')!.name).not.toBe('renamed');
    // An approved recipe's lines are not overwritten (issue 10, item 15): a draft copy takes the edit.
    expect(m.state.recipeActions.setLines('demo-vg220', [{ componentId: 'demo-bw-190', massFraction: 1 }])).toMatch(/never overwritten/);
    const draft = m.state.recipeActions.duplicateRecipe('demo-vg220')!;
    m.state.recipeActions.setLines(draft, [{ componentId: 'demo-bw-190', massFraction: 1 }]);
    rec.temporal.getState().undo();
    expect(rec.getState().recipes.find((r) => r.id === draft)!.lines.length).toBe(3);
    rec.temporal.getState().undo();
    expect(rec.getState().recipes.find((r) => r.id === draft)).toBeUndefined();
    expect(rec.getState().recipes.find((r) => r.id === 'demo-vg220')!.lines.length).toBe(3);
  });

  it('reset demo restores the demo and can be undone', async () => {
    const m = await load();
    await m.state.startSavedWork({ requestPersistence: false });
    m.state.libraryActions.removeComponent('demo-bw-110');
    m.state.resetDemo();
    expect(m.state.useLibrary.getState().components.length).toBe(29);
    m.state.useLibrary.temporal.getState().undo();
    expect(m.state.useLibrary.getState().components.length).toBe(28);
  });
});

describe('export-all and import-all backups', () => {
  it('round-trips library, recipes and settings, and records the backup time', async () => {
    const m = await load();
    await m.state.startSavedWork({ requestPersistence: false });
    m.state.settingsActions.updateSettings({ currencySymbol: 'CHF' });
    const text = m.backup.makeBackupText(new Date('2025-04-01T10:00:00Z'));
    expect(m.state.useSettingsState.getState().settings.lastBackupAt).toBe('2025-04-01T10:00:00.000Z');
    m.state.libraryActions.removeComponent('demo-bw-110');
    m.state.settingsActions.updateSettings({ currencySymbol: '$' });
    const parsed = m.backup.parseBackupText(text);
    expect(parsed.ok).toBe(true);
    if (!parsed.ok) return;
    expect(parsed.summary).toMatch(/^29 components, 4 recipes/);
    m.backup.applyBackup(parsed.backup);
    expect(m.state.useLibrary.getState().components.length).toBe(29);
    expect(m.state.useSettingsState.getState().settings.currencySymbol).toBe('CHF');
  });

  it('a restore can be taken back whole: the library, recipes and settings it replaced are put back (s19)', async () => {
    const m = await load();
    await m.state.startSavedWork({ requestPersistence: false });
    const text = m.backup.makeBackupText(new Date('2025-04-01T10:00:00Z'));
    // The work after the backup was taken: one stock fewer, another currency symbol, another active recipe.
    m.state.libraryActions.removeComponent('demo-bw-110');
    m.state.settingsActions.updateSettings({ currencySymbol: 'CHF' });
    const before = {
      library: JSON.stringify(m.state.persistedData('library')),
      recipes: JSON.stringify(m.state.persistedData('recipes')),
      settings: JSON.stringify(m.state.persistedData('settings')),
    };
    const parsed = m.backup.parseBackupText(text);
    if (!parsed.ok) throw new Error(parsed.errors.join());
    const replaced = m.backup.applyBackup(parsed.backup);
    expect(m.state.useSettingsState.getState().settings.currencySymbol).not.toBe('CHF');
    m.backup.putBackReplaced(replaced);
    expect(JSON.stringify(m.state.persistedData('library'))).toBe(before.library);
    expect(JSON.stringify(m.state.persistedData('recipes'))).toBe(before.recipes);
    expect(JSON.stringify(m.state.persistedData('settings'))).toBe(before.settings);
  });

  it('a Stocks library export chosen as a backup is refused saying what it is and where it is imported (s25 walk)', async () => {
    const m = await load();
    await m.state.startSavedWork({ requestPersistence: false });
    const { libraryToJson } = await import('../../src/state/library-io');
    const parsed = m.backup.parseBackupText(libraryToJson(m.state.useLibrary.getState().components, '2025-04-01T10:00:00.000Z'));
    expect(parsed).toEqual({
      ok: false,
      errors: ['The file is a stock library exported from the Stocks screen (29 stocks), not a backup of everything: import it on Stocks → Import CSV / JSON. Nothing was changed.'],
    });
  });

  it('refuses a broken backup and changes nothing', async () => {
    const m = await load();
    await m.state.startSavedWork({ requestPersistence: false });
    const good = JSON.parse(m.backup.makeBackupText());
    const before = JSON.stringify(m.state.persistedData('library'));
    expect(m.backup.parseBackupText('{').ok).toBe(false);
    expect(m.backup.parseBackupText('{"format":"other"}').ok).toBe(false);
    const dangling = structuredClone(good);
    dangling.sections.recipes.data.recipes[0].lines[0].componentId = 'nowhere';
    const r1 = m.backup.parseBackupText(JSON.stringify(dangling));
    expect(!r1.ok && r1.errors.join()).toMatch(/not in the backup’s library/);
    const newer = structuredClone(good);
    newer.sections.library.version = 7;
    const r2 = m.backup.parseBackupText(JSON.stringify(newer));
    expect(!r2.ok && r2.errors.join()).toMatch(/newer version/);
    const dup = structuredClone(good);
    dup.sections.library.data.components[1].code = dup.sections.library.data.components[0].code;
    expect(m.backup.parseBackupText(JSON.stringify(dup)).ok).toBe(false);
    expect(JSON.stringify(m.state.persistedData('library'))).toBe(before);
  });

  it('names what a backup’s line plan and QC records say about stocks and recipes it does not hold, rather than dropping them unannounced (plant loop defect hunt)', async () => {
    const m = await load();
    await m.state.startSavedWork({ requestPersistence: false });
    const good = JSON.parse(m.backup.makeBackupText());
    const clean = m.backup.parseBackupText(JSON.stringify(good));
    expect(clean.ok && clean.warnings).toEqual([]);
    const odd = structuredClone(good);
    const d = odd.sections.recipes.data;
    d.linePlan.keep['ghost-stock'] = 5000;
    d.linePlan.supplies['ghost-stock-2'] = 1000;
    d.linePlan.demands['ghost-recipe'] = 250000;
    d.qc['demo-vg320'] = { ...(d.qc['demo-vg320'] ?? {}), ...structuredClone(m.state.DEFAULT_QC_INPUTS) };
    d.qc['demo-vg320'].correction.stockIds = ['ghost-stock'];
    const r = m.backup.parseBackupText(JSON.stringify(odd));
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const w = r.warnings.join(' ');
    expect(w).toMatch(/The line plan names 2 stocks that are not in the backup’s library \(ghost-stock, ghost-stock-2\); they are ignored\./);
    expect(w).toMatch(/The line plan holds a demand for 1 recipe that is not in the backup; it is not planned\./);
    expect(w).toMatch(/The QC entries of “Gear oil VG 320 — current recipe \(invented demo\)” name a stock that is not in the backup’s library \(ghost-stock\); it is ignored\./);
  });

  it('refuses absurd values with the same field rules as entry, naming every record and field, and touches nothing stored (issue 10 item 6)', async () => {
    const m = await load();
    await m.state.startSavedWork({ requestPersistence: false });
    await m.persistence.whenSaved();
    const storedBefore = await get('library', db());
    const bad = JSON.parse(m.backup.makeBackupText());
    const comps = bad.sections.library.data.components;
    comps[0].density15 = 1e-300;
    comps[1].price.amount = 1e300;
    comps[2].notes = 'n'.repeat(3000);
    const recipe = bad.sections.recipes.data.recipes[0];
    recipe.lines = recipe.lines.map((l: { componentId: string }) => ({ ...l, massFraction: 1 }));
    const lineCount = recipe.lines.length;
    bad.sections.settings.data.settings.operatingTempC = 5000;
    const r = m.backup.parseBackupText(JSON.stringify(bad));
    expect(r.ok).toBe(false);
    if (r.ok) return;
    const text = r.errors.join('\n');
    // Limits from src/state/field-rules.ts: density 0.6–1.3 kg/L, price ≤ 1e12, notes ≤ 2000 characters, shares sum to 100 %.
    expect(text).toContain(`Stock ${comps[0].code} (entry 1): the density at 15 °C 1e−300 kg/L is outside the possible range`);
    expect(text).toContain(`Stock ${comps[1].code} (entry 2): the price 1e+300 is outside the possible range`);
    expect(text).toContain(`Stock ${comps[2].code} (entry 3): the notes field is 3000 characters long`);
    expect(text).toMatch(new RegExp(`Recipe “[^”]+” \\(entry 1\\): the shares add up to ${lineCount * 100} %, not 100 %`));
    expect(text).toContain('Settings: the operating temperature 5000 °C is outside the possible range');
    // Nothing in memory or in IndexedDB was touched.
    expect(m.state.useLibrary.getState().components[0]!.density15).not.toBe(1e-300);
    await m.persistence.whenSaved();
    expect(await get('library', db())).toEqual(storedBefore);
  });
});
