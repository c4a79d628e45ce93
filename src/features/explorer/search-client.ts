/**
 * Starts a substitute search in a module Web Worker and follows it: progress callbacks, a promise
 * for the outcome, and cancel (asks the worker to stop, then ends it).
 */
import type { SubstituteSearchInput, SubstituteSearchProgress, SubstituteSearchResult } from '../../core/search/substitutes';
import type { FromWorker, ToWorker } from './protocol';

/** The part of `Worker` the client uses (lets tests supply an in-thread stand-in). */
export interface WorkerLike {
  postMessage(message: ToWorker): void;
  terminate(): void;
  onmessage: ((e: MessageEvent<FromWorker>) => void) | null;
  onerror: ((e: ErrorEvent) => void) | null;
}

export type SearchOutcome =
  | { kind: 'done'; result: SubstituteSearchResult }
  | { kind: 'cancelled' }
  | { kind: 'error'; message: string };

export interface SearchHandle {
  outcome: Promise<SearchOutcome>;
  cancel(): void;
}

function browserWorker(): WorkerLike {
  return new Worker(new URL('./explore.worker.ts', import.meta.url), { type: 'module' }) as unknown as WorkerLike;
}

let makeWorker: () => WorkerLike = browserWorker;

/** Replace the worker factory (unit tests under jsdom, which has no Worker). Pass null to restore. */
export function setWorkerFactory(factory: (() => WorkerLike) | null): void {
  makeWorker = factory ?? browserWorker;
}

let nextRunId = 1;

export function startSearch(input: SubstituteSearchInput, onProgress: (p: SubstituteSearchProgress) => void): SearchHandle {
  const runId = nextRunId++;
  let worker: WorkerLike | null = null;
  let settle: (o: SearchOutcome) => void = () => {};
  let settled = false;
  const outcome = new Promise<SearchOutcome>((resolve) => {
    settle = (o) => {
      if (settled) return;
      settled = true;
      worker?.terminate();
      worker = null;
      resolve(o);
    };
  });
  try {
    worker = makeWorker();
    worker.onmessage = (e) => {
      const m = e.data;
      if (m.runId !== runId) return;
      if (m.type === 'progress') onProgress(m.progress);
      else if (m.type === 'result') settle({ kind: 'done', result: m.result });
      else if (m.type === 'cancelled') settle({ kind: 'cancelled' });
      else settle({ kind: 'error', message: m.message });
    };
    worker.onerror = (e) => settle({ kind: 'error', message: e.message || 'The search worker failed.' });
    worker.postMessage({ type: 'start', runId, input });
  } catch (e) {
    settle({ kind: 'error', message: e instanceof Error ? e.message : String(e) });
  }
  return {
    outcome,
    cancel() {
      worker?.postMessage({ type: 'cancel', runId });
      // Do not wait for the worker to reach a chunk boundary: end it now.
      settle({ kind: 'cancelled' });
    },
  };
}
