// An in-thread stand-in for the explorer's Web Worker (jsdom has no Worker): same protocol, same runner.
import type { WorkerLike } from '../../../src/features/explorer/search-client';
import type { FromWorker, ToWorker } from '../../../src/features/explorer/protocol';
import { runSearch } from '../../../src/features/explorer/runner';

export function inThreadWorker(opts: { sliceMs?: number } = {}): () => WorkerLike {
  return () => {
    const cancelled = new Set<number>();
    let terminated = false;
    const w: WorkerLike = {
      onmessage: null,
      onerror: null,
      terminate() {
        terminated = true;
      },
      postMessage(msg: ToWorker) {
        if (msg.type === 'cancel') {
          cancelled.add(msg.runId);
          return;
        }
        setTimeout(() => {
          void runSearch(
            msg.runId,
            structuredClone(msg.input),
            (m: FromWorker) => {
              if (!terminated) w.onmessage?.({ data: structuredClone(m) } as MessageEvent<FromWorker>);
            },
            () => terminated || cancelled.has(msg.runId),
            { sliceMs: opts.sliceMs ?? 5 },
          );
        }, 0);
      },
    };
    return w;
  };
}
