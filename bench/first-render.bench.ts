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
import { withServedApp, type ServedApp } from './chromium';
import type { BenchLine } from './types';

const LOADS = 7;

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

async function oneLoad(app: ServedApp): Promise<{ firstRender: number; fcp: number | null }> {
  const context = await app.newContext();
  try {
    await context.addInitScript(MARKER);
    const page = await context.newPage();
    await page.goto(app.url, { waitUntil: 'commit' });
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
  return withServedApp('first-render', async (app) => {
    await oneLoad(app); // warm-up
    const times: number[] = [];
    const fcps: number[] = [];
    for (let i = 0; i < LOADS; i++) {
      const r = await oneLoad(app);
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
  });
}
