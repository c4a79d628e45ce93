/** The cost–solvency trade-off of one candidate's combination (ε-constraint sweep; derived, never stored). */
import type { BlendMethod } from '../../core/blending/blend-viscosity';
import { epsilonConstraintSweep, type FrontierPoint } from '../../core/search/frontier';
import type { BlendTargets, Component } from '../../core/formulation/model';
import { userMessage } from '../../state/messages';
import type { SayNumbers } from '../../state/checks';

export type TradeOff = { kind: 'points'; points: FrontierPoint[] } | { kind: 'error'; message: string };

/**
 * Least-cost recipe of the combination at each aniline-point limit from its cheapest blend down to
 * its most solvent one. Fast enough for the main thread (one combination, ~11 small LPs).
 */
export function combinationTradeOff(
  components: readonly Component[],
  targets: BlendTargets,
  componentIds: readonly string[],
  method: BlendMethod,
  /** How a refusal writes its numbers (the app's formatter). */
  words: SayNumbers,
): TradeOff {
  // The fixed additive is added by the sweep itself.
  const ids = componentIds.filter((id) => id !== targets.additive?.componentId);
  try {
    return { kind: 'points', points: epsilonConstraintSweep({ components, targets: { ...targets, objective: 'cost' }, componentIds: ids, method }) };
  } catch (e) {
    return { kind: 'error', message: userMessage(e, { components, words }) };
  }
}
