import { chromium } from 'playwright-core';
import { mkdtempSync } from 'node:fs';
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
await page.getByRole('button', { name: /Import CSV/ }).click();
for (const f of ['edited.csv', 'unithdr.csv', 'good.csv']) {
  await page.locator('input[type=file]').setInputFiles('/tmp/walk2/' + f);
  await page.waitForTimeout(2000);
  console.log('=====', f);
  console.log(await page.locator('.import-panel').innerText());
  await shot('import-' + f);
}
await ctx.close();
