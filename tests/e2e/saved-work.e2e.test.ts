// Saved work in the built app (Chromium via playwright-core), issue 10 items 1–6: a library of 20,000
// stocks imports off the main thread with progress and survives a reload.
import { afterEach, describe, expect, inject, it } from 'vitest';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { launch, screenshot, type Session, cellValue, editCell } from './support';
import { largeLibraryCsv } from '../helpers/large-library';

/** Number of stocks in the saved library, counted inside the page (the record is megabytes). */
async function storedStockCount(page: Page): Promise<number | null> {
  return page.evaluate(
    () =>
      new Promise<number | null>((resolve, reject) => {
        const open = indexedDB.open('blendbench');
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const req = open.result.transaction('saved-work', 'readonly').objectStore('saved-work').get('library');
          req.onsuccess = () => {
            resolve((req.result as { state?: { components?: unknown[] } } | undefined)?.state?.components?.length ?? null);
            open.result.close();
          };
          req.onerror = () => reject(req.error);
        };
      }),
  );
}

/** Codes and names of the saved stocks, read inside the page. */
async function storedNames(page: Page): Promise<Array<{ code: string; name: string }>> {
  return page.evaluate(
    () =>
      new Promise<Array<{ code: string; name: string }>>((resolve, reject) => {
        const open = indexedDB.open('blendbench');
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const req = open.result.transaction('saved-work', 'readonly').objectStore('saved-work').get('library');
          req.onsuccess = () => {
            const comps = (req.result as { state: { components: Array<{ code: string; name: string }> } }).state.components;
            resolve(comps.map((c) => ({ code: c.code, name: c.name })));
            open.result.close();
          };
          req.onerror = () => reject(req.error);
        };
      }),
  );
}

/** The name every drawn Stocks row shows (its field's value, or its text while drawn as text), read in one call. */
async function shownNames(page: Page): Promise<string[]> {
  return page.evaluate(() =>
    Array.from(document.querySelectorAll('[aria-label^="Name of "]'))
      .filter((el) => !(el.parentElement?.closest('[aria-label^="Name of "]')))
      .map((el) =>
        el instanceof HTMLInputElement || el instanceof HTMLTextAreaElement ? el.value : (el.firstElementChild?.textContent ?? el.textContent ?? ''),
      ),
  );
}

async function openLibrary(page: Page): Promise<void> {
  await page.goto(`${inject('baseURL')}#/library`);
  await page.getByRole('heading', { name: 'Stocks' }).waitFor();
}

const files = mkdtempSync(join(tmpdir(), 'blendbench-saved-work-'));

describe('saved work', () => {
  let s: Session | null = null;
  afterEach(async () => {
    await s?.close();
    s = null;
  });

  it('a library of 20,000 stocks imports with progress (page responsive), saves, and is there after a reload (item 2)', async () => {
    s = await launch();
    const { page } = s;
    await openLibrary(page);
    // Show only one of the stocks to come: drawing 20,000 editable rows is the Stocks table's own
    // speed question (issue 9), not this one's.
    await page.getByPlaceholder('code or name').fill('LG-20000');
    const file = join(files, 'plant-20000.csv');
    writeFileSync(file, largeLibraryCsv(20_000)); // invented stocks LG-00001 … LG-20000
    await page.getByRole('button', { name: 'Import CSV / JSON…' }).click();
    await page.getByLabel('File', { exact: true }).setInputFiles(file);
    // The check runs off the page's main thread (a Web Worker): the page answers while it runs, and
    // shows how far it is — timers set one after the other keep firing while the bar moves on (a check
    // holding the main thread would let no timer fire between two steps of the bar). How fast the page
    // answers is a benchmark's question, not a test's: no time is asserted.
    await page.getByRole('progressbar').waitFor();
    const stepsSeenByTimers = await page.evaluate(
      () =>
        new Promise<number>((resolve) => {
          const seen = new Set<number>();
          const tick = () => {
            const bar = document.querySelector('progress');
            if (!bar) return resolve(seen.size);
            seen.add(bar.value);
            if (seen.size >= 2) return resolve(seen.size);
            setTimeout(tick, 0);
          };
          tick();
        }),
    );
    expect(stepsSeenByTimers).toBeGreaterThanOrEqual(2);
    await page.getByText('plant-20000.csv is valid.').waitFor({ timeout: 90_000 });
    await screenshot(page, 'saved-work-import-20000');
    await page.getByRole('button', { name: 'Import: add 20000, update 0' }).click();
    await expect.poll(() => storedStockCount(page), { timeout: 90_000 }).toBe(20_029); // 20,000 imported + the 29 invented demo stocks
    await page.getByLabel('Stock code of Invented stock 20000').waitFor();
    // A reload reads all 20,029 back (on Settings, whose backup section counts the stocks).
    await page.goto(`${inject('baseURL')}#/settings`);
    await page.reload();
    await page.getByRole('heading', { name: 'Settings' }).waitFor({ timeout: 90_000 });
    expect(await page.getByText(/was not loaded/).count()).toBe(0);
    expect(await storedStockCount(page)).toBe(20_029);
    expect(s.offHost).toEqual([]);
    expect(s.errors).toEqual([]);
  }, 240_000);
});

