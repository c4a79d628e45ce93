// Seeding saved work for end-to-end tests: records of Blendbench's IndexedDB (database `blendbench`,
// store `saved-work`) read, changed by the test, and written back without a save of the app's lost or
// overwriting them in between.
import { expect } from 'vitest';
import type { Page } from 'playwright-core';
import { stored } from './support';
import { demoComponentId } from '../../src/state/demo';

/**
 * Rewrites saved-work records for a test. Waits until the app has written every one of `keys` (on a
 * first start the demo is written a moment after the screen is drawn), reads them, hands them to `edit`
 * (which changes them in place, in the test's own code), and writes back what `edit` left — in one
 * transaction that first checks that none of them changed since it was read; if a save of the app's
 * came in between, they are read and edited again. Load the page anew afterwards for the app to use them.
 */
export async function editSaved<T extends Record<string, unknown>>(page: Page, keys: readonly (keyof T & string)[], edit: (records: T) => void): Promise<void> {
  await expect.poll(async () => (await Promise.all(keys.map((k) => stored(page, k)))).every((r) => r != null)).toBe(true);
  for (let attempt = 0; attempt < 10; attempt++) {
    const read = (await page.evaluate(transact, { keys, write: null })) as Record<string, { value: unknown; json: string }>;
    const records = Object.fromEntries(keys.map((k) => [k, read[k]!.value])) as T;
    edit(records);
    const write = { seen: Object.fromEntries(keys.map((k) => [k, read[k]!.json])), next: records as Record<string, unknown> };
    if (await page.evaluate(transact, { keys, write })) return;
  }
  throw new Error(`editSaved: the app kept saving ${keys.join(', ')} while the test wrote them`);
}

/**
 * Run in the page (page.evaluate sends its source: it refers to nothing outside itself). One transaction
 * on `saved-work`: without `write`, reads `keys`, each record with its JSON (to tell later whether it
 * changed); with it, puts `write.next` under every key only if each stored record's JSON is still
 * `write.seen`'s, and says whether it did.
 */
async function transact({ keys, write }: { keys: readonly string[]; write: { seen: Record<string, string>; next: Record<string, unknown> } | null }) {
  const db = await new Promise<IDBDatabase>((res, rej) => {
    const r = indexedDB.open('blendbench');
    r.onsuccess = () => res(r.result);
    r.onerror = () => rej(r.error);
  });
  const tx = db.transaction('saved-work', 'readwrite');
  const store = tx.objectStore('saved-work');
  const done = new Promise<void>((res, rej) => {
    tx.oncomplete = () => res();
    tx.onabort = () => rej(tx.error);
  });
  const read: Record<string, { value: unknown; json: string }> = {};
  let left = keys.length;
  let wrote = false;
  for (const k of keys) {
    const req = store.get(k);
    req.onsuccess = () => {
      read[k] = { value: req.result, json: JSON.stringify(req.result) };
      if (--left > 0 || !write) return;
      // Every record read in this transaction: written only if none changed since the test read it.
      if (keys.every((key) => read[key]!.json === write.seen[key])) {
        for (const key of keys) store.put(write.next[key], key);
        wrote = true;
      }
    };
  }
  await done;
  db.close();
  return write ? wrote : read;
}

/**
 * The twelve-component recipe of the blend sheet tests (invented demo stocks, charged in this order):
 * fractions chosen to land near the VG 320 mid-point (predicted ν40 ≈ 311 mm²/s by the app's own
 * Refutas prediction).
 */
export const TWELVE = {
  codes: ['BW-281', 'BW-190', 'BW-441', 'BW-240', 'BW-241', 'BW-221', 'BW-307', 'BW-407', 'BW-606', 'BW-621', 'BW-510', 'BW-901'],
  fractions: [0.36, 0.3, 0.15, 0.02, 0.02, 0.02, 0.02, 0.02, 0.03, 0.02, 0.02, 0.02],
} as const;

/**
 * A saved recipe record as the app stores it: approved revision 1, without a specification or stock
 * basis, its lines the demo stocks `codes` at `fractions` (mass fractions).
 */
export function seededRecipe(r: { id: string; name: string; grade: number; codes: readonly string[]; fractions: readonly number[] }) {
  return {
    id: r.id,
    name: r.name,
    grade: r.grade,
    lines: r.codes.map((c, i) => ({ componentId: demoComponentId(c), massFraction: r.fractions[i]! })),
    revision: 1,
    isReference: false,
    notes: 'Seeded by the end-to-end test.',
    updatedAt: '2025-06-01T08:00:00.000Z',
    status: 'approved',
    approvedAt: '2025-06-01T08:00:00.000Z',
    archived: false,
    supersedes: null,
    reasonForChange: '',
    specification: {
      grade: null, reference: '', kv100Min: null, kv100Max: null, viMin: null, density15Min: null, density15Max: null,
      flashMin: null, pourMax: null, copper: '', foam: '',
    },
    stockBasis: null,
  };
}
