/**
 * Where a designer edit's main-thread time goes, and whether a change of the code moved it (a
 * diagnostic, not a bench line). The 12-line recipe and the edits are those of
 * bench/designer-edit.bench.ts.
 *
 * - `npx tsx bench/profile/designer-edit-trace.ts --ab <dirA> <dirB> [pairs=4]`: two built apps,
 *   each open in its own page, take turns round by round (A first in odd rounds, B first in even
 *   ones); each round runs the bench's timed batch (120 edits: work per edit mean, input to frame
 *   p95) and a traced batch of 40 edits (self thread time of every main-thread trace event per edit,
 *   by kind). Prints each pair, the medians and the median difference per pair.
 * - `npx tsx bench/profile/designer-edit-trace.ts --dir <dir built with --sourcemap> [batches=3]`: one
 *   build; per edit, the self thread time by trace event and, under the V8 CPU profiler, self and
 *   inclusive time per function (mapped to the sources).
 * Build a folder with `npx vite build --outDir <dir> --emptyOutDir [--sourcemap]`.
 */
import type { Page } from 'playwright-core';
import type { SourceMapConsumer } from 'source-map-js';
import { setBuiltDir } from '../app-build';
import { withServedApp, type ServedApp } from '../chromium';
import { editBatch, openTwelveLineRecipe } from '../designer-edit.bench';
import type { TraceEvent } from '../first-render.bench';
import { median, printMedians, profileTimes, type CpuProfile } from './trace-tools';

const TIMED = 120;
const TRACED = 40;

const KIND: Record<string, string> = {
  FunctionCall: 'script',
  EventDispatch: 'script',
  TimerFire: 'script',
  FireAnimationFrame: 'script',
  RunMicrotasks: 'script',
  'v8.callFunction': 'script',
  V8Execute: 'script',
  EvaluateScript: 'script',
  UpdateLayoutTree: 'style',
  ParseAuthorStyleSheet: 'style',
  Layout: 'layout',
  PrePaint: 'prepaint',
  Paint: 'paint',
  PaintImage: 'paint',
  Layerize: 'layerize',
  UpdateLayer: 'layerize',
  'LocalFrameView::RunPostLifecycleSteps': 'post-lifecycle',
  HitTest: 'hit-test',
  MajorGC: 'gc',
  MinorGC: 'gc',
  'V8.GC_SCAVENGER': 'gc',
};

/** Self thread time [ms per edit] of the main thread's trace events, by event name and by kind. */
function selfTimes(events: TraceEvent[], edits: number): { byName: Map<string, number>; byKind: Map<string, number>; total: number } {
  const thread = events.find((e) => e.name === 'thread_name' && (e.args as { name?: string } | undefined)?.name === 'CrRendererMain');
  if (!thread) throw new Error('designer-edit trace: no renderer main thread');
  const main = events
    .filter((e) => e.pid === thread.pid && e.tid === thread.tid && e.ph === 'X' && e.tdur !== undefined)
    .sort((a, b) => a.ts - b.ts || (b.dur ?? 0) - (a.dur ?? 0));
  const byName = new Map<string, number>();
  const stack: { e: TraceEvent; end: number; child: number }[] = [];
  let total = 0;
  const pop = () => {
    const top = stack.pop()!;
    const ms = (top.e.tdur! - top.child) / 1000 / edits;
    byName.set(top.e.name, (byName.get(top.e.name) ?? 0) + ms);
  };
  for (const e of main) {
    while (stack.length && stack[stack.length - 1]!.end <= e.ts) pop();
    if (stack.length) stack[stack.length - 1]!.child += e.tdur!;
    else total += e.tdur! / 1000 / edits;
    stack.push({ e, end: e.ts + (e.dur ?? 0), child: 0 });
  }
  while (stack.length) pop();
  const byKind = new Map<string, number>();
  for (const [name, ms] of byName) {
    const kind = KIND[name] ?? 'other (task wrappers, IPC, …)';
    byKind.set(kind, (byKind.get(kind) ?? 0) + ms);
  }
  return { byName, byKind, total };
}

async function openDesigner(app: ServedApp): Promise<{ page: Page; label: string }> {
  const context = await app.newContext();
  const page = await context.newPage();
  const label = await openTwelveLineRecipe(page, app.url);
  await editBatch(page, { label, edits: 10, values: ['4', '3'] });
  return { page, label };
}

interface Round {
  mean: number;
  toFrameP95: number;
  traced: ReturnType<typeof selfTimes>;
}

