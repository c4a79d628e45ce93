// The plan's numbers in words, in the user's currency and units.
import { signedText } from '../../core/words/signed';
import type { Component } from '../../core/formulation/model';
import type { MarginalValue } from '../../core/lineplan/plan';
import type { Formatter } from '../../components/format';
import type { BlendMethod } from '../../core/blending/blend-viscosity';
import type { PlanWhich } from './store';

/** The two plans' titles. */
export const PLAN_TITLE: Record<PlanWhich, string> = {
  lasting: 'While the limited stocks last',
  after: 'After they are gone',
};

/**
 * What every view of a result shares: the run's limited stocks and their supplies, the stocks' codes
 * and names, the period and the user's number format.
 */
export interface PlanView {
  fmt: Formatter;
  period: string;
  /** Ids of the limited stocks of the run, library order. */
  limited: readonly string[];
  /** Supplies entered [kg], by stock id (limited stocks without one are absent). */
  supplyKg: Readonly<Record<string, number>>;
  code: (id: string) => string;
  name: (id: string) => string;
  /** Blend-viscosity method the plan was solved with (named beside every result). */
  method: BlendMethod;
  /** The unit the blender chose for the plan's quantities ("Quantities in"): every quantity shown is in it. */
  unit: QuantityUnit;
}

/** The unit of the plan's quantities on the screen and the summary (kept in kg inside). */
export type QuantityUnit = 'kg' | 't';

export function planView(
  components: readonly Component[],
  limited: readonly string[],
  supplyKg: Readonly<Record<string, number>>,
  period: string,
  fmt: Formatter,
  method: BlendMethod,
  unit: QuantityUnit,
): PlanView {
  const byId = new Map(components.map((c) => [c.id, c]));
  return { fmt, period, limited, supplyKg, code: (id) => byId.get(id)?.code ?? id, name: (id) => byId.get(id)?.name ?? '', method, unit };
}

/** "BW-160, BW-190", or "the limited stocks" when none is limited. */
export const limitedCodes = (v: PlanView): string => v.limited.map(v.code).join(', ') || 'the limited stocks';

/** What a plan assumes of the limited stocks: "BW-190 250.0 t" (while they last) or "without BW-190". */
export const planAssumes = (v: PlanView, which: PlanWhich): string =>
  which === 'lasting' ? limitedText(v.limited, v.supplyKg, v.code, v.fmt, v.unit) : `without ${limitedCodes(v)}`;

/** "over 2026", or "over the period" when the period has no name. */
export const overPeriod = (period: string): string => `over ${period.trim() || 'the period'}`;

/** Money rounded to two significant figures for a sentence ("about € 370", "about € 12 000"). */
export function aboutMoney(fmt: Formatter, v: number): string {
  if (!(Math.abs(v) >= 1)) return `less than ${fmt.money(1, 0)}`;
  const p = Math.pow(10, Math.max(0, Math.floor(Math.log10(Math.abs(v))) - 1));
  return `about ${fmt.money(Math.round(v / p) * p, 0)}`;
}

/** A signed money change with its share of the base: "+ € 12 300 (+4.2 %)". */
export function changeText(fmt: Formatter, delta: number, base: number | null, digits = 0): string {
  const pct = base && base !== 0 ? ` (${signedText((100 * delta) / base, 1, fmt.num)} %)` : '';
  return `${signedText(delta, digits, fmt.money)}${pct}`;
}

/**
 * A quantity [kg] in the chosen unit, without the unit (columns headed [t] or [kg]). Tonnes: one
 * decimal at any size (1 t = 1000 kg), as the inputs take and total them, so a typed 150.5 t reads
 * 150.5 in the results too. kg: whole kilograms, as they are typed and weighed. Thousands grouped as
 * the user's number format says.
 */
export const quantityNumber = (fmt: Formatter, unit: QuantityUnit, kg: number): string =>
  unit === 'kg' ? fmt.num(kg, 0) : fmt.num(kg / 1000, 1);

/** A quantity [kg] in the chosen unit, with the unit: "12.5 t", "250.0 t", "12 500 kg". */
export const quantity = (fmt: Formatter, unit: QuantityUnit, kg: number): string => `${quantityNumber(fmt, unit, kg)} ${unit}`;

/**
 * The core's step of the marginal value [kg] (`MARGINAL_STEP_KG` in core/lineplan/plan, copied here so
 * that the screen's code does not load the planner, which runs in the worker; a test holds them equal).
 */
export const MARGINAL_STEP_SHOWN_KG = 1000;

/**
 * The step of the marginal value (one tonne) in the chosen unit:
 * "one more tonne", or "another 1000 kg". In kg the step stays 1000 kg, not one kg: that is what the
 * core planned again with, and a saving per single kg would be a few cents, easy to misread.
 */
export function marginalStep(fmt: Formatter, unit: QuantityUnit): { more: string; heading: string; raised: string } {
  if (unit === 't') return { more: 'one more tonne', heading: 'What one more tonne is worth', raised: 'one tonne' };
  const kg = `${fmt.num(MARGINAL_STEP_SHOWN_KG, 0)} kg`;
  return { more: `another ${kg}`, heading: `What another ${kg} is worth`, raised: kg };
}

/** The value of one more tonne (kg: another 1000 kg) of a limited stock, in words, in the plan's unit. */
export function marginalSentence(m: MarginalValue, v: Pick<PlanView, 'fmt' | 'period' | 'unit'>): string {
  const { fmt, unit, period } = v;
  const { more } = marginalStep(fmt, unit);
  const q = (kg: number) => quantity(fmt, unit, kg);
  if (!m.binding) {
    return `${m.code}: the plan needs ${q(m.useKg)} of the ${q(m.supplyKg)} on offer, so ${more} would save nothing.`;
  }
  if (m.savingPerTonne === null) return `${m.code} is used up; what ${more} is worth could not be worked out.`;
  if (m.savingPerTonne < 0.5) return `${m.code} is used up, but ${more} would save nothing ${overPeriod(period)}.`;
  const opening = more.charAt(0).toUpperCase() + more.slice(1);
  return `${opening} of ${m.code} would save ${aboutMoney(fmt, m.savingPerTonne)} ${overPeriod(period)}.`;
}

/**
 * The limited stocks as the plan while they last takes them: "BW-190 250.0 t; BW-160, BW-161 with no
 * supply given" (or "BW-190 250 000 kg; …" in kg), or "no limited stock".
 */
export function limitedText(
  limited: readonly string[],
  supplyKg: Readonly<Record<string, number>>,
  code: (id: string) => string,
  fmt: Formatter,
  unit: QuantityUnit,
): string {
  const given = limited.filter((id) => supplyKg[id] !== undefined).map((id) => `${code(id)} ${quantity(fmt, unit, supplyKg[id]!)}`);
  const open = limited.filter((id) => supplyKg[id] === undefined).map(code);
  const parts = [...given];
  if (open.length > 0) parts.push(`${open.join(', ')} with no supply given`);
  return parts.join('; ') || 'no limited stock';
}
