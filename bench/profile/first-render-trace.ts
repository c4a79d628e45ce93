/**
 * Where the opening screen's main-thread time goes (a diagnostic, not a bench line):
 * `npx tsx bench/profile/first-render-trace.ts [loads=5] [noprofile]`, or `--dir <built app> [loads]`
 * for a folder already built with source maps, or `--ab <dirA> <dirB> [loads=9]` to compare two builds
 * in alternating cold loads (main-thread CPU medians and the median difference per pair).
 *
 * Builds the app once with source maps, serves it and makes cold loads exactly as
 * bench/first-render.bench.ts does. For each load:
 * - a Chromium trace (devtools timeline categories) of the page's main thread up to the drawn
 *   frame, broken down by event kind into self thread time (script compile, script evaluation per
 *   chunk, style, layout, paint, GC, parsing …; V8.CollectSourcePositions is the DevTools protocol's
 *   own cost, see `traced`);
 * - a second cold load under the V8 CPU profiler: self time per source file (through the source
 *   maps) and the heaviest functions.
 * Prints medians over the loads.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { SourceMapConsumer } from 'source-map-js';
import { withServedApp, type ServedApp } from '../chromium';
import { MARKER, type TraceEvent } from '../first-render.bench';
import { median, printMedians, profileTimes, short, type CpuProfile } from './trace-tools';

const LOADS = Number(process.argv[2] ?? 5);
const PROFILE = process.argv[3] !== 'noprofile';

type Ev = TraceEvent;

/** Self thread time [ms] per event label on the main thread up to the drawn mark. */
function breakdown(events: Ev[]): { total: number; self: Map<string, number>; tasks: string[] } {
  const mark = events.find((e) => e.name === 'bb-drawn');
  if (!mark) throw new Error('no drawn mark');
  const main = events
    .filter((e) => e.pid === mark.pid && e.tid === mark.tid && e.ph === 'X' && e.ts <= mark.ts && e.tdur !== undefined && e.tts !== undefined)
    .sort((a, b) => a.ts - b.ts || (b.dur ?? 0) - (a.dur ?? 0));
  const self = new Map<string, number>();
  const tasks: string[] = [];
  let total = 0;
  let task: { ts: number; ms: number; kids: Map<string, number> } | null = null;
  const flushTask = () => {
    if (task && task.ms >= 1) {
      const kids = [...task.kids].sort((a, b) => b[1] - a[1]).slice(0, 5).map(([k, v]) => `${k} ${v.toFixed(1)}`).join('; ');
      tasks.push(`${((task.ts - nav) / 1000).toFixed(0).padStart(5)} ms  ${task.ms.toFixed(1).padStart(6)}  ${kids}`);
    }
  };
  const nav = main[0]?.ts ?? 0;
  const stack: { e: Ev; end: number; child: number; label: string }[] = [];
  const pop = () => {
    const top = stack.pop()!;
    self.set(top.label, (self.get(top.label) ?? 0) + (top.e.tdur! - top.child) / 1000);
  };
  for (const e of main) {
    while (stack.length && stack[stack.length - 1]!.end <= e.ts) pop();
    let label = e.name;
    const url = e.args?.data?.url;
    if (['EvaluateScript', 'v8.compile', 'v8.compileModule', 'v8.evaluateModule', 'v8.produceCache', 'v8.produceModuleCache', 'CompileScript'].includes(e.name)) label += ` ${short(url)}`;
    if (e.name === 'FunctionCall') label += ` ${short(url)}`;
    if (e.name === 'EventDispatch' || e.name === 'TimerFire') label += ` ${e.args?.data?.type ?? ''}`;
    if (stack.length) {
      stack[stack.length - 1]!.child += e.tdur!;
      const wrappers = ['RunTask', 'ThreadControllerImpl::RunTask'];
      const outer = stack.filter((x) => !wrappers.includes(x.e.name) && !x.e.name.startsWith('Receive mojo') && x.e.name !== 'SimpleWatcher::OnHandleReady' && x.e.name !== 'MessagePort::Accept');
      if (task && outer.length <= 1 && !wrappers.includes(e.name)) {
        const key = outer.length ? `${outer[0]!.label} > ${label}` : label;
        task.kids.set(key, (task.kids.get(key) ?? 0) + e.tdur! / 1000);
      }
    } else if (e.name === 'RunTask') {
      total += e.tdur! / 1000;
      flushTask();
      task = { ts: e.ts, ms: e.tdur! / 1000, kids: new Map() };
    }
    stack.push({ e, end: e.ts + (e.dur ?? 0), child: 0, label });
  }
  while (stack.length) pop();
  flushTask();
  return { total, self, tasks };
}

/**
 * One traced cold load. `compile` adds V8's compile events: among them V8.CollectSourcePositions, V8
 * re-parsing a function on the stack when a detailed stack trace is taken. The bench's browser is
 * driven over the DevTools protocol, whose Runtime domain makes V8 take one for every Error created
 * (React DOM creates five at module evaluation, inside its one 600 kB module function and under the
 * entry chunk's): about 50 ms of the module evaluation that a browser without DevTools attached does
 * not do (s23: a startup trace without the protocol, 9.7 ms of module evaluation, no re-parse). The
 * report shows it as V8.CollectSourcePositions and its children V8.ParseFunction and V8.PreParse.
 * Left out of `--ab` (more events, more tracing overhead).
 */
