/**
 * Designer "tabs" for jsdom tests (s21 item 1, s22 item 2): each tab is a fresh instance of the app's
 * modules over one IndexedDB (the test installs fake-indexeddb), with its own sessionStorage draft key,
 * showing the designer screen. The test file imports 'fake-indexeddb/auto' and runs in jsdom.
 */
import { IDBFactory } from 'fake-indexeddb';
import { afterEach, beforeEach, vi } from 'vitest';
import { act, cleanup, render, within } from '@testing-library/react';
import { settleTabs } from './settle';

/** The sessionStorage key holding a tab's draft key (src/state/tab-draft.ts). */
export const DRAFT_KEY = 'blendbench.draft-key';

export interface DesignerTab {
  state: typeof import('../../src/state');
  persistence: typeof import('../../src/state/persistence');
  designer: typeof import('../../src/features/designer/store').useDesignerStore;
  /** The tab's draft key as it opened. */
  key: string;
  view: ReturnType<typeof within>;
  close(): Promise<void>;
}

const open: DesignerTab[] = [];

/** Open a tab (a new one, or a reload of the tab whose draft key is `key`) on the designer. */
export async function openDesignerTab(key?: string): Promise<DesignerTab> {
  if (key) sessionStorage.setItem(DRAFT_KEY, key);
  else sessionStorage.removeItem(DRAFT_KEY);
  vi.resetModules();
  const state = await import('../../src/state');
  const persistence = await import('../../src/state/persistence');
  const { useDesignerStore } = await import('../../src/features/designer/store');
  const { default: DesignerScreen } = await import('../../src/features/designer/DesignerScreen');
  await state.startSavedWork({ requestPersistence: false });
  const host = document.createElement('div');
  document.body.appendChild(host);
  const r = render(<DesignerScreen />, { container: host });
  const tab: DesignerTab = {
    state,
    persistence,
    designer: useDesignerStore,
    key: state.ownDraftKey(),
    view: within(host),
    async close() {
      await persistence.whenSaved(); // as the page leaves, its pending draft is written
      r.unmount();
      host.remove();
      state.resetStartForTests();
      open.splice(open.indexOf(tab), 1);
    },
  };
  open.push(tab);
  return tab;
}

/** Close every tab still open (afterEach). */
export async function closeDesignerTabs(): Promise<void> {
  for (const t of [...open]) await t.close();
}

/** Each test starts on an empty IndexedDB and sessionStorage; its tabs are closed (and mocks restored) after it. */
export function designerTabHooks(): void {
  beforeEach(() => {
    globalThis.indexedDB = new IDBFactory();
    sessionStorage.clear();
  });
  afterEach(async () => {
    await closeDesignerTabs();
    cleanup();
    vi.restoreAllMocks();
  });
}

/** Every open tab has saved and heard of the others' saves. */
export async function settleDesignerTabs(): Promise<void> {
  await settleTabs(open);
}

/** An invented hand edit of the first share of a tab's draft (by `delta`, a mass fraction), and a name for it. */
export function editDraft(t: DesignerTab, name: string, delta: number): void {
  const first = t.designer.getState().lines.find((l) => l.massFraction > 0.1)!;
  act(() => {
    t.designer.getState().editLine(first.componentId, first.massFraction + delta, () => 0.9);
    t.designer.getState().setName(name);
  });
}
