/**
 * Bench: the opening screen (Stocks, the demo library) of the built app in headless Chromium.
 *
 * The production build is served by `vite preview` on 127.0.0.1. Each load is cold: a fresh
 * browser context (empty HTTP cache, empty IndexedDB, so the app starts from the demo as a
 * first-time user does). "Drawn" = the first animation frame in which the opening screen's own
 * heading (`main h2`) and its table of stocks are laid out (saved work read, lazy screen loaded).
 *
 * Lines:
 * - end-to-end first render: navigation start → drawn, median of 7 loads (goal ≤ 1 s);
 * - the app's main-thread CPU to the drawn library: thread time (`tdur`) of every top-level task of
 *   the page's main thread in a Chromium trace, from the navigation to the drawn frame, median of the
 *   same loads (goal ≤ 250 ms) — CPU, so it does not count time the thread waited for the network,
 *   for workers or for other processes on a shared machine — less V8's re-parse of functions for the
 *   DevTools protocol's stack traces, which only a browser driven over the protocol does (see
 *   `mainThreadCpu`; the note gives it and the total with it); the note adds the same up to the frame
 *   after every row of the table is in the page (the opening screen draws the rows below the window
 *   right after its first paint);
 * - ALL JavaScript the opening screen loaded before it was drawn (every script resource the page
 *   fetched: entry, preloaded and lazily imported chunks), gzip-compressed at level 9 as a static
 *   server would send it (goal ≤ 150 kB). The list of chunks is in the note.
 * One warm-up load (starts the server's and the OS's caches) first.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { withServedApp, type ServedApp } from './chromium';
import { buildAppOnce } from './app-build';
import type { BenchLine } from './types';

const LOADS = 7;

// Runs in the page before any of the app's scripts (bench/profile/first-render-trace.ts uses it too).
export const MARKER = `(() => {
  const check = () => {
    const h = document.querySelector('main h2');
    const table = document.querySelector('main table');
    if (!h || h.getBoundingClientRect().height === 0 || !table) return;
    obs.disconnect();
    requestAnimationFrame(() => {
      window.__bbFirstRender = performance.now();
      performance.mark('bb-drawn');
      window.__bbScripts = performance.getEntriesByType('resource')
        .filter((e) => /\\.m?js(\\?|$)/.test(e.name))
        .map((e) => new URL(e.name).pathname);
    });
    // Every row of the table in the page (the rows below the window follow the first paint).
    const whole = () => {
      if (table.querySelector('tr.row-gap')) return false;
      requestAnimationFrame(() => {
        performance.mark('bb-whole');
        window.__bbWhole = performance.now();
      });
      return true;
    };
    if (!whole()) {
      const rest = new MutationObserver(() => whole() && rest.disconnect());
      rest.observe(table, { subtree: true, childList: true });
    }
  };
  const obs = new MutationObserver(check);
  obs.observe(document, { subtree: true, childList: true });
})();`;

interface Load {
  firstRender: number;
  fcp: number | null;
  mainCpuMs: number;
  /** Of it, the DevTools-only re-parse (see mainThreadCpu). */
  harnessMs: number;
  /** The same up to every row of the table in the page (null: not within the wait). */
  wholeCpuMs: number | null;
  scripts: string[];
}

/** A Chromium trace event (the fields the benches read). */
export interface TraceEvent {
  name: string;
  ph: string;
  pid: number;
  tid: number;
  ts: number;
  dur?: number;
  tdur?: number;
  tts?: number;
  cat?: string;
  args?: { name?: string; data?: { url?: string; functionName?: string; type?: string } };
}

/**
 * Thread time [ms] of the top-level tasks of the main thread that marked `name`, up to the mark:
 * `total`, and `harness`, the part of it V8 spent re-parsing functions to take detailed stack
 * traces (V8.CollectSourcePositions, outermost events only). The bench drives Chromium over the
 * DevTools protocol, whose Runtime domain (on in every page Playwright drives) makes V8 record a
 * full stack trace for every Error created; React DOM creates five while its module evaluates,
 * inside its one 600 kB module function, so V8 re-parses it — about 50 ms that a browser with no
 * DevTools attached does not spend (s23: a startup trace without the protocol showed 9.7 ms of
 * module evaluation and no re-parse; `bench/profile/first-render-trace.ts` shows the events).
 */
function mainThreadCpu(events: TraceEvent[], name = 'bb-drawn'): { total: number; harness: number } {
  const mark = events.find((e) => e.name === name);
  if (!mark) throw new Error(`first-render bench: the mark ${name} is missing from the trace`);
  let total = 0;
  let harness = 0;
  let reparseEnd = -1;
  const onThread = events
    .filter((e) => e.pid === mark.pid && e.tid === mark.tid && e.ph === 'X' && e.ts <= mark.ts)
    .sort((a, b) => a.ts - b.ts);
  for (const e of onThread) {
    if (e.name === 'RunTask') total += (e.tdur ?? e.dur ?? 0) / 1000;
    else if (e.name === 'V8.CollectSourcePositions' && e.ts >= reparseEnd) {
      harness += (e.tdur ?? e.dur ?? 0) / 1000;
      reparseEnd = e.ts + (e.dur ?? 0);
    }
  }
  return { total, harness };
}

