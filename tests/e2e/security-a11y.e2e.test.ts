// Security and accessibility of the built app (Chromium via playwright-core), issue 6 items 4–5:
// a strict Content-Security-Policy (no inline script, no eval) checked in the built index.html and by
// zero CSP violations while every screen is used; imported text is never rendered as HTML; axe-core
// finds no serious or critical violation on any screen; the main job (open demo → solve → explore →
// print) can be done with the keyboard alone; and no request leaves 127.0.0.1.
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { launch, screenshot, type Session, cellValue } from './support';
import { axeSerious } from './axe';

const BUILD_DIR = join(process.cwd(), `test-output/dist-${Number(process.env.E2E_PORT ?? 4319)}`);

/** Every screen of the navigation list (src/app/screens.ts) with its heading. */
const SCREENS = [
  { id: 'library', heading: 'Stocks' },
  { id: 'designer', heading: 'Recipe designer' },
  { id: 'explorer', heading: 'Substitute explorer' },
  { id: 'blend-sheet', heading: 'Blend sheet' },
  { id: 'settings', heading: 'Settings' },
] as const;

// Runs before the app: records CSP violations, and turns window.print into a counter.
const WATCH = `(() => {
  window.__cspViolations = [];
  document.addEventListener('securitypolicyviolation', (e) => {
    window.__cspViolations.push(e.violatedDirective + ' ' + (e.blockedURI || '') + ' ' + (e.sourceFile || '') + ':' + e.lineNumber);
  });
  window.__printCalls = 0;
  window.print = () => { window.__printCalls++; };
})();`;

const HOSTILE = '<img src=x onerror="window.__pwned=1">';
const HOSTILE_NOTE = '<script>window.__pwned=2</script><b>bold?</b>';

async function openScreen(page: Page, id: string, heading: string): Promise<void> {
  await page.goto(`${inject('baseURL')}#/${id}`);
  await page.getByRole('heading', { name: heading, level: 2 }).waitFor();
}

/**
 * Press Tab (or Shift+Tab) until the focused element has the given role and accessible name; fails
 * if it is not reached (each step polls briefly, so content that is still loading can appear).
 */
async function tabTo(page: Page, role: 'link' | 'button' | 'checkbox', name: RegExp, direction: 'forward' | 'back' = 'forward', timeoutMs = 30_000): Promise<void> {
  const start = Date.now();
  const seen: string[] = [];
  for (let i = 0; Date.now() - start < timeoutMs; i++) {
    const focused = await page.evaluate(() => {
      const el = document.activeElement as HTMLElement | null;
      if (!el || el === document.body) return null;
      const tag = el.tagName.toLowerCase();
      const type = (el as HTMLInputElement).type;
      const role = el.getAttribute('role') ?? (tag === 'a' ? 'link' : tag === 'button' ? 'button' : tag === 'input' && type === 'checkbox' ? 'checkbox' : tag);
      const name = (el.getAttribute('aria-label') ?? el.innerText ?? el.textContent ?? '').replace(/\s+/g, ' ').trim();
      return { role, name, disabled: (el as HTMLButtonElement).disabled === true };
    });
    if (focused && focused.role === role && name.test(focused.name) && !focused.disabled) return;
    if (focused) seen.push(`${focused.role} “${focused.name.slice(0, 40)}”`);
    // After a full lap with nothing found, wait for content still loading (no placeholder left).
    if (i > 0 && i % 150 === 0) await settled(page);
    await page.keyboard.press(direction === 'forward' ? 'Tab' : 'Shift+Tab');
  }
  throw new Error(`keyboard: no ${role} named ${name} reached by ${direction === 'forward' ? 'Tab' : 'Shift+Tab'}; last focused: ${seen.slice(-6).join(', ')}`);
}

