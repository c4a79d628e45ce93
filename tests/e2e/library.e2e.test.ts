// Library, saved work and import in the built app (Chromium via playwright-core).
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { launch, screenshot, type Session, stored } from './support';
import { largeLibraryCsv } from '../helpers/large-library';

async function libraryRowCount(page: Page): Promise<number> {
  const table = page.getByRole('table', { name: 'Component library' });
  // A small library is drawn whole, but the page's opening draw holds only the rows down to the
  // window's bottom (the table carries aria-rowcount meanwhile); the rest follow after the first paint.
  await table.and(page.locator(':not([aria-rowcount])')).waitFor();
  return table.locator(':scope > tbody > tr:not(.details-row)').count();
}

describe('component library and saved work', () => {
  let s: Session;
  let profile: string;
  const files = mkdtempSync(join(tmpdir(), 'blendbench-import-'));
  beforeAll(async () => {
    profile = mkdtempSync(join(tmpdir(), 'blendbench-lib-profile-'));
    s = await launch({ profileDir: profile });
  });
  afterAll(async () => {
    await s?.close();
    rmSync(profile, { recursive: true, force: true });
    rmSync(files, { recursive: true, force: true });
  });

  it('first start shows the invented demo library with computed VI and grade', async () => {
    const { page } = s;
    await page.goto(`${inject('baseURL')}#/library`);
    await page.getByRole('heading', { name: 'Stocks' }).waitFor();
    await expect(page.getByText(/invented demo/i).first().isVisible()).resolves.toBe(true);
    await expect(page.getByText(/laboratory confirmation/i).first().isVisible()).resolves.toBe(true);
    expect(await libraryRowCount(page)).toBe(29);
    await expect(page.getByLabel('Stock code of Group I bright stock', { exact: true }).inputValue()).resolves.toBe('BW-190');
    // VI and grade columns are computed beside the entered values.
    const row = page.getByRole('row').filter({ has: page.getByLabel('Stock code of Group I bright stock', { exact: true }) });
    await expect(row.getByText('VG 460').isVisible()).resolves.toBe(true);
    await screenshot(page, 'library');
  });

  it('refuses ν100 above ν40 with a specific message and keeps the stored value', async () => {
    const { page } = s;
    const kv100 = page.getByLabel('ν100 of BW-190 [mm²/s]');
    await kv100.fill('600');
    await kv100.press('Enter');
    await expect(page.getByText('ν100 (600 mm²/s) must be below ν40 (485 mm²/s)').isVisible()).resolves.toBe(true);
    await kv100.press('Escape');
    await expect(kv100.inputValue()).resolves.toBe('31.8');
  });

  it('a malformed CSV shows its row errors and leaves the library unchanged', async () => {
    const { page } = s;
    const before = JSON.stringify(await stored(page, 'library'));
    const csv = [
      'code,name,category,kv40_mm2s,kv100_mm2s,density15_kg_per_l,price,price_basis',
      'NEW-1,Good new stock,group-ii,45,6.6,0.862,1.1,per-kg',
      'NEW-2,Upside-down viscosities,group-ii,10,20,0.86,1,per-kg',
      'NEW-3,Bad density,group-iii,34,6.3,heavy,1,per-kg',
      'NEW-1,Duplicate code,group-ii,45,6.6,0.862,1.1,per-kg',
      'NEW-4,Unknown group,group-x,45,6.6,0.862,1.1,per-kg',
    ].join('\n');
    const file = join(files, 'malformed.csv');
    writeFileSync(file, csv);
    await page.getByRole('button', { name: 'Import CSV / JSON…' }).click();
    await page.getByLabel('File', { exact: true }).setInputFiles(file);
    await page.getByText('4 of 5 rows have errors; nothing was imported.').waitFor();
    const preview = page.getByRole('table', { name: 'Import preview' });
    await expect(preview.getByText(/must be below ν40/).isVisible()).resolves.toBe(true);
    await expect(preview.getByText(/“heavy” is not a number/).isVisible()).resolves.toBe(true);
    await expect(preview.getByText(/also appears on line 2/).isVisible()).resolves.toBe(true);
    await expect(preview.getByText(/“group-x” is not one of/).isVisible()).resolves.toBe(true);
    await expect(page.getByRole('button', { name: /^Import/ }).filter({ hasText: /^Import$/ }).isDisabled()).resolves.toBe(true);
    await screenshot(page, 'library-import-errors');
    await page.getByRole('button', { name: 'Cancel' }).click();
    expect(await libraryRowCount(page)).toBe(29);
    expect(JSON.stringify(await stored(page, 'library'))).toBe(before);
  });

  it('a valid CSV is previewed, then imported only on confirmation', async () => {
    const { page } = s;
    const file = join(files, 'good.csv');
    writeFileSync(file, 'code,name,category,kv40_mm2s,kv100_mm2s,density15_kg_per_l,price\nNEW-9,Imported neutral,group-ii,45,6.6,0.862,1.1\n');
    await page.getByRole('button', { name: 'Import CSV / JSON…' }).click();
    await page.getByLabel('File', { exact: true }).setInputFiles(file);
    await page.getByText('good.csv is valid.').waitFor();
    expect(await libraryRowCount(page)).toBe(29);
    await page.getByRole('button', { name: 'Import: add 1, update 0' }).click();
    expect(await libraryRowCount(page)).toBe(30);
  });

  it('edits to the library and settings survive a reload, as do the recipes', async () => {
    const { page } = s;
    const kv40 = page.getByLabel('ν40 of BW-190 [mm²/s]');
    await kv40.fill('490');
    await kv40.press('Enter');
    // BW-190 is in every demo recipe: the change is shown with the recipes it moves, then stored (issue 10, item 14).
    const dialog = page.getByRole('alertdialog');
    await dialog.getByText(/moves 4 saved recipes/).waitFor();
    await dialog.getByRole('button', { name: /Store the change/ }).click();
    await page.getByRole('link', { name: /Settings/ }).click();
    await page.getByRole('heading', { name: 'Settings' }).waitFor();
    await page.getByLabel('Temperatures in').selectOption('F');
    await screenshot(page, 'settings');
    // Wait until the edits are written.
    await expect
      .poll(async () => JSON.stringify(await stored(page, 'settings')), { timeout: 5000 })
      .toContain('"temperatureUnit":"F"');
    await expect.poll(async () => JSON.stringify(await stored(page, 'library')), { timeout: 5000 }).toContain('"kv":490');
    await page.goto(`${inject('baseURL')}#/library`);
    await page.reload();
    await page.getByRole('heading', { name: 'Stocks' }).waitFor();
    await expect(page.getByLabel('ν40 of BW-190 [mm²/s]').inputValue()).resolves.toBe('490');
    expect(await libraryRowCount(page)).toBe(30);
    await expect(page.getByRole('columnheader', { name: /Aniline pt °F/ }).isVisible()).resolves.toBe(true);
    const recipes = (await stored(page, 'recipes')) as { version: number; state: { recipes: unknown[] } };
    expect(recipes.version).toBe(9); // schema 9: minimum probability in band (5), the line plan (6), least cost per kg (7), QC-loop entries (8), a specification's grade (9)
    expect(recipes.state.recipes.length).toBe(4);
  });

  it('deleting a stock can be undone; a stock used in a recipe is not deleted', async () => {
    const { page } = s;
    await page.getByRole('button', { name: 'Delete NEW-9' }).click();
    expect(await libraryRowCount(page)).toBe(29);
    await page.getByRole('button', { name: 'Undo', exact: true }).first().click();
    expect(await libraryRowCount(page)).toBe(30);
    await page.getByRole('button', { name: 'Delete BW-190' }).click();
    await expect(page.getByText(/BW-190 is used in 4 recipes/).isVisible()).resolves.toBe(true);
    expect(await libraryRowCount(page)).toBe(30);
  });

  it('every library action is reachable by keyboard; the details panel shows the other fields', async () => {
    const { page } = s;
    await page.goto(`${inject('baseURL')}#/library`);
    await page.getByRole('heading', { name: 'Stocks' }).waitFor();
    const before = await libraryRowCount(page);
    // From the top of the page, Tab until "Add stock" has focus, then press Enter.
    await page.locator('body').click({ position: { x: 5, y: 5 } });
    let found = false;
    for (let i = 0; i < 40 && !found; i++) {
      await page.keyboard.press('Tab');
      found = await page.evaluate(() => document.activeElement?.textContent === 'Add stock');
    }
    expect(found).toBe(true);
    await page.keyboard.press('Enter');
    expect(await libraryRowCount(page)).toBe(before + 1);
    await page.getByRole('button', { name: 'Undo', exact: true }).first().press('Enter');
    expect(await libraryRowCount(page)).toBe(before);
    await page.getByRole('button', { name: 'More fields of BW-510' }).press('Enter');
    await page.getByLabel('Permanent shear loss of ν100 [%]').waitFor();
    await page.getByRole('button', { name: 'Close fields of BW-510' }).scrollIntoViewIfNeeded();
    await page.screenshot({ path: join(process.cwd(), 'test-output', 'screens', 'library-details.png') });
  });

  it('made no console errors and no off-host requests', () => {
    expect(s.errors).toEqual([]);
    expect(s.offHost).toEqual([]);
  });
});

