// @vitest-environment jsdom
// s23 item 1: what a tab committed but had not saved as its page was hidden is copied synchronously
// into the tab's sessionStorage, and a reload takes each copied record newer than what IndexedDB holds,
// writes it through and removes the copy. A "reload" is a fresh instance of the state modules over the
// same IndexedDB (fake-indexeddb) and the same sessionStorage (the tab's); a save "cut off by the
// reload" is played by putting the stored copy back as it was before the save. No timing: every step
// waits for the saves it needs (whenSaved).
import 'fake-indexeddb/auto';
import { IDBFactory } from 'fake-indexeddb';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { createStore, del as idbDel, get as idbGet, set as idbSet } from 'idb-keyval';
import { applyCopy, leaveCopyKey, pendingCopy, readLeaveCopy, writeLeaveCopies, writeLeaveCopy, type LeaveCopy } from '../../src/state/leave-copy';
import type { RecordSet } from '../../src/state/record-merge';
import { restartTab, stopTab } from '../helpers/settle';

const db = () => createStore('blendbench', 'saved-work');
const set = (records: Array<[string, unknown]>, stamps: Record<string, string>, gone: Record<string, string> = {}): RecordSet => ({
  records: new Map(records),
  stamps,
  gone,
});

describe('pendingCopy and applyCopy (pure)', () => {
  it('copies only the records committed since the last save (and deletions), in the tab’s order', () => {
    const mine = set(
      [
        ['components/a', { n: 'a' }],
        ['components/new', { n: 'new' }],
        ['components/b', { n: 'b2' }],
      ],
      { 'components/a': '1', 'components/new': '5', 'components/b': '4' },
      { 'components/c': '6' },
    );
    const base = { stamps: { 'components/a': '1', 'components/b': '2', 'components/c': '3' }, gone: {} };
    const copy = pendingCopy(mine, base, 7, null);
    expect(copy).toEqual({
      version: 7,
      records: [
        { key: 'components/new', stamp: '5', value: { n: 'new' }, after: 'components/a' },
        { key: 'components/b', stamp: '4', value: { n: 'b2' }, after: 'components/new' },
        { key: 'components/c', stamp: '6', gone: true, after: null },
      ],
    });
    // Nothing committed since the last save and no changed local field: no copy.
    expect(pendingCopy(mine, { stamps: mine.stamps, gone: mine.gone }, 7, null)).toBeNull();
    expect(pendingCopy(mine, { stamps: mine.stamps, gone: mine.gone }, 7, { activeRecipeId: 'r1' })).toEqual({
      version: 7,
      records: [],
      local: { activeRecipeId: 'r1' },
    });
  });

  it('takes a copied record only when its stamp is later than the stored one; a new record returns to its place', () => {
    const stored = set(
      [
        ['components/a', { n: 'a' }],
        ['components/b', { n: 'b-saved-later' }],
        ['components/c', { n: 'c' }],
      ],
      { 'components/a': '1', 'components/b': '9', 'components/c': '3' },
    );
    const copy: LeaveCopy = {
      version: 1,
      records: [
        { key: 'components/new', stamp: '5', value: { n: 'new' }, after: 'components/a' },
        { key: 'components/b', stamp: '4', value: { n: 'b-copied' }, after: 'components/new' }, // older than stored: not taken
        { key: 'components/c', stamp: '6', gone: true, after: null },
        { key: 'components/tail', stamp: '7', value: { n: 'tail' }, after: 'components/not-there' },
      ],
    };
    const { set: out, taken } = applyCopy(stored, copy);
    expect(taken).toEqual(['components/new', 'components/c', 'components/tail']);
    expect([...out.records.keys()]).toEqual(['components/a', 'components/new', 'components/b', 'components/tail']);
    expect(out.records.get('components/b')).toEqual({ n: 'b-saved-later' });
    expect(out.stamps['components/new']).toBe('5');
    expect(out.gone['components/c']).toBe('6');
    expect(out.stamps['components/c']).toBeUndefined();
    expect(stored.records.size).toBe(3); // the stored set itself is not changed
  });

  it('copies the blank records a first entry brought with it, and takes them only where nothing is stored', () => {
    const mine = set(
      [
        ['qc/r1/aimKv40', 301.5],
        ['qc/r1/heel/massKg', null],
        ['qc/r1/lots', {}],
      ],
      { 'qc/r1/aimKv40': '5' },
    );
    const copy = pendingCopy(mine, { stamps: {}, gone: {} }, 1, null, new Set(['qc/r1/heel/massKg', 'qc/r1/lots']));
    expect(copy?.records.map((r) => [r.key, r.stamp])).toEqual([
      ['qc/r1/aimKv40', '5'],
      ['qc/r1/heel/massKg', ''],
      ['qc/r1/lots', ''],
    ]);
    // Blank records alone are no unsaved work.
    expect(pendingCopy(mine, { stamps: { 'qc/r1/aimKv40': '5' }, gone: {} }, 1, null, new Set(['qc/r1/lots']))).toBeNull();
    const stored = set([['qc/r1/heel/massKg', 1200]], { 'qc/r1/heel/massKg': '' });
    const { set: out, taken } = applyCopy(stored, copy!);
    expect(taken).toEqual(['qc/r1/aimKv40', 'qc/r1/lots']);
    expect(out.records.get('qc/r1/heel/massKg')).toBe(1200); // an entry stored: the blank is not taken
    expect(out.stamps['qc/r1/lots']).toBeUndefined();
  });

  it('reads back only a copy in the form written here', () => {
    writeLeaveCopy('library', { version: 2, records: [{ key: 'k', stamp: 's', value: 1, after: null }] });
    expect(readLeaveCopy('library')).toEqual({ version: 2, records: [{ key: 'k', stamp: 's', value: 1, after: null }] });
    sessionStorage.setItem(leaveCopyKey('library'), '{"version":2,"records":[{"key":5}]}');
    expect(readLeaveCopy('library')).toBeNull();
    sessionStorage.setItem(leaveCopyKey('library'), 'not json');
    expect(readLeaveCopy('library')).toBeNull();
    writeLeaveCopy('library', null);
    expect(sessionStorage.getItem(leaveCopyKey('library'))).toBeNull();
  });
});

