/**
 * Starts a substitute search in module Web Workers and follows it: progress callbacks, the ranked
 * candidates as each combination size is settled, a promise for the outcome, and cancel (asks the
 * workers to stop, then ends them).
 *
 * Parallel: `navigator.hardwareConcurrency − 1` workers (at least one; the main thread keeps a
 * core), each running one shard of the combinations (`shard` in the core search). Their counts are
 * added and their candidates merged with `mergeSubstituteResults`, which gives exactly the answer
 * of one search. Ranked candidates are passed on once every worker has settled another size.
 *
 * The workers are kept between searches (a pool): starting a module worker — fetching, compiling and
 * instantiating the solver — costs more than a small search, and a fresh worker per search left
 * garbage behind each time. A search that is cancelled, or fails, ends its workers at once; the next
 * search starts new ones. `prewarmSearchWorkers` starts the pool ahead of the first search (the
 * explorer does it when it opens) and `releaseSearchWorkers` ends it (when the explorer closes).
 */
import {
  mergeSubstituteResults,
  type SubstituteSearchInput,
  type SubstituteSearchProgress,
  type SubstituteSearchResult,
} from '../../core/search/substitutes';
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
  /** `field`/`value`: of a core input error (see `FromWorker`), for `userMessage`. */
  | { kind: 'error'; message: string; field?: string; value?: unknown };

export interface SearchHandle {
  outcome: Promise<SearchOutcome>;
  cancel(): void;
  /** Number of workers the search runs in. */
  readonly workers: number;
}

function browserWorker(): WorkerLike {
  return new Worker(new URL('./explore.worker.ts', import.meta.url), { type: 'module' }) as unknown as WorkerLike;
}

let makeWorker: () => WorkerLike = browserWorker;
let workerCount: number | null = null;

/** Idle workers, ready for the next search. */
const idle: WorkerLike[] = [];

/** Replace the worker factory (unit tests under jsdom, which has no Worker). Pass null to restore. */
export function setWorkerFactory(factory: (() => WorkerLike) | null): void {
  releaseSearchWorkers();
  makeWorker = factory ?? browserWorker;
}

/** Fix the number of workers (tests); null → `navigator.hardwareConcurrency − 1`, at least one. */
export function setWorkerCount(count: number | null): void {
  releaseSearchWorkers();
  workerCount = count;
}

/** Start the pool of search workers now, so that the first search does not wait for them. */
export function prewarmSearchWorkers(): void {
  try {
    while (idle.length < searchWorkerCount()) idle.push(makeWorker());
  } catch {
    /* no workers here (the search will report it) */
  }
}

/** End the idle search workers (a running search keeps its own until it ends). */
export function releaseSearchWorkers(): void {
  for (const w of idle.splice(0)) w.terminate();
}

function takeWorker(): WorkerLike {
  return idle.pop() ?? makeWorker();
}

/** Workers for a search: one per core but the main thread's, at least one, at most 16. */
export function searchWorkerCount(): number {
  if (workerCount !== null) return Math.max(1, Math.floor(workerCount));
  const cores = typeof navigator !== 'undefined' && Number.isFinite(navigator.hardwareConcurrency) ? navigator.hardwareConcurrency : 2;
  return Math.min(16, Math.max(1, cores - 1));
}

let nextRunId = 1;

/**
 * Start a search.
 *
 * @param input - the search; `limit` applies to the merged list (each worker keeps all its candidates)
 * @param onProgress - counts added over the workers, after each chunk of any worker
 * @param onRanked - the merged ranked result so far, each time every worker has settled one more
 *   combination size (its candidates of up to `completedSize` stocks are final)
 */
export function startSearch(
  input: SubstituteSearchInput,
  onProgress: (p: SubstituteSearchProgress) => void,
  onRanked: (r: SubstituteSearchResult) => void = () => {},
): SearchHandle {
  const runId = nextRunId++;
  const count = searchWorkerCount();
  const workers: WorkerLike[] = [];
  const progress: (SubstituteSearchProgress | null)[] = new Array(count).fill(null);
  const partial: (SubstituteSearchResult | null)[] = new Array(count).fill(null);
  const final: (SubstituteSearchResult | null)[] = new Array(count).fill(null);
  let shownSize = 0;
  let settle: (o: SearchOutcome) => void = () => {};
  let settled = false;
  const outcome = new Promise<SearchOutcome>((resolve) => {
    settle = (o) => {
      if (settled) return;
      settled = true;
      for (const w of workers) {
        w.onmessage = null;
        w.onerror = null;
        // Finished workers go back to the pool; a cancelled or failed search ends its workers.
        if (o.kind === 'done' && idle.length < searchWorkerCount()) idle.push(w);
        else w.terminate();
      }
      workers.length = 0;
      resolve(o);
    };
  });
  const limit = input.limit;
  const shardInput = (index: number): SubstituteSearchInput => {
    const { limit: _all, ...rest } = input;
    return { ...rest, shard: { index, count } };
  };
  const sumProgress = (): SubstituteSearchProgress | null => {
    if (progress.some((p) => p === null)) return null;
    const ps = progress as SubstituteSearchProgress[];
    return {
      evaluated: ps.reduce((n, p) => n + p.evaluated, 0),
      total: ps.reduce((n, p) => n + p.total, 0),
      feasible: ps.reduce((n, p) => n + p.feasible, 0),
      // Distinct recipes are known exactly only after the merge; before it, the largest shard's count.
      distinct: Math.max(...ps.map((p) => p.distinct)),
      lpCount: ps.reduce((n, p) => n + p.lpCount, 0),
      skipped: ps.reduce((n, p) => n + p.skipped, 0),
      done: ps.every((p) => p.done),
      completedSize: Math.min(...ps.map((p) => p.completedSize)),
    };
  };
  const onMessage = (index: number, m: FromWorker): void => {
    if (settled || m.runId !== runId) return;
    if (m.type === 'progress') {
      progress[index] = m.progress;
      const p = sumProgress();
      if (p) onProgress(p);
    } else if (m.type === 'partial' || m.type === 'result') {
      if (m.type === 'partial') partial[index] = m.result;
      else final[index] = partial[index] = m.result;
      if (final.every((r) => r !== null)) {
        settle({ kind: 'done', result: mergeSubstituteResults(final as SubstituteSearchResult[], limit) });
        return;
      }
      if (partial.every((r) => r !== null)) {
        const size = Math.min(...partial.map((r) => r!.completedSize));
        if (size > shownSize) {
          shownSize = size;
          onRanked(mergeSubstituteResults(partial as SubstituteSearchResult[], limit));
        }
      }
    } else if (m.type === 'cancelled') settle({ kind: 'cancelled' });
    else settle(m.field === undefined ? { kind: 'error', message: m.message } : { kind: 'error', message: m.message, field: m.field, value: m.value });
  };
  try {
    for (let index = 0; index < count; index++) {
      const w = takeWorker();
      workers.push(w);
      w.onmessage = (e) => onMessage(index, e.data);
      w.onerror = (e) => settle({ kind: 'error', message: e.message || 'The search worker failed.' });
      w.postMessage({ type: 'start', runId, input: shardInput(index) });
    }
  } catch (e) {
    settle({ kind: 'error', message: e instanceof Error ? e.message : String(e) });
  }
  return {
    outcome,
    workers: count,
    cancel() {
      for (const w of workers) w.postMessage({ type: 'cancel', runId });
      // Do not wait for the workers to reach a chunk boundary: end them now.
      settle({ kind: 'cancelled' });
    },
  };
}
