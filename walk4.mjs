import { chromium } from 'playwright-core';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
const dir = mkdtempSync(join(tmpdir(), 'walk-'));
const ctx = await chromium.launchPersistentContext(dir, { executablePath: '/usr/bin/chromium', headless: true, viewport: { width: 1400, height: 900 },
  args: ['--headless','--no-sandbox','--disable-gpu','--disable-quic','--no-first-run','--disable-background-networking','--disable-component-update','--disable-sync'] });
const page = ctx.pages()[0] ?? await ctx.newPage();
page.on('console', m => { if (m.type() === 'error' || m.type() === 'warning') console.log('console', m.type(), m.text()); });
await page.goto('http://127.0.0.1:4499/#/library');
await page.getByRole('button', { name: /^Add stock/ }).first().click();
await page.waitForTimeout(1000);
await page.keyboard.press('End'); await page.waitForTimeout(300); const f = page.locator(':focus'); console.log(await f.getAttribute('aria-label')); await f.scrollIntoViewIfNeeded(); await page.screenshot({ path: '/tmp/walk/stocks-add.png' });
await ctx.close();
