/**
 * The chunked substitute-search loop, shared by the Web Worker and by tests (which run it
 * in-thread). Solves combinations in chunks of about `sliceMs`, reports progress after each, posts
 * the ranked result so far whenever another combination size is settled (so the screen can show
 * final candidates early), and yields to the event loop between chunks so a cancel message can arrive.
 */
import { createSubstituteSearch, type SubstituteSearchInput } from '../../core/search/substitutes';
import type { FromWorker } from './protocol';
import { BlendbenchInputError } from '../../core/errors';

export interface RunnerOptions {
  /** Target duration of one chunk [ms]. */
  sliceMs?: number;
  /** Clock [ms]; performance.now in the worker. */
  now?: () => number;
  /** Yield to the event loop between chunks. */
  yieldNow?: () => Promise<void>;
}

export async function runSearch(
  runId: number,
  input: SubstituteSearchInput,
  post: (m: FromWorker) => void,
  isCancelled: () => boolean,
  opts: RunnerOptions = {},
): Promise<void> {
  const sliceMs = opts.sliceMs ?? 40;
  const now = opts.now ?? (() => performance.now());
  const yieldNow = opts.yieldNow ?? (() => new Promise<void>((r) => setTimeout(r, 0)));
  try {
    const search = createSubstituteSearch(input);
    let budget = 50;
    let posted = 0;
    post({ type: 'progress', runId, progress: search.progress() });
    for (;;) {
      if (isCancelled()) return post({ type: 'cancelled', runId });
      const t0 = now();
      const p = search.step(budget);
      const dt = now() - t0;
      // Aim each chunk at about sliceMs so progress stays smooth and cancel stays prompt.
      if (dt > 0) budget = Math.max(1, Math.min(20000, Math.round((budget * sliceMs) / dt)));
      else budget = Math.min(20000, budget * 2);
      post({ type: 'progress', runId, progress: p });
      if (p.done) break;
      if (p.completedSize > posted) {
        posted = p.completedSize;
        post({ type: 'partial', runId, result: search.result() });
      }
      await yieldNow();
    }
    if (isCancelled()) return post({ type: 'cancelled', runId });
    post({ type: 'result', runId, result: search.result() });
  } catch (e) {
    post(
      e instanceof BlendbenchInputError
        ? { type: 'error', runId, message: e.message, field: e.field, value: e.value }
        : { type: 'error', runId, message: e instanceof Error ? e.message : String(e) },
    );
  }
}