async function oneLoad(app: ServedApp): Promise<Load> {
  const context = await app.newContext();
  try {
    await context.addInitScript(MARKER);
    const page = await context.newPage();
    await app.browser.startTracing(page, {
      categories: ['toplevel', 'disabled-by-default-devtools.timeline', 'blink.user_timing', 'disabled-by-default-v8.compile'],
    });
    await page.goto(app.url, { waitUntil: 'commit' });
    await page.waitForFunction(() => Array.isArray((window as { __bbScripts?: string[] }).__bbScripts), null, { timeout: 30_000 });
    const whole = await page
      .waitForFunction(() => typeof (window as { __bbWhole?: number }).__bbWhole === 'number', null, { timeout: 5_000 })
      .then(() => true, () => false);
    const trace = JSON.parse((await app.browser.stopTracing()).toString('utf8')) as { traceEvents: TraceEvent[] };
    const r = await page.evaluate(() => ({
      firstRender: (window as unknown as { __bbFirstRender: number }).__bbFirstRender,
      fcp: performance.getEntriesByName('first-contentful-paint')[0]?.startTime ?? null,
      scripts: (window as unknown as { __bbScripts: string[] }).__bbScripts,
    }));
    const drawn = mainThreadCpu(trace.traceEvents);
    const all = whole ? mainThreadCpu(trace.traceEvents, 'bb-whole') : null;
    return { ...r, mainCpuMs: drawn.total - drawn.harness, harnessMs: drawn.harness, wholeCpuMs: all === null ? null : all.total - all.harness };
  } finally {
    await context.close();
  }
}

export const median = (xs: number[]): number => {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
};

/** gzip (level 9) size of each built file named by its URL path [bytes]. */
function gzipSizes(paths: readonly string[]): { file: string; gz: number }[] {
  const dir = buildAppOnce();
  return paths.map((p) => {
    const file = p.replace(/^.*?\/assets\//, 'assets/').replace(/^\//, '');
    return { file, gz: gzipSync(readFileSync(join(dir, file)), { level: 9 }).length };
  });
}

export async function run(): Promise<BenchLine[]> {
  return withServedApp('first-render', async (app) => {
    await oneLoad(app); // warm-up
    const loads: Load[] = [];
    for (let i = 0; i < LOADS; i++) loads.push(await oneLoad(app));
    const times = loads.map((l) => l.firstRender);
    const cpus = loads.map((l) => l.mainCpuMs);
    const raws = loads.map((l) => l.mainCpuMs + l.harnessMs);
    const harness = loads.map((l) => l.harnessMs);
    const wholes = loads.flatMap((l) => (l.wholeCpuMs === null ? [] : [l.wholeCpuMs]));
    const fcps = loads.flatMap((l) => (l.fcp === null ? [] : [l.fcp]));
    const scripts = gzipSizes([...new Set(loads[0]!.scripts)]);
    const totalGz = scripts.reduce((s, x) => s + x.gz, 0);
    return [
      {
        name: 'first render of the built app in Chromium, cold, median',
        measured: median(times) / 1000,
        unit: 's',
        op: '<=',
        goal: 1,
        note: `${LOADS} loads, ${Math.round(Math.min(...times))}–${Math.round(Math.max(...times))} ms` + (fcps.length ? `; first contentful paint median ${Math.round(median(fcps))} ms` : ''),
      },
      {
        name: 'main-thread CPU to the drawn library (Chromium trace), median',
        measured: median(cpus),
        unit: 'ms',
        op: '<=',
        goal: 250,
        note:
          `${LOADS} loads, ${Math.round(Math.min(...cpus))}–${Math.round(Math.max(...cpus))} ms of thread time in the page's main-thread tasks, ` +
          `without V8's re-parse for the DevTools protocol's stack traces (median ${Math.round(median(harness))} ms; with it median ${Math.round(median(raws))} ms)` +
          (wholes.length ? `; to every row of the table in the page (the rows below the window follow the first paint) median ${Math.round(median(wholes))} ms` : ''),
      },
      {
        name: 'all JavaScript the opening screen loads, gzip',
        measured: totalGz / 1000,
        unit: 'kB',
        op: '<=',
        goal: 150,
        note: scripts
          .sort((a, b) => b.gz - a.gz)
          .map((s) => `${s.file.replace(/^assets\//, '')} ${(s.gz / 1000).toFixed(1)}`)
          .join(', '),
      },
    ];
  });
}
