/** Per-line numbers the recipe table and charts show, derived from the draft (never stored). */
import type { Component, RecipeLine } from '../../core/formulation/model';
import { pricePerKg } from '../../core/formulation/cost';

export interface LineView {
  componentId: string;
  component: Component | null;
  massFraction: number;
  volumeFraction: number;
  /** Price converted to per kg [base currency/kg]; null when it cannot be (unknown component, or no exchange rate). */
  pricePerKg: number | null;
  /** Contribution to the blend cost [currency per litre of blend]: ρ_blend·wᵢ·pᵢ. */
  costPerLitre: number | null;
}

export interface DraftView {
  lines: LineView[];
  /** Blend density at 15 °C by ideal mixing [kg/L]. */
  density15: number;
  /** Sum of the mass fractions (1 when the recipe is complete). */
  total: number;
  /** Currency named by the components' prices (first one; mixed currencies flagged). */
  currency: string;
  mixedCurrencies: boolean;
  missing: string[];
}

/**
 * Volume fractions φᵢ = (wᵢ/ρᵢ)/Σ(wⱼ/ρⱼ) and cost contributions ρ·wᵢ·pᵢ (ideal mixing, common practice).
 * With `baseCurrency` (prices already restated at the boundary), a line priced in any other currency
 * has no cost (null), so no figure mixes currencies.
 */
export function deriveDraft(lines: readonly RecipeLine[], byId: ReadonlyMap<string, Component>, baseCurrency?: string): DraftView {
  const missing: string[] = [];
  let specificVolume = 0;
  let total = 0;
  for (const l of lines) {
    const c = byId.get(l.componentId);
    if (!c) missing.push(l.componentId);
    total += l.massFraction;
    specificVolume += l.massFraction / (c?.density15 ?? 0.88);
  }
  const density15 = specificVolume > 0 ? total / specificVolume : 0;
  const currencies = new Set<string>();
  const out: LineView[] = lines.map((l) => {
    const c = byId.get(l.componentId) ?? null;
    if (c) currencies.add(c.price.currency);
    const rho = c?.density15 ?? 0.88;
    let ppk: number | null = null;
    // A price still in another currency (no exchange rate) is never added into the base currency.
    if (c && (baseCurrency === undefined || c.price.currency === baseCurrency)) {
      try {
        ppk = pricePerKg(c.price, c.density15);
      } catch {
        ppk = null;
      }
    }
    return {
      componentId: l.componentId,
      component: c,
      massFraction: l.massFraction,
      volumeFraction: specificVolume > 0 ? l.massFraction / rho / specificVolume : 0,
      pricePerKg: ppk,
      costPerLitre: ppk === null ? null : density15 * l.massFraction * ppk,
    };
  });
  return {
    lines: out,
    density15,
    total,
    currency: [...currencies][0] ?? '',
    mixedCurrencies: currencies.size > 1,
    missing,
  };
}
