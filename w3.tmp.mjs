import { chromium } from 'playwright-core';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
const base = 'http://127.0.0.1:4492/';
const ctx = await chromium.launchPersistentContext(mkdtempSync(join(tmpdir(), 'w2-')), { executablePath: '/usr/bin/chromium', headless: true, viewport: { width: 1400, height: 900 }, acceptDownloads: true,
  args: ['--headless','--no-sandbox','--disable-gpu','--disable-quic','--no-first-run','--disable-background-networking','--disable-component-update','--disable-sync'] });
const page = ctx.pages()[0];
page.on('console', m => { if (m.type()==='error') console.log('CONSOLE', m.text()); });
page.on('pageerror', e => console.log('PAGEERR', String(e)));
const shot = (n) => page.screenshot({ path: `/tmp/walk2/${n}.png`, fullPage: true });
await page.goto(base + '#/library');
await page.getByRole('button', { name: 'Export CSV' }).waitFor();
const [dl] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Export CSV' }).click()]);
await dl.saveAs('/tmp/walk2/export.csv');
console.log('name', dl.suggestedFilename());
const [dj] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Export JSON' }).click()]);
await dj.saveAs('/tmp/walk2/export.json');
await ctx.close();