describe('a long library (issue 9, item 3)', () => {
  let s: Session | null = null;
  const dir = mkdtempSync(join(tmpdir(), 'blendbench-long-'));
  afterAll(async () => {
    await s?.close();
    rmSync(dir, { recursive: true, force: true });
  });

  it('20,000 stocks: only the rows near the viewport are drawn; scrolling, keyboard entry and Tab work down to the last stock', async () => {
    s = await launch();
    const { page } = s;
    await page.goto(`${inject('baseURL')}#/library`);
    await page.getByRole('heading', { name: 'Stocks' }).waitFor();
    const file = join(dir, 'plant-20000.csv');
    writeFileSync(file, largeLibraryCsv(20_000)); // invented stocks LG-00001 … LG-20000
    await page.getByRole('button', { name: 'Import CSV / JSON…' }).click();
    await page.getByLabel('File', { exact: true }).setInputFiles(file);
    await page.getByText('plant-20000.csv is valid.').waitFor({ timeout: 90_000 });
    await page.getByRole('button', { name: 'Import: add 20000, update 0' }).click();
    await page.getByText(/^20029 stocks\./).waitFor({ timeout: 90_000 }); // + the 29 invented demo stocks
    const table = page.getByRole('table', { name: 'Component library' });
    const drawn = () => table.locator(':scope > tbody > tr[data-row-key]').count();
    expect(await drawn()).toBeLessThan(150);
    await expect(table.getAttribute('aria-rowcount')).resolves.toBe('20030');
    // The page is as tall as the whole table: scroll to the end and the last stock is drawn.
    await page.evaluate(() => window.scrollTo(0, document.documentElement.scrollHeight));
    const lastCode = page.getByLabel('Stock code of Invented stock 20000', { exact: true });
    await lastCode.waitFor();
    await expect(lastCode.inputValue()).resolves.toBe('LG-20000');
    expect(await drawn()).toBeLessThan(150);
    // Keyboard entry: type a name, Tab to the next field, Shift+Tab back; the name is saved.
    const name = page.getByLabel('Name of LG-20000', { exact: true });
    await name.focus();
    await name.fill('Invented stock, renamed by keyboard');
    await page.keyboard.press('Tab');
    await expect(page.evaluate(() => document.activeElement?.closest('td')?.className)).resolves.toBe('category-cell');
    await page.keyboard.press('Shift+Tab');
    await expect(page.evaluate(() => (document.activeElement as HTMLInputElement).value)).resolves.toBe('Invented stock, renamed by keyboard');
    // Back to the top: the first demo stock is drawn again.
    await page.evaluate(() => window.scrollTo(0, 0));
    await page.getByLabel('Stock code of Group I bright stock', { exact: true }).waitFor();
    await page.screenshot({ path: join(process.cwd(), 'test-output', 'screens', 'library-long.png') }); // the viewport (the page is 20,000 rows tall)
    expect(s.errors).toEqual([]);
    expect(s.offHost).toEqual([]);
  }, 240_000);
});

