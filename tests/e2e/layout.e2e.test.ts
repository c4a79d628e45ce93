// Layout from 1024 to 2560 px (issue 10, item 18): every screen at 1024, 1440, 1920 and 2560 px wide,
// with screenshots in test-output/screens/layout-<screen>-<width>.png. Checks: the page never scrolls
// sideways; the Stocks row actions and the designer's share inputs can be reached (inside the window
// or inside their own scrolling box); stock names are read whole without hovering (the Stocks
// table's name fields wrap to their lines; the designer's and explorer's names are not clipped); on
// wide windows the tables use the width.
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { Locator, Page } from 'playwright-core';
import { launch, screenshot, type Session, cellValue, editCell } from './support';

const WIDTHS = [1024, 1440, 1920, 2560] as const;

/** The page does not scroll sideways. */
async function noSidewaysScroll(page: Page): Promise<void> {
  const [scroll, inner] = await page.evaluate(() => [document.documentElement.scrollWidth, window.innerWidth]);
  expect(scroll, 'page scrolls sideways').toBeLessThanOrEqual(inner + 1);
}

/** A table's own box does not scroll sideways either: every column is in view. */
async function fitsItsBox(page: Page, selector: string): Promise<void> {
  const [scroll, client] = await page.$eval(selector, (el) => [el.scrollWidth, el.clientWidth]);
  expect(scroll, `${selector} scrolls sideways`).toBeLessThanOrEqual(client + 1);
}

/**
 * The element can be reached: scrolled into view (the page or its own scrolling box), it lies inside
 * the window and inside every box that clips it.
 */
async function reachable(el: Locator, what: string): Promise<void> {
  await el.scrollIntoViewIfNeeded();
  const ok = await el.evaluate((node) => {
    const r = node.getBoundingClientRect();
    if (r.width === 0 || r.height === 0) return 'not shown';
    if (r.left < -1 || r.right > window.innerWidth + 1 || r.top < -1 || r.bottom > window.innerHeight + 1) return `outside the window (${Math.round(r.left)}–${Math.round(r.right)} of ${window.innerWidth})`;
    for (let p = node.parentElement; p; p = p.parentElement) {
      const st = getComputedStyle(p);
      if (st.overflowX === 'visible' && st.overflowY === 'visible') continue;
      const b = p.getBoundingClientRect();
      if (r.left < b.left - 1 || r.right > b.right + 1) return `clipped by ${p.className || p.tagName}`;
    }
    return 'ok';
  });
  expect(ok, what).toBe('ok');
}

/** Recipe register cells (grade "VG 320", saved date "2025-03-01") broken over more than one line. */
async function brokenRegisterCells(page: Page): Promise<string[]> {
  return page.$$eval('.recipes-table tbody tr', (rows) =>
    rows.flatMap((tr) =>
      [tr.children[1], tr.children[5]].filter((td): td is Element => Boolean(td)).flatMap((td) => {
        const range = document.createRange();
        range.selectNodeContents(td);
        const tops = new Set([...range.getClientRects()].map((r) => Math.round(r.top)));
        return tops.size > 1 ? [td.textContent ?? ''] : [];
      }),
    ),
  );
}

/**
 * Every stock name in the Stocks table is read whole without hovering: its field neither scrolls
 * sideways nor down (it wraps and grows to its lines). Returns the names checked.
 */
async function namesWhole(page: Page): Promise<string[]> {
  // A name is drawn as text until edited (fields.tsx `textUntilEdited`), as a textarea while edited.
  const fields = await page.$$eval('.library-table tbody td.name-cell textarea, .library-table tbody td.name-cell .cell-text', (els) =>
    els.map((e) => ({ name: e instanceof HTMLTextAreaElement ? e.value : e.textContent, cut: e.scrollWidth > e.clientWidth + 1 || e.scrollHeight > e.clientHeight + 1 })),
  );
  expect(fields.filter((f) => f.cut).map((f) => f.name), 'stock names cut off in their field').toEqual([]);
  return fields.map((f) => f.name);
}

/**
 * Text showing stock names (a table's row headers, a list's labels) is whole: no element scrolls
 * its text away, and no box clips it. Returns how many were checked.
 */
async function textWhole(page: Page, selector: string, what: string): Promise<number> {
  const cut = await page.$$eval(selector, (els) =>
    els
      .filter((node) => {
        const r = node.getBoundingClientRect();
        if (r.width === 0 && r.height === 0) return false; // not shown (a closed list)
        if (node.scrollWidth > node.clientWidth + 1) return true;
        for (let p = node.parentElement; p; p = p.parentElement) {
          const st = getComputedStyle(p);
          if (st.overflowX === 'visible') continue;
          const b = p.getBoundingClientRect();
          if (r.left < b.left - 1 || r.right > b.right + 1) return true;
        }
        return false;
      })
      .map((node) => node.textContent ?? ''),
  );
  expect(cut, `${what}: names cut off`).toEqual([]);
  return (await page.$$(selector)).length;
}

/**
 * Every choice of the matching selects is read whole: each select is at least as wide as it would be
 * with no width limit (a select's own width is that of its longest choice, arrow included). Returns
 * how many were checked.
 */
