/**
 * Where the slowest designer edits' time goes (a diagnostic, not a bench line): one build, the
 * bench's 12-line recipe and edits, traced with a mark before each edit and after its frame, so
 * that each edit's main-thread trace events can be told apart. Prints, for the slowest edits by
 * input-to-frame time (as the bench counts it) and for the median edit, the self thread time by
 * kind, the wall time of the window against its thread time (a gap is time the thread waited for a
 * core), and the largest single events.
 *
 * `npx tsx bench/profile/designer-slow-edits.ts <dir> [batches=3] [edits=120]`
 * `INJECT_CSS='<css>'` adds a style sheet to the page first (e.g. to take a part of the screen out of
 * layout and see what it cost); `QUIET=1` prints only each batch's p95 and the summary.
 */
import { setBuiltDir } from '../app-build';
import { withServedApp } from '../chromium';
import { EDIT_BATCH, openTwelveLineRecipe } from '../designer-edit.bench';
import type { TraceEvent } from '../first-render.bench';
import { median } from './trace-tools';

const KIND: Record<string, string> = {
  FunctionCall: 'script', EventDispatch: 'script', TimerFire: 'script', FireAnimationFrame: 'script', RunMicrotasks: 'script',
  'v8.callFunction': 'script', V8Execute: 'script', EvaluateScript: 'script', UpdateLayoutTree: 'style', Layout: 'layout',
  PrePaint: 'prepaint', Paint: 'paint', Layerize: 'layerize', UpdateLayer: 'layerize', HitTest: 'hit-test',
  MajorGC: 'gc', MinorGC: 'gc', 'V8.GC_SCAVENGER': 'gc', 'BlinkGC.AtomicPhase': 'gc', 'V8.GCScavenger': 'gc', 'V8.GCIncrementalMarking': 'gc',
  'V8.GCFinalizeMC': 'gc', 'V8.GCCompactor': 'gc', 'V8.GC_MC_BACKGROUND_MARKING': 'gc',
};

const MARKED = EDIT_BATCH.replace('const t0 = performance.now();', "performance.mark('bb-e' + i); const t0 = performance.now();").replace(
  'wallTimes.push(performance.now() - t0);',
  "wallTimes.push(performance.now() - t0); performance.mark('bb-f' + i);",
);
if (MARKED === EDIT_BATCH) throw new Error('designer-slow-edits: the bench batch changed; update the marks');

interface EditCost {
  i: number;
  toFrame: number;
  work: number;
  frame: number;
  wall: number;
  thread: number;
  byKind: Map<string, number>;
  big: { name: string; ms: number }[];
  tasks: number;
}

function analyse(events: TraceEvent[], res: { times: number[]; frames: number[] }): EditCost[] {
  const thread = events.find((e) => e.name === 'thread_name' && (e.args as { name?: string } | undefined)?.name === 'CrRendererMain');
  if (!thread) throw new Error('no renderer main thread');
  const marks = new Map<string, number>();
  for (const e of events) if (e.name.startsWith('bb-e') || e.name.startsWith('bb-f')) if (!marks.has(e.name)) marks.set(e.name, e.ts);
  const main = events
    .filter((e) => e.pid === thread.pid && e.tid === thread.tid && e.ph === 'X' && e.tdur !== undefined)
    .sort((a, b) => a.ts - b.ts || (b.dur ?? 0) - (a.dur ?? 0));
  // Self thread time of each event.
  const self = new Map<TraceEvent, number>();
  const top = new Set<TraceEvent>();
  const stack: { e: TraceEvent; end: number; child: number }[] = [];
  const pop = () => {
    const t = stack.pop()!;
    self.set(t.e, (t.e.tdur! - t.child) / 1000);
  };
  for (const e of main) {
    while (stack.length && stack[stack.length - 1]!.end <= e.ts) pop();
    if (stack.length) stack[stack.length - 1]!.child += e.tdur!;
    else top.add(e);
    stack.push({ e, end: e.ts + (e.dur ?? 0), child: 0 });
  }
  while (stack.length) pop();
  const out: EditCost[] = [];
  for (let i = 0; i < res.times.length; i++) {
    const a = marks.get(`bb-e${i}`);
    const b = marks.get(`bb-f${i}`);
    if (a === undefined || b === undefined) continue;
    const byKind = new Map<string, number>();
    const big: { name: string; ms: number }[] = [];
    let threadMs = 0;
    let tasks = 0;
    for (const e of main) {
      if (e.ts < a || e.ts >= b) continue;
      const ms = self.get(e) ?? 0;
      const kind = KIND[e.name] ?? `other:${e.name}`;
      byKind.set(kind, (byKind.get(kind) ?? 0) + ms);
      if (ms > 0.8) big.push({ name: e.name, ms });
      if (top.has(e)) {
        threadMs += e.tdur! / 1000;
        tasks++;
      }
    }
    big.sort((x, y) => y.ms - x.ms);
    out.push({ i, toFrame: res.times[i]! + res.frames[i]!, work: res.times[i]!, frame: res.frames[i]!, wall: (b - a) / 1000, thread: threadMs, byKind, big: big.slice(0, 5), tasks });
  }
  return out;
}

