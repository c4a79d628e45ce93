/**
 * Checks a library import off the main thread: a module Web Worker where the browser has one, else the
 * same sliced loop in the page (it yields between slices, so the page stays responsive). Progress
 * callbacks, a promise for the outcome, and cancel.
 */
import type { Component } from '../../core/formulation/model';
import type { ImportPreview, ImportPreviewOptions } from '../../state/library-import';
import type { FromImportWorker, ToImportWorker } from './import-protocol';
import { runImportPreview } from './import-runner';

/** The part of `Worker` the client uses (lets tests supply a stand-in). */
export interface ImportWorkerLike {
  postMessage(message: ToImportWorker): void;
  terminate(): void;
  onmessage: ((e: MessageEvent<FromImportWorker>) => void) | null;
  onerror: ((e: ErrorEvent) => void) | null;
}

export type ImportOutcome = { kind: 'done'; preview: ImportPreview } | { kind: 'cancelled' } | { kind: 'error'; message: string };

export interface ImportHandle {
  outcome: Promise<ImportOutcome>;
  cancel(): void;
}

function browserWorker(): ImportWorkerLike | null {
  if (typeof Worker === 'undefined') return null;
  return new Worker(new URL('./import.worker.ts', import.meta.url), { type: 'module' }) as unknown as ImportWorkerLike;
}

let makeWorker: () => ImportWorkerLike | null = browserWorker;

/** Replace the worker factory (tests); a factory returning null runs in the page. Pass null to restore. */
export function setImportWorkerFactory(factory: (() => ImportWorkerLike | null) | null): void {
  makeWorker = factory ?? browserWorker;
}

let nextRunId = 1;

export function startImportPreview(
  fileName: string,
  text: string,
  existing: readonly Component[],
  onProgress: (done: number, total: number) => void,
  options: ImportPreviewOptions = {},
): ImportHandle {
  const runId = nextRunId++;
  let worker: ImportWorkerLike | null = null;
  let cancelled = false;
  let settle: (o: ImportOutcome) => void = () => {};
  let settled = false;
  const outcome = new Promise<ImportOutcome>((resolve) => {
    settle = (o) => {
      if (settled) return;
      settled = true;
      worker?.terminate();
      worker = null;
      resolve(o);
    };
  });
  const onMessage = (m: FromImportWorker) => {
    if (m.runId !== runId) return;
    if (m.type === 'progress') onProgress(m.done, m.total);
    else if (m.type === 'result') settle({ kind: 'done', preview: m.preview });
    else if (m.type === 'cancelled') settle({ kind: 'cancelled' });
    else settle({ kind: 'error', message: m.message });
  };
  try {
    worker = makeWorker();
  } catch {
    worker = null; // no worker here: check in the page instead
  }
  if (worker) {
    worker.onmessage = (e) => onMessage(e.data);
    worker.onerror = (e) => settle({ kind: 'error', message: e.message || 'The import check stopped unexpectedly.' });
    worker.postMessage({ type: 'start', runId, fileName, text, existing: [...existing], options });
  } else {
    void runImportPreview(runId, fileName, text, existing, onMessage, () => cancelled, { preview: options });
  }
  return {
    outcome,
    cancel() {
      cancelled = true;
      worker?.postMessage({ type: 'cancel', runId });
      settle({ kind: 'cancelled' });
    },
  };
}
