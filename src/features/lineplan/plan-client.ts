/**
 * Runs the line plan in a module Web Worker (one worker, kept between runs): a promise for the
 * answer, and cancel (the plan's branch and bound cannot stop half-way, so the worker is ended and
 * a fresh one started on the next run).
 */
import type { LinePlanInput, LinePlanScenarios } from '../../core/lineplan/plan';
import type { PlanReply, PlanRequest } from './protocol';

export type { PlanReply, PlanRequest } from './protocol';

/** The part of `Worker` the client uses (tests supply an in-thread stand-in). */
export interface PlanWorker {
  postMessage(message: PlanRequest): void;
  terminate(): void;
  onmessage: ((e: MessageEvent<PlanReply>) => void) | null;
  onerror: ((e: ErrorEvent) => void) | null;
}

export type PlanOutcome = { kind: 'done'; result: LinePlanScenarios } | { kind: 'cancelled' } | { kind: 'error'; message: string };

const browserWorker = (): PlanWorker =>
  new Worker(new URL('./plan.worker.ts', import.meta.url), { type: 'module' }) as unknown as PlanWorker;
let makeWorker: () => PlanWorker = browserWorker;
let worker: PlanWorker | null = null;
let runs = 0;
let pending: ((o: PlanOutcome) => void) | null = null;

/** Replace the worker factory (jsdom has no Worker); null restores the browser's. */
export function setPlanWorkerFactory(factory: (() => PlanWorker) | null): void {
  worker?.terminate();
  worker = null;
  makeWorker = factory ?? browserWorker;
}

/** Start the worker ahead of the first run (its code loads while the user enters the plan). */
export function warmPlanWorker(): void {
  try {
    worker ??= makeWorker();
  } catch {
    /* the run will report it */
  }
}

/** Plan the line; a run still going is cancelled first. */
export function runPlan(input: LinePlanInput, limited: string[]): Promise<PlanOutcome> {
  cancelPlan();
  const runId = ++runs;
  return new Promise<PlanOutcome>((resolve) => {
    pending = resolve;
    const settle = (o: PlanOutcome) => {
      if (pending !== resolve) return;
      pending = null;
      resolve(o);
    };
    try {
      worker ??= makeWorker();
      worker.onmessage = (e) => {
        if (e.data.runId !== runId) return;
        settle(e.data.ok ? { kind: 'done', result: e.data.result } : { kind: 'error', message: e.data.message });
      };
      worker.onerror = (e) => {
        worker?.terminate();
        worker = null;
        settle({ kind: 'error', message: e.message || 'The planning worker failed.' });
      };
      worker.postMessage({ runId, input, limited });
    } catch (e) {
      settle({ kind: 'error', message: e instanceof Error ? e.message : String(e) });
    }
  });
}

/** Stop the run in progress, if any (its promise resolves 'cancelled'). */
export function cancelPlan(): void {
  if (!pending) return;
  const p = pending;
  pending = null;
  worker?.terminate();
  worker = null;
  p({ kind: 'cancelled' });
}
