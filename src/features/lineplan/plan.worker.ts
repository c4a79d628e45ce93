/// <reference lib="webworker" />
// Module Web Worker: plans the line (both plans and the marginal values) off the main thread.
import { planLineScenarios } from '../../core/lineplan/plan';
import type { PlanRequest, PlanReply } from './protocol';

const scope = self as unknown as DedicatedWorkerGlobalScope;

scope.onmessage = (e: MessageEvent<PlanRequest>) => {
  const { runId, input, limited } = e.data;
  let reply: PlanReply;
  try {
    reply = { runId, ok: true, result: planLineScenarios(input, limited) };
  } catch (err) {
    reply = { runId, ok: false, message: err instanceof Error ? err.message : String(err) };
  }
  scope.postMessage(reply);
};
