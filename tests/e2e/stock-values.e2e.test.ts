// A stock just added in the built app (s25): its ν40, ν100 and density are shown as not entered, the
// state survives a reload, the explorer names the stock, and entering the three values makes it complete.
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { execFileSync } from 'node:child_process';
import { launch, screenshot, type Session, stored, cellValue, editCell, SCREEN_DIR } from './support';
import { editSaved } from './seed';
import { demoComponentId } from '../../src/state/demo';
import { axeSerious } from './axe';

describe('a stock whose values are not yet entered', () => {
  let s: Session;
  let profile: string;
  beforeAll(async () => {
    profile = mkdtempSync(join(tmpdir(), 'blendbench-values-profile-'));
    s = await launch({ profileDir: profile });
  });
  afterAll(async () => {
    await s?.close();
    rmSync(profile, { recursive: true, force: true });
  });

  it('Add stock: empty marked fields and the row state, kept through a reload; named by the explorer', async () => {
    const { page } = s;
    await page.goto(`${inject('baseURL')}#/library`);
    await page.getByRole('heading', { name: 'Stocks' }).waitFor();
    await page.getByRole('button', { name: 'Add stock' }).click();
    await page.getByTestId('values-pending').waitFor();
    await expect(cellValue(page, 'ν40 of NEW [mm²/s]')).resolves.toBe('');
    await expect(cellValue(page, 'ν100 of NEW [mm²/s]')).resolves.toBe('');
    await expect(cellValue(page, 'Density at 15 °C of NEW [kg/L]')).resolves.toBe('');
    const price = await editCell(page, /^Price of NEW/);
    await price.fill('1.4');
    await price.press('Enter');
    await expect.poll(async () => JSON.stringify(await stored(page, 'library'))).toContain('"notEntered":["kv40","kv100","density15"]');
    await page.reload();
    await page.getByRole('heading', { name: 'Stocks' }).waitFor();
    await expect(page.getByTestId('values-pending').textContent()).resolves.toBe('not in use: values to enter (ν40, ν100 and density)');
    await expect(cellValue(page, 'ν40 of NEW [mm²/s]')).resolves.toBe('');
    await screenshot(page, 'stock-values-pending');
    // The marks and the row state (and the open details) pass the same accessibility check as every screen.
    await page.getByRole('button', { name: 'More fields of NEW' }).click();
    await page.getByTestId('details-pending').waitFor();
    expect(await axeSerious(page), 'Stocks with a stock whose values are not yet entered').toEqual([]);
    await page.goto(`${inject('baseURL')}#/explorer`);
    await expect(page.getByTestId('unpriced').textContent()).resolves.toBe(
      'NEW has ν40, ν100 and density not yet entered: it is left out of costing and solving until the values are entered on Stocks.',
    );
  });

  it('entering ν40, ν100 and density makes the stock complete', async () => {
    const { page } = s;
    await page.goto(`${inject('baseURL')}#/library`);
    await page.getByTestId('values-pending').waitFor();
    for (const [label, value] of [
      ['ν40 of NEW [mm²/s]', '150'],
      ['ν100 of NEW [mm²/s]', '14.5'],
      ['Density at 15 °C of NEW [kg/L]', '0.88'],
    ] as const) {
      const f = await editCell(page, label);
      await f.fill(value);
      await f.press('Enter');
      await expect.poll(() => cellValue(page, label)).toBe(value);
    }
    await expect.poll(() => page.getByTestId('values-pending').count()).toBe(0);
    await expect.poll(async () => JSON.stringify(await stored(page, 'library'))).not.toContain('notEntered');
    await page.goto(`${inject('baseURL')}#/explorer`);
    await page.getByRole('heading', { name: 'Substitute explorer' }).waitFor();
    await expect(page.getByTestId('unpriced').count()).resolves.toBe(0);
  });

  it('Blend sheet of a recipe holding such a stock: no prediction, no litres of it, on screen and on paper', async () => {
    const { page } = s;
    type Stored = {
      library: { state: { components: { id: string; notEntered?: string[] }[] } };
      recipes: { state: { sheets: Record<string, unknown> } };
    };
    await page.goto(`${inject('baseURL')}#/blend-sheet/demo-vg320`);
    await page.getByRole('heading', { name: 'Blend sheet', level: 2 }).waitFor();
    // BW-160 (invented demo stock, 22.5 % of the demo VG 320) as if just added: its values not yet entered.
    await editSaved<Stored>(page, ['library', 'recipes'], ({ library, recipes }) => {
      library.state.components.find((c) => c.id === demoComponentId('BW-160'))!.notEntered = ['kv40', 'kv100', 'density15'];
      recipes.state.sheets['demo-vg320'] = { lot: 'L-2026-0150', batchSize: '10000', batchUnit: 'kg', vessel: 'Kettle 2', instructions: null };
    });
    await page.goto('about:blank');
    await page.goto(`${inject('baseURL')}#/blend-sheet/demo-vg320`);
    await page.getByRole('table', { name: /Components, in charging order/ }).waitFor();
    await expect(page.getByTestId('not-predicted').textContent()).resolves.toBe(
      'Not predicted: BW-160 has ν40, ν100 and density not yet entered. Enter the values on Stocks.',
    );
    await expect(page.getByTestId('litres-not-given').textContent()).resolves.toMatch(/^Litres and volume % not given: BW-160 has density not yet entered/);
    await screenshot(page, 'blend-sheet-values-not-entered');
    const path = join(SCREEN_DIR, 'blend-sheet-values-not-entered.pdf');
    await page.emulateMedia({ media: 'print' });
    await page.pdf({ path, preferCSSPageSize: true, printBackground: true });
    await page.emulateMedia({ media: 'screen' });
    const text = execFileSync('pdftotext', [path, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
    expect(text).toContain('Not predicted: BW-160 has ν40, ν100 and density not yet entered. Enter the values on Stocks.');
    expect(text).toContain('Litres and volume % not given: BW-160 has density not yet entered');
    expect(text).toMatch(/10\D?000\.0 kg \(litres not given\)/);
    expect(text).toContain('It uses a stock whose measured values are not yet entered: BW-160');
    expect(text).not.toMatch(/NaN|lot spread|The predictions below use the current data/);
  });

  it('made no console errors and no off-host requests', () => {
    expect(s.errors).toEqual([]);
    expect(s.offHost).toEqual([]);
  });
});
