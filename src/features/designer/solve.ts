/** Runs the core solver for the designer and turns its answer into lines or a notice. */
import type { BlendMethod } from '../../core/blending/blend-viscosity';
import type { BlendTargets, Component, Recipe, RecipeLine } from '../../core/model';
import type { SolveNotice } from './store';

export type SolveOutcome = { kind: 'optimal'; lines: RecipeLine[]; message: string } | Exclude<SolveNotice, { kind: 'optimal' }>;

export function runSolve(
  _components: readonly Component[],
  _targets: BlendTargets,
  _reference: Recipe | null,
  _method: BlendMethod,
): SolveOutcome {
  return { kind: 'error', message: 'The solver is not connected yet in this build.' };
}
