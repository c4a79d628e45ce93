/** Messages between the explorer screen and its Web Worker (plain, structured-clone-safe data). */
import type { SubstituteSearchInput, SubstituteSearchProgress, SubstituteSearchResult } from '../../core/search/substitutes';

export type ToWorker = { type: 'start'; runId: number; input: SubstituteSearchInput } | { type: 'cancel'; runId: number };

export type FromWorker =
  | { type: 'progress'; runId: number; progress: SubstituteSearchProgress }
  | { type: 'result'; runId: number; result: SubstituteSearchResult }
  | { type: 'cancelled'; runId: number }
  | { type: 'error'; runId: number; message: string };
