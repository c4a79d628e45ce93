// Shared helpers for end-to-end tests: Debian chromium via playwright-core, a fresh profile per
// launch, a guard that records every request leaving 127.0.0.1 and every console error.
import { expect } from 'vitest';
import { chromium, type BrowserContext, type Locator, type Page } from 'playwright-core';
import { mkdtempSync, mkdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

export const SCREEN_DIR = join(process.cwd(), 'test-output', 'screens');
mkdirSync(SCREEN_DIR, { recursive: true });

export interface Session {
  context: BrowserContext;
  page: Page;
  /** URLs of requests that tried to leave 127.0.0.1 (must stay empty). */
  offHost: string[];
  /** Console errors and uncaught page errors (must stay empty). */
  errors: string[];
  /** Open a further tab in the same profile, with the same guards. */
  newPage(): Promise<Page>;
  close(): Promise<void>;
}

function isLocal(url: string): boolean {
  if (url.startsWith('data:') || url.startsWith('blob:') || url.startsWith('about:')) return true;
  try {
    const u = new URL(url);
    return u.hostname === '127.0.0.1';
  } catch {
    return false;
  }
}

export async function launch(opts: { profileDir?: string; keepProfile?: boolean } = {}): Promise<Session> {
  const dir = opts.profileDir ?? mkdtempSync(join(tmpdir(), 'blendbench-profile-'));
  const context = await chromium.launchPersistentContext(dir, {
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    headless: true,
    viewport: { width: 1400, height: 900 },
    acceptDownloads: true,
    args: [
      '--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run',
      '--disable-background-networking', '--disable-component-update', '--disable-sync',
    ],
  });
  const offHost: string[] = [];
  const errors: string[] = [];
  const guard = (page: Page) => {
    page.on('request', (req) => {
      if (!isLocal(req.url())) offHost.push(req.url());
    });
    page.on('console', (msg) => {
      if (msg.type() === 'error') errors.push(msg.text());
    });
    page.on('pageerror', (err) => errors.push(String(err)));
  };
  // Block anything off-host at the network layer too, so a stray request cannot leave the machine.
  await context.route((url) => !isLocal(url.toString()), (route) => {
    offHost.push(route.request().url());
    return route.abort();
  });
  context.on('page', guard);
  const existing = context.pages();
  for (const p of existing) guard(p);
  const page = existing[0] ?? (await context.newPage());
  return {
    context,
    page,
    offHost,
    errors,
    newPage: () => context.newPage(),
    async close() {
      await context.close();
      if (!opts.keepProfile && !opts.profileDir) rmSync(dir, { recursive: true, force: true });
    },
  };
}

export async function screenshot(page: Page, name: string): Promise<void> {
  await page.screenshot({ path: join(SCREEN_DIR, `${name}.png`), fullPage: true });
}

/** One saved-work record, read straight from Blendbench's IndexedDB (database `blendbench`, store `saved-work`). */
export async function stored(page: Page, key: string): Promise<unknown> {
  return page.evaluate(
    (k) =>
      new Promise((resolve, reject) => {
        const open = indexedDB.open('blendbench');
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const db = open.result;
          const req = db.transaction('saved-work', 'readonly').objectStore('saved-work').get(k);
          req.onsuccess = () => {
            resolve(req.result);
            db.close();
          };
          req.onerror = () => reject(req.error);
        };
      }),
    key,
  );
}

/**
 * The field of a Stocks cell, found by its label (the table draws its cells as text until edited,
 * components/fields.tsx `textUntilEdited`): a cell still drawn as text is activated — clicked, or
 * Enter for a choice (a click also opens its list) — and its input, textarea or select is returned.
 */
export async function editCell(page: Page, label: string | RegExp, opts: { exact?: boolean } = {}): Promise<Locator> {
  const cell = page.getByLabel(label, opts);
  const kind = await cell.evaluate((el) => (el.matches('input, textarea, select') ? 'field' : el.getAttribute('role')));
  if (kind === 'combobox') await cell.press('Enter');
  else if (kind !== 'field') await cell.click();
  const field = page.getByLabel(label, opts).and(page.locator('input, textarea, select'));
  await field.waitFor();
  return field;
}

/** The value a Stocks cell shows, found by its label: its field's value, or its text while drawn as text. */
export async function cellValue(page: Page, label: string | RegExp, opts: { exact?: boolean } = {}): Promise<string> {
  return page
    .getByLabel(label, opts)
    .evaluate((el) =>
      el instanceof HTMLInputElement || el instanceof HTMLTextAreaElement || el instanceof HTMLSelectElement
        ? el.value
        : (el.firstElementChild?.textContent ?? el.textContent ?? ''),
    );
}

/** The save queue's signal on the page's root element (src/state/persistence.ts `markSaves`). */
export async function saveSignal(page: Page): Promise<{ state: string | null; commits: number }> {
  return page.evaluate(() => ({
    state: document.documentElement.dataset.saveState ?? null,
    commits: Number(document.documentElement.dataset.saveCommits ?? 0),
  }));
}

/**
 * Wait until an edit made after `before` (a `saveSignal(page).commits`) has reached the stores' storage
 * — where a save is asked for — and no save is under way: what is stored now is what that edit left.
 */
export async function savesSettled(page: Page, before: number): Promise<void> {
  await expect
    .poll(async () => {
      const now = await saveSignal(page);
      return now.commits > before && now.state === 'idle';
    })
    .toBe(true);
}