type PersistenceModule = typeof import('../../src/state/persistence');
/** A fresh instance of the state modules (a reload of the tab), started. */
const reload = restartTab;

/** The tab's sessionStorage entries written as the page was hidden. */
const leaveCopies = () =>
  Object.fromEntries(
    Array.from({ length: sessionStorage.length }, (_, i) => sessionStorage.key(i)!)
      .filter((k) => k.startsWith('blendbench.unsaved.'))
      .map((k) => [k, sessionStorage.getItem(k)!]),
  );

/**
 * Hide the page (pagehide) and play a reload that comes at once: the saves under way when the page was
 * hidden never reach IndexedDB (the stored copies are put back as they were) and the leave copies
 * stay as written then.
 */
async function leaveAtOnce(m: { persistence: PersistenceModule }, before: Record<string, unknown>): Promise<Record<string, string>> {
  window.dispatchEvent(new Event('pagehide'));
  const copies = leaveCopies();
  // The save a hidden page queues after its blind puts (a 0 ms timer, run in order) is let run first.
  await new Promise<void>((r) => setTimeout(r, 0));
  await m.persistence.whenSaved();
  for (const [key, raw] of Object.entries(before)) await idbSet(key, raw, db());
  for (const [k, v] of Object.entries(copies)) sessionStorage.setItem(k, v);
  return copies;
}

async function storedNow(keys: string[]): Promise<Record<string, unknown>> {
  return Object.fromEntries(await Promise.all(keys.map(async (k) => [k, await idbGet(k, db())] as const)));
}

