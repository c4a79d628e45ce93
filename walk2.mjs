import { chromium } from 'playwright-core';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
const dir = mkdtempSync(join(tmpdir(), 'walk-'));
const ctx = await chromium.launchPersistentContext(dir, { executablePath: '/usr/bin/chromium', headless: true, viewport: { width: 1400, height: 900 },
  args: ['--headless','--no-sandbox','--disable-gpu','--disable-quic','--no-first-run','--disable-background-networking','--disable-component-update','--disable-sync'] });
const page = ctx.pages()[0] ?? await ctx.newPage();
page.on('console', m => { if (m.type() === 'error' || m.type() === 'warning') console.log('console', m.type(), m.text()); });
await page.goto('http://127.0.0.1:4499/#/explorer');
await page.getByLabel('Treat BW-190 as withdrawn').check();
await page.getByRole('button', { name: 'Run search' }).click();
await page.locator('.run-status[data-status="done"]').waitFor();
await page.waitForTimeout(800);
await page.screenshot({ path: '/tmp/walk/ex-results.png', fullPage: true });
const buttons = await page.getByRole('button').allInnerTexts();
console.log(buttons.filter(b => b.trim()).slice(0, 60).join(' | '));
await ctx.close();
