/// <reference lib="webworker" />
// Module Web Worker running the substitute search off the main thread.
import type { FromWorker, ToWorker } from './protocol';
import { runSearch } from './runner';

const scope = self as unknown as DedicatedWorkerGlobalScope;
const cancelled = new Set<number>();

scope.onmessage = (e: MessageEvent<ToWorker>) => {
  const msg = e.data;
  if (msg.type === 'cancel') {
    cancelled.add(msg.runId);
    return;
  }
  void runSearch(msg.runId, msg.input, (m: FromWorker) => scope.postMessage(m), () => cancelled.has(msg.runId));
};
