/**
 * The line plan as stored: the user's inputs only (demands, supplies, stocks that must stay in use,
 * the tank limit); the plans themselves are derived by the core (`core/lineplan`). Kept inside the
 * recipes store (schema 6), so it is saved with the recipes, undone with them and included in
 * backups. No store import here: `recipes.ts` imports this module.
 */

export interface LinePlanInputs {
  /** What the planning period is called on the screen and the summary ("2026"); '' → "the period". */
  period: string;
  /** Unit demands, supplies and least uses are typed and shown in. */
  demandUnit: 'kg' | 't';
  /** The recipes that take part, by recipe id, with their demand over the period [kg]. */
  demands: Record<string, number>;
  /**
   * Supply over the period [kg] of limited stocks, by stock id. Every stock marked limited in the
   * library is limited in the plan; an entry here also limits a stock for this plan only. null →
   * limited, supply not entered yet.
   */
  supplies: Record<string, number | null>;
  /** Stocks that must stay in use, by stock id, with their least use over the period [kg] (0: any). */
  keep: Record<string, number>;
  /** Most distinct stocks in use across the line (the additive package counts); null → no limit. */
  maxStocks: number | null;
}

/** A plan with nothing in it (first start, and data saved before schema 6). */
export function emptyLinePlan(): LinePlanInputs {
  return { period: '', demandUnit: 't', demands: {}, supplies: {}, keep: {}, maxStocks: null };
}

/**
 * A stock kept in use with a least use above its supply over the period, both in kg, or null when
 * they fit (no least use, no supply entered, or least use ≤ supply). `change` gives a value being
 * typed in place of the stored one (`keepKg` for the least use, `supplyKg` for the supply), so the
 * entry field and the store action refuse alike. No plan can use more of a stock than is supplied.
 */
export function leastUseAboveSupply(
  plan: Pick<LinePlanInputs, 'keep' | 'supplies'>,
  componentId: string,
  change: { keepKg?: number | null; supplyKg?: number | null } = {},
): { leastUseKg: number; supplyKg: number } | null {
  const leastUseKg = change.keepKg !== undefined ? change.keepKg : (plan.keep[componentId] ?? null);
  const supplyKg = change.supplyKg !== undefined ? change.supplyKg : (plan.supplies[componentId] ?? null);
  if (leastUseKg === null || supplyKg === null || leastUseKg <= supplyKg) return null;
  return { leastUseKg, supplyKg };
}
