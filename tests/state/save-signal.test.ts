// @vitest-environment jsdom
// s23 item 2: the save queue says on the page's root element whether a save is under way
// (`data-save-state`) and how many commits reached the stores' storage (`data-save-commits`), so a
// test waits for "the edit was handled and nothing is being saved" instead of sleeping.
import 'fake-indexeddb/auto';
import { IDBFactory } from 'fake-indexeddb';
import { afterEach, describe, expect, it } from 'vitest';
import { createStore, get as idbGet, set as idbSet } from 'idb-keyval';
import { restartTab, stopTab } from '../helpers/settle';

const db = () => createStore('blendbench', 'saved-work');
const start = restartTab;
const signal = () => ({ state: document.documentElement.dataset.saveState, commits: Number(document.documentElement.dataset.saveCommits) });

describe('save-queue signal', () => {
  afterEach(stopTab);

  it('reads "saving" from a commit until its save has ended, then "idle"; every commit is counted', async () => {
    globalThis.indexedDB = new IDBFactory();
    const m = await start();
    await m.persistence.whenSaved();
    expect(signal().state).toBe('idle');
    const before = signal().commits;
    m.state.libraryActions.updateComponent('demo-bw-190', { name: 'Signalled' });
    expect(signal()).toEqual({ state: 'saving', commits: before + 1 });
    await m.persistence.whenSaved();
    expect(signal()).toEqual({ state: 'idle', commits: before + 1 });
  });

  it('an edit while saving is paused (an unusable stored copy) is counted and starts no save', async () => {
    globalThis.indexedDB = new IDBFactory();
    await idbSet('library', { state: { components: 'thick' }, version: 1 }, db());
    const m = await start();
    await m.persistence.whenSaved();
    expect(m.persistence.useStorageStatus.getState().stores.library.savingPaused).toBe(true);
    const before = signal().commits;
    m.state.libraryActions.updateComponent('demo-bw-190', { name: 'Not saved' });
    expect(signal()).toEqual({ state: 'idle', commits: before + 1 });
    expect(await idbGet('library', db())).toEqual({ state: { components: 'thick' }, version: 1 });
  });
});