async function selectsWhole(page: Page, selector: string, what: string): Promise<number> {
  const cut = await page.$$eval(selector, (els) =>
    (els as HTMLSelectElement[])
      .filter((sel) => {
        if (sel.getBoundingClientRect().width === 0) return false; // not shown
        const free = sel.cloneNode(true) as HTMLElement;
        Object.assign(free.style, { position: 'absolute', visibility: 'hidden', width: 'auto', minWidth: '0', maxWidth: 'none' });
        sel.parentElement!.appendChild(free);
        const need = free.getBoundingClientRect().width;
        free.remove();
        return sel.getBoundingClientRect().width + 0.5 < need;
      })
      .map((sel) => `${sel.labels?.[0]?.textContent ?? sel.getAttribute('aria-label') ?? sel.id}: ${sel.selectedOptions?.[0]?.textContent ?? sel.textContent ?? ''}`),
  );
  expect(cut, `${what}: choices cut off`).toEqual([]);
  return (await page.$$(selector)).length;
}

describe('layout at 1024–2560 px', () => {
  let s: Session;
  beforeAll(async () => {
    s = await launch();
    await s.page.goto(inject('baseURL'));
    await s.page.getByRole('heading', { name: 'Blendbench' }).waitFor();
    // One search, kept in memory while the window is resized.
    await s.page.getByRole('link', { name: /Substitute explorer/ }).click();
    await s.page.getByLabel('Treat BW-190 as withdrawn').check();
    await s.page.getByRole('button', { name: 'Run search' }).click();
    await s.page.getByTestId('candidates').waitFor({ timeout: 60_000 });
    // One line plan (invented demands), kept in memory too.
    await s.page.getByRole('link', { name: /Whole-line plan/ }).click();
    await s.page.getByRole('heading', { name: 'Whole-line plan', level: 2 }).waitFor();
    for (const [grade, t] of [[220, '300'], [320, '400'], [460, '250'], [680, '150']] as const) {
      const f = s.page.getByLabel(new RegExp(`^Demand of “Gear oil VG ${grade}`));
      await f.fill(t);
      await f.press('Enter');
    }
    await s.page.getByLabel('Supply of BW-190').fill('250');
    await s.page.getByLabel('Supply of BW-190').press('Enter');
    await s.page.getByRole('button', { name: 'Plan the line' }).click();
    await s.page.getByTestId('plan-results').waitFor({ timeout: 60_000 });
  });
  afterAll(async () => {
    await s?.close();
  });

  for (const width of WIDTHS) {
    it(`${width} px: every screen fits, its controls can be reached, names are whole`, async () => {
      const { page } = s;
      await page.setViewportSize({ width, height: 900 });

      // Stocks
      await page.getByRole('link', { name: /^Stocks/ }).click();
      await page.getByRole('heading', { name: 'Stocks' }).waitFor();
      await screenshot(page, `layout-stocks-${width}`);
      await noSidewaysScroll(page);
      await fitsItsBox(page, '.library-screen .table-scroll');
      await reachable(page.getByRole('button', { name: 'Delete BW-190' }), 'Stocks row actions');
      await reachable(page.getByRole('button', { name: 'More fields of BW-190' }), 'Stocks row actions');
      const names = await namesWhole(page);
      expect(names.length).toBeGreaterThan(10);
      // The category and availability of every stock are read whole ("Group IV (PAO)", "Additive package", "Withdrawn").
      // (a choice is drawn as text until edited, as wide as its longest choice: fields.tsx `textUntilEdited`)
      expect(await selectsWhole(page, '.library-table tbody select, .library-table tbody .cell-choice', 'Stocks table')).toBeGreaterThan(20);
      // The demo's longest name (invented) is among those read whole.
      expect(names).toContain('Industrial gear EP additive package (sulfur–phosphorus)');
      if (width >= 1920) {
        const [table, main] = await page.evaluate(() => [
          document.querySelector('.library-table')!.getBoundingClientRect().width,
          document.querySelector('.app-main')!.getBoundingClientRect().width,
        ]);
        expect(table / main, 'the Stocks table uses the width').toBeGreaterThan(0.9);
      }

      // Recipe designer
      await page.getByRole('link', { name: /Recipe designer/ }).click();
      await page.getByTestId('recipe-lines').waitFor();
      await page.waitForSelector('[data-chart="viscosity-temperature"] .recharts-line-curve');
      await screenshot(page, `layout-designer-${width}`);
      await noSidewaysScroll(page);
      await fitsItsBox(page, '.designer .recipe-table');
      expect(await textWhole(page, '.designer .recipe-table tbody th', 'designer recipe lines')).toBeGreaterThan(2);
      for (const code of ['BW-190', 'BW-160', 'BW-901']) await reachable(page.getByLabel(`Mass % of ${code}`), `designer share of ${code}`);
      await reachable(page.getByRole('button', { name: 'Remove BW-160' }), 'designer remove');
      await reachable(page.getByRole('button', { name: 'Solve', exact: true }), 'Solve');
      // The chosen additive package: its list is cut on a narrow window, its name beside it is whole.
      expect(await textWhole(page, '[data-testid="additive-name"]', 'designer additive package')).toBe(1);
      await expect.poll(() => page.getByTestId('additive-name').textContent()).toBe('Industrial gear EP additive package (sulfur–phosphorus)');

      // Substitute explorer (the search result is still there)
      await page.getByRole('link', { name: /Substitute explorer/ }).click();
      await page.getByTestId('candidates').waitFor();
      await screenshot(page, `layout-explorer-${width}`);
      await noSidewaysScroll(page);
      expect(await textWhole(page, '.withdrawn .checklist label', 'explorer stocks to treat as withdrawn')).toBeGreaterThan(2);
      await reachable(page.getByTestId('candidates').getByRole('button', { name: /compare/ }).first(), 'explorer compare');
      await reachable(page.getByRole('button', { name: /Adopt as a new recipe|Adopted/ }), 'explorer adopt');

      // Recipes
      await page.getByRole('link', { name: /^Recipes/ }).click();
      await page.getByRole('heading', { name: 'Recipes', level: 2 }).waitFor();
      await screenshot(page, `layout-recipes-${width}`);
      await noSidewaysScroll(page);

      // Whole-line plan (the plan is still there)
      await page.getByRole('link', { name: /Whole-line plan/ }).click();
      await page.getByTestId('plan-results').waitFor();
      await page.locator('[data-chart="allocation"] .recharts-bar-rectangle').first().waitFor();
      await screenshot(page, `layout-lineplan-${width}`);
      await noSidewaysScroll(page);
      await reachable(page.getByRole('button', { name: 'Plan the line' }), 'Plan the line');
      await reachable(page.getByLabel('Supply of BW-190'), 'line plan supply');

      // Blend sheet
      await page.getByRole('link', { name: /Blend sheet/ }).click();
      await page.getByRole('heading', { name: 'Blend sheet' }).waitFor();
      await screenshot(page, `layout-sheet-${width}`);
      await noSidewaysScroll(page);
      await reachable(page.getByRole('button', { name: 'Print' }), 'Print');

      // Settings
      await page.getByRole('link', { name: /^Settings/ }).click();
      await page.getByRole('heading', { name: 'Settings' }).waitFor();
      await screenshot(page, `layout-settings-${width}`);
      await noSidewaysScroll(page);

      // One standing caution on every screen.
      await expect.poll(() => page.getByRole('note', { name: 'Caution' }).filter({ visible: true }).count()).toBe(1);
      expect(s.errors).toEqual([]);
      expect(s.offHost).toEqual([]);
    });
  }

  it('a 60-character stock name is read whole in the Stocks table at 1024, 1920 and 2560 px', async () => {
    const { page } = s;
    const long = 'Invented heavy Group II base stock from a third refinery, B1'; // 60 characters, invented
    expect(long).toHaveLength(60);
    await page.setViewportSize({ width: 1024, height: 900 });
    await page.getByRole('link', { name: /^Stocks/ }).click();
    await page.getByRole('heading', { name: 'Stocks' }).waitFor();
    const field = await editCell(page, 'Name of BW-191', { exact: true });
    await field.fill(long);
    await field.press('Enter');
    await expect.poll(() => cellValue(page, 'Name of BW-191', { exact: true })).toBe(long);
    for (const width of [1024, 1920, 2560]) {
      await page.setViewportSize({ width, height: 900 });
      await page.getByLabel('Name of BW-191', { exact: true }).scrollIntoViewIfNeeded();
      await screenshot(page, `layout-stocks-long-name-${width}`);
      expect(await namesWhole(page)).toContain(long);
      await noSidewaysScroll(page);
      await reachable(page.getByRole('button', { name: 'Delete BW-191' }), 'Stocks row actions beside a long name');
    }
    expect(s.errors).toEqual([]);
    expect(s.offHost).toEqual([]);
  });

  it('a long recipe name leaves the register’s grade and saved date on one line at 1024 px (s25 walk)', async () => {
    // Before: at 1024 px a long name squeezed them into "VG / 320" and "2025-03- / 01".
    const { page } = s;
    const long = 'Gear oil VG 320 Group II and solvent neutral reformulation for the north tank farm, trial seventeen'; // invented
    await page.setViewportSize({ width: 1024, height: 900 });
    await page.getByRole('link', { name: /^Recipes/ }).click();
    await page.getByRole('heading', { name: 'Recipes', level: 2 }).waitFor();
    await page.getByRole('button', { name: /^Gear oil VG 320 — current recipe/ }).click();
    await page.getByRole('button', { name: 'Duplicate', exact: true }).click();
    const name = page.getByLabel('Name', { exact: true });
    await expect.poll(() => name.inputValue()).toMatch(/\(copy\)$/);
    await name.fill(long);
    await name.press('Enter');
    await page.getByRole('button', { name: long }).waitFor();
    await screenshot(page, 'layout-recipes-long-name-1024');
    expect(await brokenRegisterCells(page)).toEqual([]);
    await noSidewaysScroll(page);
  });
});