describe('a reload at once after an entry (s23 item 1)', () => {
  let s: Session | null = null;
  afterEach(async () => {
    await s?.close();
    s = null;
  });

  it('a Stocks cell and a line-plan input committed just before a reload are there after it, and saved', async () => {
    s = await launch();
    const page = s.page;
    await openLibrary(page);
    await expect.poll(() => storedStockCount(page)).toBe(29); // the invented demo is saved
    const field = await editCell(page, 'Name of BW-190', { exact: true });
    await field.fill('Renamed just before the reload');
    await field.press('Enter');
    await page.reload(); // at once: no wait for the save
    await page.getByRole('heading', { name: 'Stocks' }).waitFor();
    await expect.poll(() => cellValue(page, 'Name of BW-190', { exact: true })).toBe('Renamed just before the reload');
    await expect.poll(async () => (await storedNames(page)).find((c) => c.code === 'BW-190')?.name).toBe('Renamed just before the reload');

    await page.goto(`${inject('baseURL')}#/line-plan`);
    await page.getByRole('heading', { name: 'Whole-line plan', level: 2 }).waitFor();
    const supply = page.getByLabel('Supply of BW-190');
    await supply.fill('250');
    await supply.press('Enter');
    await page.reload(); // at once
    await page.getByRole('heading', { name: 'Whole-line plan', level: 2 }).waitFor();
    await expect.poll(() => page.getByLabel('Supply of BW-190').inputValue()).toBe('250');
    await expect.poll(() => page.evaluate(() => Object.keys(sessionStorage).filter((k) => k.startsWith('blendbench.unsaved.')))).toEqual([]);
    expect(s.offHost).toEqual([]);
    expect(s.errors).toEqual([]);
  });
});

describe('two tabs (item 4)', () => {
  let s: Session | null = null;
  afterEach(async () => {
    await s?.close();
    s = null;
  });

  /**
   * Rename a stock in its Stocks cell as typing does — the cell opened by a click, the name put in its
   * field with an input event, committed with Enter — in one call into the page (s23 item 4: five
   * round trips per edit made the test slow on a loaded machine; what it checks is the same).
   */
  async function rename(page: Page, code: string, name: string): Promise<void> {
    await page.evaluate(
      async ([label, value]) => {
        const cell = () => Array.from(document.querySelectorAll<HTMLElement>('[aria-label]')).find((el) => el.getAttribute('aria-label') === label);
        const field = () => {
          const c = cell();
          return c instanceof HTMLInputElement || c instanceof HTMLTextAreaElement ? c : (c?.parentElement?.querySelector<HTMLInputElement | HTMLTextAreaElement>('input, textarea') ?? null);
        };
        // A click on the text draws the field in its place (at once, unless a render from the other
        // tab's save comes between): click until it is there, checked each task.
        let input = field();
        for (let i = 0; !input; i++) {
          if (i > 1000) throw new Error(`no field for ${label}`);
          cell()?.click();
          input = field() ?? (await new Promise<null>((r) => setTimeout(() => r(null), 0))) ?? field();
        }
        input.focus();
        Object.getOwnPropertyDescriptor(Object.getPrototypeOf(input) as object, 'value')!.set!.call(input, value);
        input.dispatchEvent(new Event('input', { bubbles: true }));
        input.dispatchEvent(new KeyboardEvent('keydown', { key: 'Enter', bubbles: true, cancelable: true }));
      },
      [`Name of ${code}`, name] as const,
    );
  }

  it('40 edits committed in two tabs within milliseconds, interleaved, are all there after a reload, in both', async () => {
    s = await launch();
    const a = s.page;
    await openLibrary(a);
    await expect.poll(() => storedStockCount(a)).toBe(29); // the invented demo is saved
    const b = await s.newPage();
    await openLibrary(b);
    const codes = (await storedNames(a)).map((c) => c.code);
    expect(codes.length).toBe(29);
    const aCodes = codes.slice(0, 20);
    const bCodes = codes.slice(20); // 9 stocks renamed in tab B, and 11 clones made there
    // Each round fires one edit in each tab at the same moment.
    for (let i = 0; i < 20; i++) {
      await Promise.all([
        rename(a, aCodes[i]!, `Tab A name ${i}`),
        i < bCodes.length ? rename(b, bCodes[i]!, `Tab B name ${i}`) : b.getByRole('button', { name: `Clone ${bCodes[i % bCodes.length]}` }).first().click(),
      ]);
    }
    await screenshot(b, 'saved-work-two-tabs');
    // After both tabs have saved and heard of each other's saves, a reload of each shows all 40.
    await expect.poll(() => storedStockCount(a)).toBe(29 + 11);
    const allSaved = async () => {
      const names = new Set((await storedNames(a)).map((c) => c.name));
      return aCodes.every((_, i) => names.has(`Tab A name ${i}`)) && bCodes.every((_, i) => names.has(`Tab B name ${i}`));
    };
    await expect.poll(allSaved).toBe(true);
    for (const page of [a, b]) {
      await page.reload();
      await page.getByRole('heading', { name: 'Stocks' }).waitFor();
      // Every stock's name as the table shows it, read in one go once all 40 rows are drawn.
      let shown: string[] = [];
      await expect.poll(async () => (shown = await shownNames(page)).length).toBe(29 + 11);
      for (let i = 0; i < 20; i++) expect(shown).toContain(`Tab A name ${i}`);
      for (let i = 0; i < bCodes.length; i++) expect(shown).toContain(`Tab B name ${i}`);
      expect(shown.length).toBe(29 + 11); // 11 clones made in tab B (a count)
    }
    expect(s.offHost).toEqual([]);
    expect(s.errors).toEqual([]);
  });
});

process.on('exit', () => rmSync(files, { recursive: true, force: true }));