describe('stock import: a number that could be 1.25 or 1250 (s20 defect 4)', () => {
  let s: Session;
  const files = mkdtempSync(join(tmpdir(), 'blendbench-import-comma-'));
  beforeAll(async () => {
    s = await launch();
  });
  afterAll(async () => {
    await s?.close();
    rmSync(files, { recursive: true, force: true });
  });

  it('names both readings in the file’s decimal mark, or the settings’ when the file does not tell', async () => {
    const { page } = s;
    await page.goto(`${inject('baseURL')}#/settings`);
    await page.getByLabel('Decimal separator').selectOption(',');
    await page.goto(`${inject('baseURL')}#/library`);
    await page.getByRole('heading', { name: 'Stocks' }).waitFor();
    // A semicolon file whose other numbers use "," (invented values): "1.250" is refused, written "1,25 or 1250".
    const told = join(files, 'told.csv');
    writeFileSync(told, 'code;category;kv40_mm2s;kv100_mm2s;density15_kg_per_l;price;price_basis\nNEW-1;group-ii;100;11;0,87;1.250;per-tonne\n');
    await page.getByRole('button', { name: 'Import CSV / JSON…' }).click();
    await page.getByLabel('File', { exact: true }).setInputFiles(told);
    const preview = page.getByRole('table', { name: 'Import preview' });
    await preview.getByText(/could mean 1,25 or 1250 \(this file’s other numbers use “,”/).waitFor();
    await page.getByRole('button', { name: 'Cancel' }).click();
    // A file whose other numbers are whole: the settings' decimal comma.
    const silent = join(files, 'silent.csv');
    writeFileSync(silent, 'code;category;kv40_mm2s;kv100_mm2s;density15_kg_per_l;price;price_basis\nNEW-1;group-ii;100;11;1;1.250;per-tonne\n');
    await page.getByRole('button', { name: 'Import CSV / JSON…' }).click();
    await page.getByLabel('File', { exact: true }).setInputFiles(silent);
    await preview.getByText(/could mean 1,25 or 1250 \(the file’s other numbers do not tell/).waitFor();
    await screenshot(page, 'library-import-could-mean-comma');
    expect(s.errors).toEqual([]);
    expect(s.offHost).toEqual([]);
  });
});