/** Every lazily loaded part of the screen has arrived (no "Loading charts…" or "Opening …" placeholder left). */
async function settled(page: Page): Promise<void> {
  await expect.poll(() => page.locator('p.muted, p.loading').filter({ hasText: /^(Loading charts|Opening )/ }).count()).toBe(0);
}

const cspViolations = (page: Page) => page.evaluate(() => (window as unknown as { __cspViolations: string[] }).__cspViolations);

describe('security and accessibility', () => {
  let s: Session;
  const files = mkdtempSync(join(tmpdir(), 'blendbench-sec-'));
  const consoleCsp: string[] = [];
  beforeAll(async () => {
    s = await launch();
    await s.context.addInitScript(WATCH);
    s.context.on('console', (m) => {
      if (/Content Security Policy|Refused to/i.test(m.text())) consoleCsp.push(m.text());
    });
  });
  afterAll(async () => {
    await s?.close();
    rmSync(files, { recursive: true, force: true });
  });

  it('the built index.html carries a strict CSP and no inline script', () => {
    const html = readFileSync(join(BUILD_DIR, 'index.html'), 'utf8');
    const meta = /<meta\s+http-equiv="Content-Security-Policy"\s+content="([^"]+)"/i.exec(html);
    expect(meta, 'CSP meta element').not.toBeNull();
    const directives = new Map(
      meta![1]!
        .split(';')
        .map((d) => d.trim().split(/\s+/))
        .filter((d) => d[0])
        .map((d) => [d[0]!, d.slice(1)]),
    );
    expect(directives.get('default-src')).toEqual(["'self'"]);
    expect(directives.get('script-src')).toEqual(["'self'"]);
    expect(directives.get('object-src')).toEqual(["'none'"]);
    expect(directives.get('base-uri')).toEqual(["'none'"]);
    expect(directives.get('connect-src')).toEqual(["'self'"]);
    expect(meta![1]).not.toMatch(/unsafe-eval|wasm-unsafe-eval|https?:|\*/);
    for (const d of ['script-src', 'default-src', 'worker-src']) expect(directives.get(d) ?? []).not.toContain("'unsafe-inline'");
    // Every script element loads a file of our own; none has inline code or an inline handler.
    for (const m of html.matchAll(/<script\b([^>]*)>([\s\S]*?)<\/script>/gi)) {
      expect(m[1]).toMatch(/\bsrc="\.\/assets\/[^"]+\.js"/);
      expect(m[2]!.trim()).toBe('');
    }
    expect(html).not.toMatch(/\son[a-z]+\s*=/i);
  });

  it('every screen: no serious or critical axe violation, no CSP violation', async () => {
    const { page } = s;
    const found: string[] = [];
    for (const sc of SCREENS) {
      await openScreen(page, sc.id, sc.heading);
      await settled(page); // lazy charts drawn
      for (const v of await axeSerious(page)) found.push(`${sc.id}: ${v}`);
      await screenshot(page, `a11y-${sc.id}`);
    }
    expect(found).toEqual([]);
    expect(await cspViolations(page)).toEqual([]);
  });

  it('imported text is shown as text, never as HTML', async () => {
    const { page } = s;
    await openScreen(page, 'library', 'Stocks');
    const csv = [
      'code,name,category,kv40_mm2s,kv100_mm2s,density15_kg_per_l,price,notes',
      `XSS-1,"${HOSTILE.replace(/"/g, '""')}",group-ii,45,6.6,0.862,1.1,"${HOSTILE_NOTE}"`,
    ].join('\n');
    const file = join(files, 'hostile.csv');
    writeFileSync(file, csv);
    await page.getByRole('button', { name: 'Import CSV / JSON…' }).click();
    await page.getByLabel('File', { exact: true }).setInputFiles(file);
    await page.getByText('hostile.csv is valid.').waitFor();
    // In the preview (which must be accessible too) …
    await expect.poll(() => page.getByText(HOSTILE, { exact: true }).count()).toBeGreaterThan(0);
    expect(await axeSerious(page), 'import preview').toEqual([]);
    await page.getByRole('button', { name: 'Import: add 1, update 0' }).click();
    // … and in the library table, the name is literal text in a field.
    await expect.poll(() => cellValue(page, 'Name of XSS-1', { exact: true })).toBe(HOSTILE);
    // Visit every screen with the hostile stock in the library.
    for (const sc of SCREENS) {
      await openScreen(page, sc.id, sc.heading);
      await settled(page);
      expect(await page.locator('img[src="x"], main script, main b').count(), sc.id).toBe(0);
    }
    expect(await page.evaluate(() => (window as { __pwned?: unknown }).__pwned)).toBeUndefined();
    expect(await cspViolations(page)).toEqual([]);
  });

  it('keyboard only: open the demo, solve, explore, adopt and print (Tab, Shift+Tab, Enter, Space)', async () => {
    // A fresh profile, so the demo is what the first start shows.
    const k = await launch();
    try {
      await k.context.addInitScript(WATCH);
      const page = k.page;
      await page.goto(inject('baseURL'));
      await page.getByRole('heading', { name: 'Stocks', level: 2 }).waitFor();
      await expect.poll(() => page.getByText(/invented demo/i).first().isVisible()).toBe(true);

      await tabTo(page, 'link', /^Recipe designer/);
      await page.keyboard.press('Enter');
      await page.getByRole('heading', { name: 'Recipe designer', level: 2 }).waitFor();
      await tabTo(page, 'button', /^Solve$/);
      await page.keyboard.press('Enter');
      await page.getByRole('status').filter({ hasText: 'Solved' }).waitFor();
      expect(await axeSerious(page), 'designer after solving').toEqual([]);
      await screenshot(page, 'keyboard-designer-solved');

      await tabTo(page, 'link', /^Substitute explorer/, 'back');
      await page.keyboard.press('Enter');
      await page.getByRole('heading', { name: 'Substitute explorer', level: 2 }).waitFor();
      await tabTo(page, 'checkbox', /^Treat BW-190 as withdrawn$/);
      await page.keyboard.press('Space');
      await expect.poll(() => page.getByLabel('Treat BW-190 as withdrawn').isChecked()).toBe(true);
      await tabTo(page, 'button', /^Run search$/);
      await page.keyboard.press('Enter');
      // ranked candidates stream in while the search runs; go on once it has ended
      await page.locator('.run-status[data-status="done"]').waitFor({ timeout: 60_000 });
      await tabTo(page, 'button', /^compar(e|ing) candidate 1$/, 'forward', 60_000);
      await page.keyboard.press('Enter');
      await tabTo(page, 'button', /^Adopt as a new recipe$/);
      await page.keyboard.press('Enter');
      await page.getByRole('button', { name: 'Adopted' }).waitFor();
      expect(await axeSerious(page), 'explorer with results').toEqual([]);
      await screenshot(page, 'keyboard-explorer-adopted');

      await tabTo(page, 'link', /^Blend sheet/, 'back');
      await page.keyboard.press('Enter');
      await page.getByRole('heading', { name: 'Blend sheet', level: 2 }).waitFor();
      await tabTo(page, 'button', /^Print/);
      await page.keyboard.press('Enter');
      await expect.poll(() => page.evaluate(() => (window as unknown as { __printCalls: number }).__printCalls)).toBe(1);
      expect(await axeSerious(page), 'blend sheet').toEqual([]);
      await screenshot(page, 'keyboard-blend-sheet');

      expect(await cspViolations(page)).toEqual([]);
      expect(k.errors).toEqual([]);
      expect(k.offHost).toEqual([]);
    } finally {
      await k.close();
    }
  });

  it('no CSP violation and no request off 127.0.0.1 over the whole session', () => {
    expect(consoleCsp).toEqual([]);
    expect(s.offHost).toEqual([]);
  });
});
