/**
 * Bench: time to first render of the built app in headless Chromium (goal ≤ 1.5 s, median).
 *
 * The production build is served by `vite preview` on 127.0.0.1 (a free port). Each load is cold:
 * a fresh browser context (empty HTTP cache, empty IndexedDB, so the app starts from the demo as a
 * first-time user does). Measured in the page from navigation start (performance.timeOrigin) to the
 * first animation frame in which the opening screen's own heading (`main h2`, shown once saved work
 * has been read and the lazy screen has loaded) is laid out — i.e. the app is usable, not merely the
 * shell. One warm-up load (starts the server's and the OS's caches), then the median of 7 loads.
 */
import { spawn } from 'node:child_process';
import { createServer } from 'node:net';
import { chromium, type Browser } from 'playwright-core';
import { buildAppOnce } from './app-build';
import type { BenchLine } from './types';

const LOADS = 7;

async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.once('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const addr = srv.address();
      const port = typeof addr === 'object' && addr ? addr.port : 0;
      srv.close(() => resolve(port));
    });
  });
}

async function waitForServer(url: string, timeoutMs: number): Promise<void> {
  const start = Date.now();
  for (;;) {
    try {
      if ((await fetch(url)).ok) return;
    } catch {
      /* not up yet */
    }
    if (Date.now() - start > timeoutMs) throw new Error(`first-render bench: preview server did not answer at ${url}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

// Runs in the page before any of the app's scripts.
const MARKER = `(() => {
  const check = () => {
    const h = document.querySelector('main h2');
    if (!h || h.getBoundingClientRect().height === 0) return;
    obs.disconnect();
    requestAnimationFrame(() => { window.__bbFirstRender = performance.now(); });
  };
  const obs = new MutationObserver(check);
  obs.observe(document, { subtree: true, childList: true });
})();`;

const isLocal = (u: string) => /^(data:|blob:|about:)/.test(u) || new URL(u).hostname === '127.0.0.1';

async function oneLoad(browser: Browser, url: string): Promise<{ firstRender: number; fcp: number | null }> {
  const context = await browser.newContext({ viewport: { width: 1400, height: 900 } });
  try {
    await context.route((u) => !isLocal(u.toString()), (r) => r.abort());
    await context.addInitScript(MARKER);
    const page = await context.newPage();
    await page.goto(url, { waitUntil: 'commit' });
    await page.waitForFunction(() => typeof (window as { __bbFirstRender?: number }).__bbFirstRender === 'number', null, {
      timeout: 20_000,
    });
    return await page.evaluate(() => ({
      firstRender: (window as unknown as { __bbFirstRender: number }).__bbFirstRender,
      fcp: performance.getEntriesByName('first-contentful-paint')[0]?.startTime ?? null,
    }));
  } finally {
    await context.close();
  }
}

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
};

export async function run(): Promise<BenchLine[]> {
  const dir = buildAppOnce();
  const port = await freePort();
  const server = spawn('npx', ['vite', 'preview', '--host', '127.0.0.1', '--port', String(port), '--strictPort', '--outDir', dir], {
    detached: true,
    stdio: 'ignore',
  });
  let browser: Browser | undefined;
  try {
    const url = `http://127.0.0.1:${port}/`;
    await waitForServer(url, 30_000);
    browser = await chromium.launch({
      executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
      headless: true,
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run',
        '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    });
    await oneLoad(browser, url); // warm-up
    const times: number[] = [];
    const fcps: number[] = [];
    for (let i = 0; i < LOADS; i++) {
      const r = await oneLoad(browser, url);
      times.push(r.firstRender);
      if (r.fcp !== null) fcps.push(r.fcp);
    }
    return [
      {
        name: 'first render of the built app in Chromium, cold, median',
        measured: median(times) / 1000,
        unit: 's',
        op: '<=',
        goal: 1.5,
        note: `${LOADS} loads, ${Math.round(Math.min(...times))}–${Math.round(Math.max(...times))} ms` +
          (fcps.length ? `; first contentful paint median ${Math.round(median(fcps))} ms` : ''),
      },
    ];
  } finally {
    await browser?.close();
    if (server.pid) {
      try {
        process.kill(-server.pid, 'SIGTERM');
      } catch {
        /* already gone */
      }
    }
  }
}