describe('a reload at once after an edit keeps the edit (s23 item 1)', () => {
  beforeEach(() => {
    globalThis.indexedDB = new IDBFactory();
    sessionStorage.clear();
  });
  afterEach(stopTab);

  it('a Stocks cell, a line-plan input, a QC entry and a setting committed just before the page left come back, are written through, and the copy is removed', async () => {
    let m = await reload();
    await m.persistence.whenSaved(); // the first start's demo is saved
    const before = await storedNow(['library', 'recipes', 'settings', 'workspace']);
    const recipeId = m.state.useRecipes.getState().recipes[0]!.id;
    m.state.libraryActions.updateComponent('demo-bw-190', { name: 'Renamed just before the reload' });
    m.state.linePlanActions.setPeriod('Week 49');
    m.state.recipeActions.setQcInputs(recipeId, { aimKv40: 301.5 });
    m.state.settingsActions.updateSettings({ temperatureUnit: 'F' });
    const copies = await leaveAtOnce(m, before);
    expect(Object.keys(copies).sort()).toEqual(['library', 'recipes', 'settings'].map(leaveCopyKey));

    m = await reload();
    expect(m.state.useLibrary.getState().components.find((c) => c.id === 'demo-bw-190')!.name).toBe('Renamed just before the reload');
    expect(m.state.useRecipes.getState().linePlan.period).toBe('Week 49');
    expect(m.state.useRecipes.getState().qc[recipeId]?.aimKv40).toBe(301.5);
    expect(m.state.useSettingsState.getState().settings.temperatureUnit).toBe('F');
    expect(leaveCopies()).toEqual({}); // removed once read
    await m.persistence.whenSaved(); // written through
    const lib = (await idbGet('library', db())) as { state: { components: Array<{ id: string; name: string }> } };
    expect(lib.state.components.find((c) => c.id === 'demo-bw-190')!.name).toBe('Renamed just before the reload');
    expect(((await idbGet('recipes', db())) as { state: { linePlan: { period: string } } }).state.linePlan.period).toBe('Week 49');
    // Loading is not an edit: nothing to undo.
    expect(m.state.useLibrary.temporal.getState().pastStates.length).toBe(0);
  });

  it('the designer’s draft, kept just before the page left, comes back under the tab’s key', async () => {
    let m = await reload();
    await m.persistence.whenSaved();
    const before = await storedNow(['workspace']);
    const key = m.state.ownDraftKey();
    const recipe = m.state.useRecipes.getState().recipes[0]!;
    const targets = m.state.useRecipes.getState().targets[recipe.id]!;
    m.state.useWorkspaceStore.getState().keepDraft(key, {
      targets,
      lines: recipe.lines,
      name: 'Draft left at once',
      sourceRecipeId: null,
      basedOn: null,
      basis: 'mass',
      rebalanceMode: 'balance',
      balanceId: null,
      dirty: true,
      keptAt: '2026-12-04T10:00:00.000Z',
    });
    await leaveAtOnce(m, before);
    expect(((await idbGet('workspace', db())) as { state: { drafts: object } }).state.drafts).toEqual({}); // the write was cut off
    m = await reload();
    expect(m.state.ownDraftKey()).toBe(key); // the same tab, the same key
    expect(m.state.useWorkspaceStore.getState().drafts[key]?.name).toBe('Draft left at once');
    await m.persistence.whenSaved();
    expect(((await idbGet('workspace', db())) as { state: { drafts: Record<string, { name: string }> } }).state.drafts[key]?.name).toBe(
      'Draft left at once',
    );
  });

  it('a copied record older than what IndexedDB holds (saved since, e.g. by another tab) is not taken, and the copy is removed', async () => {
    let m = await reload();
    await m.persistence.whenSaved();
    m.state.libraryActions.updateComponent('demo-bw-190', { name: 'First name' });
    window.dispatchEvent(new Event('pagehide'));
    const copies = leaveCopies();
    expect(Object.keys(copies)).toEqual([leaveCopyKey('library')]);
    await m.persistence.whenSaved();
    // Saved and hidden, not gone: the copy has done its part.
    expect(leaveCopies()).toEqual({});
    m.state.libraryActions.updateComponent('demo-bw-190', { name: 'Saved later' });
    await m.persistence.whenSaved();
    // A duplicated tab starts with a copy of this tab's sessionStorage, as it was.
    for (const [k, v] of Object.entries(copies)) sessionStorage.setItem(k, v);
    m = await reload();
    expect(m.state.useLibrary.getState().components.find((c) => c.id === 'demo-bw-190')!.name).toBe('Saved later');
    expect(leaveCopies()).toEqual({});
  });

  it('a copy the store’s schema refuses is not used (the stored copy is)', async () => {
    let m = await reload();
    await m.persistence.whenSaved();
    const stamp = `${String(Date.now() + 60_000).padStart(13, '0')}.zz.000000`;
    writeLeaveCopy('library', {
      version: m.state.STORE_VERSION.library,
      records: [{ key: 'components/demo-bw-190', stamp, value: { id: 'demo-bw-190', code: 5 }, after: null }],
    });
    m = await reload();
    expect(m.state.useLibrary.getState().components.find((c) => c.id === 'demo-bw-190')!.code).toBe('BW-190');
    expect(m.persistence.useStorageStatus.getState().stores.library.origin).toBe('stored');
    expect(leaveCopies()).toEqual({});
  });
});

