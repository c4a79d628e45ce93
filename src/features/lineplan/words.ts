// The plan's numbers in words, in the user's currency and units.
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
}

export function planView(
  components: readonly Component[],
  limited: readonly string[],
  supplyKg: Readonly<Record<string, number>>,
  period: string,
  fmt: Formatter,
  method: BlendMethod,
): PlanView {
  const byId = new Map(components.map((c) => [c.id, c]));
  return { fmt, period, limited, supplyKg, code: (id) => byId.get(id)?.code ?? id, name: (id) => byId.get(id)?.name ?? '', method };
}

/** "BW-160, BW-190", or "the limited stocks" when none is limited. */
export const limitedCodes = (v: PlanView): string => v.limited.map(v.code).join(', ') || 'the limited stocks';

/** What a plan assumes of the limited stocks: "BW-190 250 t" (while they last) or "without BW-190". */
export const planAssumes = (v: PlanView, which: PlanWhich): string =>
  which === 'lasting' ? limitedText(v.limited, v.supplyKg, v.code, v.fmt) : `without ${limitedCodes(v)}`;

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
  const sign = delta > 0 ? '+' : delta < 0 ? '−' : '±';
  const pct = base && base !== 0 ? ` (${sign}${fmt.num(Math.abs((100 * delta) / base), 1)} %)` : '';
  return `${sign}${fmt.money(Math.abs(delta), digits)}${pct}`;
}

/** Tonnes from kg, without the unit (columns headed [t]): one decimal below 100 t, whole tonnes above. */
export const tonnesNumber = (fmt: Formatter, kg: number): string => fmt.num(kg / 1000, Math.abs(kg) >= 100_000 ? 0 : 1);

/** Tonnes from kg with the unit: "12.5 t", "250 t". */
export const tonnes = (fmt: Formatter, kg: number): string => `${tonnesNumber(fmt, kg)} t`;

/** The value of one more tonne of a limited stock, in words. */
export function marginalSentence(m: MarginalValue, fmt: Formatter, period: string): string {
  if (!m.binding) {
    return `${m.code}: the plan needs ${tonnes(fmt, m.useKg)} of the ${tonnes(fmt, m.supplyKg)} on offer, so one more tonne would save nothing.`;
  }
  if (m.savingPerTonne === null) return `${m.code} is used up; what one more tonne is worth could not be worked out.`;
  if (m.savingPerTonne < 0.5) return `${m.code} is used up, but one more tonne would save nothing ${overPeriod(period)}.`;
  return `One more tonne of ${m.code} would save ${aboutMoney(fmt, m.savingPerTonne)} ${overPeriod(period)}.`;
}

/**
 * The limited stocks as the plan while they last takes them: "BW-190 250 t; BW-160, BW-161 with no
 * supply given", or "no limited stock".
 */
export function limitedText(limited: readonly string[], supplyKg: Readonly<Record<string, number>>, code: (id: string) => string, fmt: Formatter): string {
  const given = limited.filter((id) => supplyKg[id] !== undefined).map((id) => `${code(id)} ${tonnes(fmt, supplyKg[id]!)}`);
  const open = limited.filter((id) => supplyKg[id] === undefined).map(code);
  const parts = [...given];
  if (open.length > 0) parts.push(`${open.join(', ')} with no supply given`);
  return parts.join('; ') || 'no limited stock';
}
