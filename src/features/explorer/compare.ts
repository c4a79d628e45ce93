/** Side-by-side numbers for a candidate and the recipe it replaces (derived, never stored). */
import type { Component, RecipeLine } from '../../core/formulation/model';
import type { BlendMethod } from '../../core/blending/blend-viscosity';
import type { D341Form } from '../../core/viscosity/viscosity-temperature';
import { predictBlend, type BlendProperties } from '../../core/formulation/blend-properties';
import { assessDeposit, type DepositAssessment } from '../../core/scoring/deposit';
import { blendAfterShear, type BlendAfterShear } from '../../core/formulation/shear-blend';

export interface Assessed {
  props: BlendProperties;
  deposit: DepositAssessment | null;
  shear: BlendAfterShear | null;
}

/** Properties, deposit assessment and after-shear check of a recipe; null when it cannot be predicted. */
export function assess(
  components: readonly Component[],
  lines: readonly RecipeLine[],
  opts: {
    method: BlendMethod;
    grade: number;
    operatingTempC: number;
    coldTempC: number;
    d341Form?: D341Form;
    /** Temperature at which delivered litres are costed [°C] (Settings); default 15. */
    deliveryTempC?: number;
  },
): Assessed | null {
  const used = lines.filter((l) => l.massFraction > 0);
  if (used.length === 0) return null;
  try {
    const props = predictBlend(components, used, {
      method: opts.method,
      operatingTempC: opts.operatingTempC,
      coldTempC: opts.coldTempC,
      ...(opts.d341Form ? { d341Form: opts.d341Form } : {}),
      // The core's own cost per delivered litre (as the designer and the blend sheet's costing use it).
      ...(opts.deliveryTempC === undefined ? {} : { deliveryTempC: opts.deliveryTempC }),
    });
    let deposit: DepositAssessment | null = null;
    let shear: BlendAfterShear | null = null;
    try {
      deposit = assessDeposit(components, used);
    } catch {
      deposit = null;
    }
    try {
      shear = blendAfterShear(components, used, { method: opts.method, grade: opts.grade });
    } catch {
      shear = null;
    }
    return { props, deposit, shear };
  } catch {
    return null;
  }
}
