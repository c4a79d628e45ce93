/** Runs the core solver for the designer and turns its answer into lines or a notice. */
import type { BlendMethod } from '../../core/blending/blend-viscosity';
import type { BlendTargets, Component, Recipe, RecipeLine } from '../../core/formulation/model';
import { solveBlend } from '../../core/solver/solve-blend';
import { OBJECTIVE_LABEL } from './TargetsForm';
import type { SolveNotice } from './store';

export type SolveOutcome = { kind: 'optimal'; lines: RecipeLine[]; message: string } | Exclude<SolveNotice, { kind: 'optimal' }>;

/** Plain words for the solver's binding-constraint keys. */
const BINDING_LABEL: Record<string, string> = {
  components: 'usable stocks',
  bounds: 'per-stock limits',
  additive: 'additive treat rate',
  'kv40-min': 'lower end of the viscosity band',
  'kv40-max': 'upper end of the viscosity band',
  band: 'viscosity band',
  'min-vi': 'minimum VI',
  'max-aniline': 'maximum aniline point',
  'max-polymer': 'maximum polymer share',
  'max-pour': 'maximum pour point',
  'min-flash': 'minimum flash point',
  combination: 'several constraints together',
};

export function runSolve(components: readonly Component[], targets: BlendTargets, reference: Recipe | null, method: BlendMethod): SolveOutcome {
  try {
    const r = solveBlend({ components, targets, reference, method });
    if (r.status === 'optimal') {
      const cost = r.properties.costPerLitre;
      const cur = r.properties.currency ?? '';
      const parts = [
        `ν40 ${r.properties.kv40.toFixed(1)} mm²/s (band ${r.band.min.toFixed(1)}–${r.band.max.toFixed(1)})`,
        cost === null ? null : `${cost.toFixed(3)} ${cur} per litre`,
        `${r.lines.length} components`,
      ].filter(Boolean);
      return {
        kind: 'optimal',
        lines: r.lines,
        message: `${OBJECTIVE_LABEL[r.objective]}: ${parts.join(', ')}. Every constraint was re-checked with the core.`,
      };
    }
    if (r.status === 'infeasible') {
      return { kind: 'infeasible', reason: r.reason, binding: BINDING_LABEL[r.binding] ?? r.binding, suggestion: r.suggestion };
    }
    return { kind: 'invalid-input', field: r.field, message: r.message };
  } catch (e) {
    return { kind: 'error', message: e instanceof Error ? e.message : String(e) };
  }
}