async function round(app: ServedApp, page: Page, label: string): Promise<Round> {
  await page.bringToFront();
  const { times, frames } = await editBatch(page, { label, edits: TIMED, values: ['4', '3'] });
  const toFrame = times.map((t, i) => t + frames[i]!).sort((a, b) => a - b);
  await app.browser.startTracing(page, { categories: ['toplevel', 'devtools.timeline', 'disabled-by-default-devtools.timeline'] });
  await editBatch(page, { label, edits: TRACED, values: ['4', '3'] });
  const { traceEvents } = JSON.parse((await app.browser.stopTracing()).toString()) as { traceEvents: TraceEvent[] };
  return {
    mean: times.reduce((a, t) => a + t, 0) / times.length,
    toFrameP95: toFrame[Math.min(toFrame.length - 1, Math.floor(0.95 * toFrame.length))]!,
    traced: selfTimes(traceEvents, TRACED),
  };
}

async function ab(dirA: string, dirB: string, pairs: number): Promise<void> {
  setBuiltDir(dirA);
  await withServedApp('A', async (a) => {
    setBuiltDir(dirB);
    await withServedApp('B', async (b) => {
      const pa = await openDesigner(a);
      const pb = await openDesigner(b);
      const ra: Round[] = [];
      const rb: Round[] = [];
      for (let i = 0; i < pairs; i++) {
        if (i % 2 === 0) {
          ra.push(await round(a, pa.page, pa.label));
          rb.push(await round(b, pb.page, pb.label));
        } else {
          rb.push(await round(b, pb.page, pb.label));
          ra.push(await round(a, pa.page, pa.label));
        }
        const x = ra[i]!;
        const y = rb[i]!;
        console.log(
          `pair ${i + 1}: work mean ${x.mean.toFixed(2)} / ${y.mean.toFixed(2)} ms, to-frame p95 ${x.toFrameP95.toFixed(1)} / ${y.toFrameP95.toFixed(1)} ms, ` +
            `traced thread time per edit ${x.traced.total.toFixed(2)} / ${y.traced.total.toFixed(2)} ms`,
        );
      }
      const row = (name: string, f: (r: Round) => number, d = 2) =>
        console.log(
          `${name.padEnd(34)} A ${median(ra.map(f)).toFixed(d).padStart(6)}  B ${median(rb.map(f)).toFixed(d).padStart(6)}  B−A per pair median ${median(rb.map((r, i) => f(r) - f(ra[i]!))).toFixed(d)}`,
        );
      console.log(`\nA ${dirA}\nB ${dirB}\nmedians over ${pairs} pairs (ms per edit):`);
      row('work per edit, mean', (r) => r.mean);
      row('input to frame, p95', (r) => r.toFrameP95, 1);
      row('traced thread time, all', (r) => r.traced.total);
      const kinds = new Set([...ra, ...rb].flatMap((r) => [...r.traced.byKind.keys()]));
      for (const k of kinds) row(`  ${k}`, (r) => r.traced.byKind.get(k) ?? 0);
    });
  });
}

async function report(dir: string, batches: number): Promise<void> {
  setBuiltDir(dir);
  await withServedApp('trace', async (app) => {
    const { page, label } = await openDesigner(app);
    const names: Map<string, number>[] = [];
    const totals: number[] = [];
    for (let i = 0; i < batches; i++) {
      const r = await round(app, page, label);
      names.push(r.traced.byName);
      totals.push(r.traced.total);
      console.log(`batch ${i + 1}: work mean ${r.mean.toFixed(2)} ms, to-frame p95 ${r.toFrameP95.toFixed(1)} ms, traced ${r.traced.total.toFixed(2)} ms per edit`);
    }
    printMedians('self thread time per edit by trace event', names, 0.02, 2);
    const cdp = await page.context().newCDPSession(page);
    const maps = new Map<string, SourceMapConsumer | null>();
    const files: Map<string, number>[] = [];
    const fns: Map<string, number>[] = [];
    const incls: Map<string, number>[] = [];
    for (let i = 0; i < batches; i++) {
      await cdp.send('Profiler.enable');
      await cdp.send('Profiler.setSamplingInterval', { interval: 50 });
      await cdp.send('Profiler.start');
      await editBatch(page, { label, edits: TRACED, values: ['4', '3'] });
      const { profile } = (await cdp.send('Profiler.stop')) as unknown as { profile: CpuProfile };
      const r = profileTimes(profile, dir, maps, TRACED);
      files.push(r.byFile);
      fns.push(r.byFn);
      incls.push(r.incl);
    }
    printMedians('CPU profile self time per edit by source file', files, 0.02, 2);
    printMedians('CPU profile self time per edit by function', fns, 0.03, 2);
    printMedians('CPU profile inclusive time per edit by function', incls, 0.1, 2);
  });
}

const [mode, x, y, z] = process.argv.slice(2);
if (mode === '--ab') await ab(x!, y!, Number(z ?? 4));
else if (mode === '--dir') await report(x!, Number(y ?? 3));
else throw new Error('usage: designer-edit-trace.ts --ab <dirA> <dirB> [pairs] | --dir <dir> [batches]');
