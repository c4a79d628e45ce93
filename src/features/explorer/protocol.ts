/** Messages between the explorer screen and its Web Workers (plain, structured-clone-safe data). */
import type { SubstituteSearchInput, SubstituteSearchProgress, SubstituteSearchResult } from '../../core/search/substitutes';

export type ToWorker = { type: 'start'; runId: number; input: SubstituteSearchInput } | { type: 'cancel'; runId: number };

export type FromWorker =
  | { type: 'progress'; runId: number; progress: SubstituteSearchProgress }
  /** The ranked result so far, posted each time another combination size is settled (`completedSize`). */
  | { type: 'partial'; runId: number; result: SubstituteSearchResult }
  | { type: 'result'; runId: number; result: SubstituteSearchResult }
  | { type: 'cancelled'; runId: number }
  | { type: 'error'; runId: number; message: string };