describe('a first start whose first save a reload cut off (s24 item 1a)', () => {
  beforeEach(() => {
    globalThis.indexedDB = new IDBFactory();
    sessionStorage.clear();
  });
  afterEach(stopTab);

  it('marks a copy holding every record of the tab as whole, and only that one', () => {
    const mine = set(
      [
        ['components/a', { n: 'a' }],
        ['components/b', { n: 'b' }],
      ],
      { 'components/a': '1', 'components/b': '2' },
    );
    expect(pendingCopy(mine, { stamps: {}, gone: {} }, 3, null)?.whole).toBe(true);
    expect(pendingCopy(mine, { stamps: { 'components/a': '1' }, gone: {} }, 3, null)?.whole).toBeUndefined();
    // Written and read back with the mark; a mark of another form refuses the copy.
    writeLeaveCopy('library', pendingCopy(mine, { stamps: {}, gone: {} }, 3, null));
    expect(readLeaveCopy('library')?.whole).toBe(true);
    sessionStorage.setItem(leaveCopyKey('library'), '{"version":3,"records":[],"whole":"yes"}');
    expect(readLeaveCopy('library')).toBeNull();
  });

  it('an edit made before the demo was first saved, then a reload at once: the edit and the demo come back and are saved', async () => {
    let m = await reload(); // a first start: the demo is shown, its save under way
    m.state.libraryActions.updateComponent('demo-bw-190', { name: 'Renamed before the first save' });
    m.state.settingsActions.updateSettings({ temperatureUnit: 'F' });
    const demoCount = m.state.useLibrary.getState().components.length;
    // The reload comes at once: none of the first saves reached IndexedDB.
    window.dispatchEvent(new Event('pagehide'));
    const copies = leaveCopies();
    await new Promise<void>((r) => setTimeout(r, 0));
    await m.persistence.whenSaved();
    for (const key of ['library', 'recipes', 'settings', 'workspace']) await idbDel(key, db());
    for (const [k, v] of Object.entries(copies)) sessionStorage.setItem(k, v);
    expect(JSON.parse(copies[leaveCopyKey('library')]!).whole).toBe(true);

    m = await reload();
    const components = m.state.useLibrary.getState().components;
    expect(components.length).toBe(demoCount);
    expect(components.find((c) => c.id === 'demo-bw-190')!.name).toBe('Renamed before the first save');
    expect(m.state.useSettingsState.getState().settings.temperatureUnit).toBe('F');
    expect(leaveCopies()).toEqual({});
    await m.persistence.whenSaved();
    const lib = (await idbGet('library', db())) as { state: { components: Array<{ id: string; name: string }> } };
    expect(lib.state.components.length).toBe(demoCount);
    expect(lib.state.components.find((c) => c.id === 'demo-bw-190')!.name).toBe('Renamed before the first save');
  });

  it('a partial copy (records saved before) is not laid over an empty store: the start is a first start', async () => {
    let m = await reload();
    await m.persistence.whenSaved();
    m.state.libraryActions.updateComponent('demo-bw-190', { name: 'Edited after the first save' });
    window.dispatchEvent(new Event('pagehide'));
    const copies = leaveCopies();
    expect(JSON.parse(copies[leaveCopyKey('library')]!).whole).toBeUndefined();
    await m.persistence.whenSaved();
    await idbDel('library', db()); // the stored library gone (e.g. cleared) while the copy stayed
    for (const [k, v] of Object.entries(copies)) sessionStorage.setItem(k, v);
    m = await reload();
    // The demo as on a first start, not one stock laid over nothing.
    expect(m.state.useLibrary.getState().components.find((c) => c.id === 'demo-bw-190')!.name).not.toBe('Edited after the first save');
    expect(m.state.useLibrary.getState().components.length).toBeGreaterThan(1);
    expect(leaveCopies()).toEqual({});
  });
});

