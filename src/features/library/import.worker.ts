/// <reference lib="webworker" />
// Module Web Worker checking a library import (CSV or JSON) off the main thread.
import type { FromImportWorker, ToImportWorker } from './import-protocol';
import { runImportPreview } from './import-runner';

const scope = self as unknown as DedicatedWorkerGlobalScope;
const cancelled = new Set<number>();

scope.onmessage = (e: MessageEvent<ToImportWorker>) => {
  const msg = e.data;
  if (msg.type === 'cancel') {
    cancelled.add(msg.runId);
    return;
  }
  void runImportPreview(msg.runId, msg.fileName, msg.text, msg.existing, (m: FromImportWorker) => scope.postMessage(m), () =>
    cancelled.has(msg.runId), { preview: msg.options },
  );
};
