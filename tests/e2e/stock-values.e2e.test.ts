// A stock just added in the built app (s25): its ν40, ν100 and density are shown as not entered, the
// state survives a reload, the explorer names the stock, and entering the three values makes it complete.
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { launch, screenshot, type Session, stored, cellValue, editCell } from './support';
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

  it('made no console errors and no off-host requests', () => {
    expect(s.errors).toEqual([]);
    expect(s.offHost).toEqual([]);
  });
});
