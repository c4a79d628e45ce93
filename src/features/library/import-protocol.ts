/** Messages between the Stocks screen and its import Web Worker (plain, structured-clone-safe data). */
import type { Component } from '../../core/formulation/model';
import type { ImportPreview, ImportPreviewOptions } from '../../state/library-import';

export type ToImportWorker =
  | { type: 'start'; runId: number; fileName: string; text: string; existing: Component[]; options?: ImportPreviewOptions }
  | { type: 'cancel'; runId: number };

export type FromImportWorker =
  | { type: 'progress'; runId: number; done: number; total: number }
  | { type: 'result'; runId: number; preview: ImportPreview }
  | { type: 'cancelled'; runId: number }
  | { type: 'error'; runId: number; message: string };
