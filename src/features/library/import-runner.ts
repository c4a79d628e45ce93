/**
 * The sliced import-preview loop, shared by the Web Worker and by the in-page fallback (and tests):
 * checks rows in slices of about `sliceMs`, reports progress after each, and yields to the event loop
 * between slices so a cancel can arrive.
 */
import type { Component } from '../../core/formulation/model';
import { libraryImportPreviewer, type ImportPreviewOptions } from '../../state/library-import';
import type { FromImportWorker } from './import-protocol';

export interface ImportRunnerOptions {
  /** Target duration of one slice [ms]. */
  sliceMs?: number;
  now?: () => number;
  yieldNow?: () => Promise<void>;
  /** How the preview writes numbers of its own (the settings' decimal separator). */
  preview?: ImportPreviewOptions | undefined;
}

export async function runImportPreview(
  runId: number,
  fileName: string,
  text: string,
  existing: readonly Component[],
  post: (m: FromImportWorker) => void,
  isCancelled: () => boolean,
  opts: ImportRunnerOptions = {},
): Promise<void> {
  const sliceMs = opts.sliceMs ?? 30;
  const now = opts.now ?? (() => performance.now());
  const yieldNow = opts.yieldNow ?? (() => new Promise<void>((r) => setTimeout(r, 0)));
  try {
    const previewer = libraryImportPreviewer(fileName, text, existing, opts.preview);
    post({ type: 'progress', runId, done: 0, total: previewer.total });
    let budget = 200;
    while (previewer.done < previewer.total) {
      await yieldNow();
      if (isCancelled()) return post({ type: 'cancelled', runId });
      const t0 = now();
      previewer.step(budget);
      const dt = now() - t0;
      // Aim each slice at about sliceMs so progress stays smooth and cancel stays prompt.
      budget = dt > 0 ? Math.max(20, Math.min(5000, Math.round((budget * sliceMs) / dt))) : Math.min(5000, budget * 2);
      post({ type: 'progress', runId, done: previewer.done, total: previewer.total });
    }
    if (isCancelled()) return post({ type: 'cancelled', runId });
    post({ type: 'result', runId, preview: previewer.result() });
  } catch (e) {
    post({ type: 'error', runId, message: e instanceof Error ? e.message : String(e) });
  }
}
