/** Messages between the line-plan screen and its Web Worker (plain, structured-clone-safe data). */
import type { LinePlanInput, LinePlanScenarios } from '../../core/lineplan/plan';

export interface PlanRequest {
  runId: number;
  input: LinePlanInput;
  /** Ids of the limited stocks (withdrawn in the plan after they are gone). */
  limited: string[];
}

export type PlanReply = { runId: number; ok: true; result: LinePlanScenarios } | { runId: number; ok: false; message: string };
