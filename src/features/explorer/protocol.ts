/** Messages between the explorer screen and its Web Workers (plain, structured-clone-safe data). */
import type { SubstituteSearchInput, SubstituteSearchProgress, SubstituteSearchResult } from '../../core/search/substitutes';

export type ToWorker = { type: 'start'; runId: number; input: SubstituteSearchInput } | { type: 'cancel'; runId: number };

export type FromWorker =
  | { type: 'progress'; runId: number; progress: SubstituteSearchProgress }
  /** The ranked result so far, posted each time another combination size is settled (`completedSize`). */
  | { type: 'partial'; runId: number; result: SubstituteSearchResult }
  | { type: 'result'; runId: number; result: SubstituteSearchResult }
  | { type: 'cancelled'; runId: number }
  /**
   * The core's own message, with the offending field and value of a core input error: the screen
   * writes it in the user's words and number format (`userMessage`), which the worker does not know.
   */
  | { type: 'error'; runId: number; message: string; field?: string; value?: unknown };