function show(c: EditCost): string {
  const kinds = [...c.byKind].filter(([, v]) => v >= 0.2).sort((x, y) => y[1] - x[1]).map(([k, v]) => `${k} ${v.toFixed(1)}`).join(', ');
  return `edit ${String(c.i).padStart(3)}: to-frame ${c.toFrame.toFixed(1)} (work ${c.work.toFixed(1)} + frame ${c.frame.toFixed(1)}), window wall ${c.wall.toFixed(1)} thread ${c.thread.toFixed(1)} ms in ${c.tasks} tasks | ${kinds} | biggest: ${c.big.map((b) => `${b.name} ${b.ms.toFixed(1)}`).join(', ')}`;
}

const [dir, batchesArg, editsArg] = process.argv.slice(2);
if (!dir) throw new Error('usage: designer-slow-edits.ts <dir> [batches] [edits]');
setBuiltDir(dir);
const batches = Number(batchesArg ?? 3);
const edits = Number(editsArg ?? 120);
await withServedApp('slow-edits', async (app) => {
  const context = await app.newContext();
  const page = await context.newPage();
  const label = await openTwelveLineRecipe(page, app.url);
  // An experiment: a style sheet added to the page before the edits (e.g. to take a part of the screen out of layout).
  if (process.env.INJECT_CSS) await page.addStyleTag({ content: process.env.INJECT_CSS });
  await page.evaluate(`(${EDIT_BATCH})(${JSON.stringify({ label, edits: 10, values: ['4', '3'] })})`);
  const all: EditCost[] = [];
  for (let k = 0; k < batches; k++) {
    await app.browser.startTracing(page, { categories: ['toplevel', 'devtools.timeline', 'disabled-by-default-devtools.timeline', 'blink.user_timing', 'v8', 'blink.gc'] });
    const res = (await page.evaluate(`(${MARKED})(${JSON.stringify({ label, edits, values: ['4', '3'] })})`)) as { times: number[]; frames: number[] };
    const { traceEvents } = JSON.parse((await app.browser.stopTracing()).toString()) as { traceEvents: TraceEvent[] };
    const costs = analyse(traceEvents, res);
    all.push(...costs);
    const sorted = [...costs].sort((x, y) => y.toFrame - x.toFrame);
    const p95 = [...costs].map((c) => c.toFrame).sort((x, y) => x - y)[Math.floor(0.95 * costs.length)]!;
    if (process.env.QUIET) { console.log(`batch ${k + 1}: to-frame p95 ${[...costs].map((c) => c.toFrame).sort((x, y) => x - y)[Math.floor(0.95 * costs.length)]!.toFixed(1)} median ${median(costs.map((c) => c.toFrame)).toFixed(1)}`); continue; }
    console.log(`\n== batch ${k + 1}: ${costs.length} edits, to-frame p95 ${p95.toFixed(1)} ms, median ${median(costs.map((c) => c.toFrame)).toFixed(1)} ms; the ${Math.ceil(costs.length * 0.08)} slowest:`);
    for (const c of sorted.slice(0, Math.ceil(costs.length * 0.08))) console.log(show(c));
    const mid = sorted[sorted.length >> 1]!;
    console.log('median edit: ' + show(mid));
  }
  // Over all batches: mean self time by kind, slowest 5 % against the rest.
  const sorted = [...all].sort((x, y) => y.toFrame - x.toFrame);
  const n = Math.ceil(all.length * 0.05);
  const avg = (cs: EditCost[]) => {
    const m = new Map<string, number>();
    for (const c of cs) for (const [k, v] of c.byKind) m.set(k, (m.get(k) ?? 0) + v / cs.length);
    return m;
  };
  const slow = avg(sorted.slice(0, n));
  const rest = avg(sorted.slice(n));
  console.log(`\n== mean self thread time per edit by kind: slowest ${n} of ${all.length} | the rest ==`);
  const keys = [...new Set([...slow.keys(), ...rest.keys()])].sort((x, y) => (rest.get(y) ?? 0) - (rest.get(x) ?? 0));
  const sum = (m: Map<string, number>) => [...m.values()].reduce((a, v) => a + v, 0);
  console.log(`${sum(slow).toFixed(2).padStart(7)} ${sum(rest).toFixed(2).padStart(7)}  ALL (self thread time)`);
  for (const k of keys) if ((rest.get(k) ?? 0) >= 0.08) console.log(`${(slow.get(k) ?? 0).toFixed(2).padStart(7)} ${(rest.get(k) ?? 0).toFixed(2).padStart(7)}  ${k}`);
  const mw = (cs: EditCost[], f: (c: EditCost) => number) => (cs.reduce((s, c) => s + f(c), 0) / cs.length).toFixed(2);
  console.log(`window wall ${mw(sorted.slice(0, n), (c) => c.wall)} | ${mw(sorted.slice(n), (c) => c.wall)}; thread ${mw(sorted.slice(0, n), (c) => c.thread)} | ${mw(sorted.slice(n), (c) => c.thread)}; to-frame ${mw(sorted.slice(0, n), (c) => c.toFrame)} | ${mw(sorted.slice(n), (c) => c.toFrame)}`);
  await context.close();
});