async function traced(app: ServedApp, compile = false): Promise<{ total: number; self: Map<string, number>; tasks: string[]; drawn: number }> {
  const context = await app.newContext();
  try {
    await context.addInitScript(MARKER);
    const page = await context.newPage();
    await app.browser.startTracing(page, {
      categories: [
        'toplevel', 'devtools.timeline', 'disabled-by-default-devtools.timeline', 'blink.user_timing', 'v8', 'v8.execute', 'blink', 'loading', 'disabled-by-default-v8.gc',
        ...(compile ? ['disabled-by-default-v8.compile'] : []),
      ],
    });
    await page.goto(app.url, { waitUntil: 'commit' });
    await page.waitForFunction(() => typeof (window as { __bbFirstRender?: number }).__bbFirstRender === 'number', null, { timeout: 30_000 });
    const trace = JSON.parse((await app.browser.stopTracing()).toString('utf8')) as { traceEvents: Ev[] };
    const drawn = await page.evaluate(() => (window as unknown as { __bbFirstRender: number }).__bbFirstRender);
    return { ...breakdown(trace.traceEvents), drawn };
  } finally {
    await context.close();
  }
}

async function profiled(app: ServedApp, dir: string, maps: Map<string, SourceMapConsumer | null>): Promise<{ byFile: Map<string, number>; byFn: Map<string, number>; incl: Map<string, number> }> {
  const context = await app.newContext();
  try {
    await context.addInitScript(MARKER);
    const page = await context.newPage();
    const cdp = await context.newCDPSession(page);
    await cdp.send('Profiler.enable');
    await cdp.send('Profiler.setSamplingInterval', { interval: 100 });
    await cdp.send('Profiler.start');
    await page.goto(app.url, { waitUntil: 'commit' });
    await page.waitForFunction(() => typeof (window as { __bbFirstRender?: number }).__bbFirstRender === 'number', null, { timeout: 30_000 });
    const { profile } = (await cdp.send('Profiler.stop')) as unknown as { profile: CpuProfile };
    return profileTimes(profile, dir, maps);
  } finally {
    await context.close();
  }
}

/** `--ab <dirA> <dirB> [loads]`: alternate cold loads of two built apps, main-thread CPU medians. */
async function ab(dirA: string, dirB: string, loads: number): Promise<void> {
  const { setBuiltDir } = await import('../app-build');
  setBuiltDir(dirA);
  await withServedApp('A', async (a) => {
    setBuiltDir(dirB);
    await withServedApp('B', async (b) => {
      await traced(a);
      await traced(b);
      const ta: number[] = [];
      const tb: number[] = [];
      for (let i = 0; i < loads; i++) {
        ta.push((await traced(a)).total);
        tb.push((await traced(b)).total);
      }
      const f = (xs: number[]) => `median ${median(xs).toFixed(0)} ms [${xs.map((t) => t.toFixed(0)).join(', ')}]`;
      console.log(`A ${dirA}: ${f(ta)}\nB ${dirB}: ${f(tb)}\nB/A of medians ${(median(tb) / median(ta)).toFixed(3)}; B−A per pair median ${median(tb.map((t, i) => t - ta[i]!)).toFixed(0)} ms`);
    });
  });
}

async function main(): Promise<void> {
  if (process.argv[2] === '--dir') {
    const { setBuiltDir } = await import('../app-build');
    setBuiltDir(process.argv[3]!);
    return withServedApp('trace', async (app) => report(app, process.argv[3]!, Number(process.argv[4] ?? 3)));
  }
  if (process.argv[2] === '--ab') return ab(process.argv[3]!, process.argv[4]!, Number(process.argv[5] ?? 9));
  const dir = mkdtempSync(join(tmpdir(), 'blendbench-trace-dist-'));
  execFileSync('npx', ['vite', 'build', '--logLevel', 'error', '--outDir', dir, '--emptyOutDir', '--sourcemap'], { stdio: ['ignore', 'ignore', 'inherit'] });
  const { setBuiltDir } = await import('../app-build');
  setBuiltDir(dir);
  await withServedApp('trace', async (app) => report(app, dir, LOADS));
}

async function report(app: ServedApp, dir: string, LOADS: number): Promise<void> {
    await traced(app); // warm-up
    const totals: number[] = [];
    const drawn: number[] = [];
    const selfs: Map<string, number>[] = [];
    for (let i = 0; i < LOADS; i++) {
      const r = await traced(app, true);
      totals.push(r.total);
      drawn.push(r.drawn);
      selfs.push(r.self);
      if (i === 0) console.log(`tasks of load 1 (start, thread ms, biggest children):\n${r.tasks.join('\n')}`);
    }
    console.log(`main-thread CPU (RunTask thread time) median ${median(totals).toFixed(0)} ms [${totals.map((t) => t.toFixed(0)).join(', ')}]; drawn median ${median(drawn).toFixed(0)} ms`);
    printMedians('self thread time by trace event', selfs);
    if (!PROFILE) return;
    const maps = new Map<string, SourceMapConsumer | null>();
    const files: Map<string, number>[] = [];
    const fns: Map<string, number>[] = [];
    const incls: Map<string, number>[] = [];
    for (let i = 0; i < LOADS; i++) {
      const r = await profiled(app, dir, maps);
      files.push(r.byFile);
      fns.push(r.byFn);
      incls.push(r.incl);
    }
    printMedians('CPU profile self time by source file', files);
    printMedians('CPU profile self time by function', fns, 1);
    printMedians('CPU profile inclusive time by function', incls, 2);
}

await main();
