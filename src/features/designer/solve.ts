/** Runs the core solver for the designer and turns its answer into lines or a notice. */
import type { BlendMethod } from '../../core/blending/blend-viscosity';
import type { BlendTargets, Component, Recipe, RecipeLine } from '../../core/formulation/model';
import { solveBlend } from '../../core/solver/solve-blend';
import { BlendbenchInputError } from '../../core/errors';
import type { Formatter } from '../../components/format';
import { userMessage } from '../../state/messages';
import { OBJECTIVE_LABEL } from './TargetsForm';
import { fmtProbability } from './PropertiesPanel';
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
  'in-band-probability': 'probability in band',
};


/**
 * The premium of a robust recipe, in the plant's words:
 *  "+0.006 EUR/L at 15 °C buys 99.0 % instead of 50.0 % in the solve band (the recipe without it: 1.146 EUR/L at 15 °C)".
 */
export function premiumText(
  robust: { nominalCostPerLitre: number | null; nominalProbability: number | null },
  costPerLitre: number | null,
  probability: number,
  currency: string,
  fmt: Formatter,
): string {
  if (robust.nominalCostPerLitre === null || costPerLitre === null) return `${fmtProbability(probability, fmt)} of batches in the solve band`;
  const d = costPerLitre - robust.nominalCostPerLitre;
  const sign = d >= 0 ? '+' : '−';
  const was = robust.nominalProbability === null ? '' : ` instead of ${fmtProbability(robust.nominalProbability, fmt)}`;
  return `${sign}${fmt.num(Math.abs(d), 3)} ${currency}/L at 15 °C buys ${fmtProbability(probability, fmt)}${was} in the solve band (the recipe without it: ${fmt.num(robust.nominalCostPerLitre, 3)} ${currency}/L at 15 °C)`;
}

export function runSolve(
  components: readonly Component[],
  targets: BlendTargets,
  reference: Recipe | null,
  method: BlendMethod,
  fmt: Formatter,
): SolveOutcome {
  try {
    const r = solveBlend({ components, targets, reference, method, display: fmt.settings });
    if (r.status === 'optimal') {
      const cost = r.properties.costPerLitre;
      const cur = r.properties.currency ?? '';
      const parts = [
        `ν40 ${fmt.num(r.properties.kv40, 1)} mm²/s (band ${fmt.num(r.band.min, 1)}–${fmt.num(r.band.max, 1)})`,
        cost === null ? null : `${fmt.num(cost, 3)} ${cur} per litre at 15 °C`,
        `${r.lines.length} components`,
        r.robust ? premiumText(r.robust, cost, r.inBand.plant.probability, cur, fmt) : null,
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
    const err = new BlendbenchInputError(r.field, r.value, r.message);
    return { kind: 'invalid-input', field: r.field, message: userMessage(err, { components, words: fmt }) };
  } catch (e) {
    return { kind: 'error', message: userMessage(e, { components, words: fmt }) };
  }
}