describe('a change too large for sessionStorage (s24 item 1c)', () => {
  beforeEach(() => {
    globalThis.indexedDB = new IDBFactory();
    sessionStorage.clear();
  });
  afterEach(() => {
    vi.restoreAllMocks();
    stopTab();
  });

  /** A store's leave copy as the page's leaving would write it now (written with room to spare, then removed). */
  function pendingCopyOf(store: string): unknown {
    window.dispatchEvent(new Event('pagehide'));
    const text = sessionStorage.getItem(leaveCopyKey(store));
    for (const k of Object.keys(leaveCopies())) sessionStorage.removeItem(k);
    return JSON.parse(text!);
  }

  /** sessionStorage holding at most `room` characters of leave copies, refusing more as a full browser store does. */
  function roomFor(room: number) {
    const real = Storage.prototype.setItem;
    return vi.spyOn(Storage.prototype, 'setItem').mockImplementation(function (this: Storage, key: string, value: string) {
      if (key.startsWith('blendbench.unsaved.')) {
        let used = 0;
        for (let i = 0; i < this.length; i++) {
          const k = this.key(i)!;
          if (k.startsWith('blendbench.unsaved.') && k !== key) used += this.getItem(k)!.length;
        }
        if (used + value.length > room) throw new DOMException('The quota has been exceeded.', 'QuotaExceededError');
      }
      return real.call(this, key, value);
    });
  }

  it('writes the smaller copies first and never throws; a copy that does not fit leaves no older copy behind', () => {
    const big: LeaveCopy = { version: 1, records: [{ key: 'components/x', stamp: '2', value: 'x'.repeat(5_000), after: null }] };
    const small: LeaveCopy = { version: 1, records: [{ key: 'settings', stamp: '3', value: { u: 'F' }, after: null }] };
    writeLeaveCopy('library', { version: 1, records: [{ key: 'components/x', stamp: '1', value: 'old', after: null }] });
    roomFor(2_000);
    const kept = writeLeaveCopies([
      ['library', big],
      ['settings', small],
    ]);
    expect([...kept]).toEqual(['settings']);
    expect(readLeaveCopy('settings')).toEqual(small);
    expect(readLeaveCopy('library')).toBeNull(); // the older copy is not taken at the next start
    // A value that cannot even be written out as text (a cycle) is not kept, and nothing throws.
    const cyclic: Record<string, unknown> = {};
    cyclic.self = cyclic;
    expect([...writeLeaveCopies([['recipes', { version: 1, records: [{ key: 'r', stamp: '4', value: cyclic, after: null }] }]])]).toEqual([]);
  });

  it('the page leaves without an error, the other stores are copied, and the IndexedDB writes are still made', async () => {
    let m = await reload();
    await m.persistence.whenSaved();
    const before = await storedNow(['library', 'recipes', 'settings', 'workspace']);
    const long = 'A long note. '.repeat(140);
    m.state.libraryActions.updateComponent('demo-bw-190', { notes: long });
    m.state.settingsActions.updateSettings({ temperatureUnit: 'F' });
    const settingsCopy = JSON.stringify(pendingCopyOf('settings')).length;
    expect(settingsCopy).toBeLessThan(long.length);
    roomFor(settingsCopy + 10); // room for the setting's copy, not for the library's
    const errors: unknown[] = [];
    const onError = (e: ErrorEvent) => errors.push(e.error);
    window.addEventListener('error', onError);
    const put = vi.spyOn(IDBObjectStore.prototype, 'put');
    try {
      window.dispatchEvent(new Event('pagehide'));
    } finally {
      window.removeEventListener('error', onError);
    }
    expect(errors).toEqual([]);
    expect(Object.keys(leaveCopies())).toEqual([leaveCopyKey('settings')]);
    // The library's save (started at its commit) still writes it.
    await new Promise<void>((r) => setTimeout(r, 0));
    await m.persistence.whenSaved();
    expect(put.mock.calls.some(([, key]) => key === 'library')).toBe(true);
    expect(before.library).not.toEqual(await idbGet('library', db()));
    vi.restoreAllMocks();
    m = await reload();
    expect(m.state.useLibrary.getState().components.find((c) => c.id === 'demo-bw-190')!.notes).toBe(long);
    expect(m.state.useSettingsState.getState().settings.temperatureUnit).toBe('F');
  });
});
