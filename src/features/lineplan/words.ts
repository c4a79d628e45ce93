// The plan's numbers in words, in the user's currency and units.
import type { MarginalValue } from '../../core/lineplan/plan';
import type { Formatter } from '../../components/format';

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

/** Tonnes from kg for the screen: one decimal below 100 t, whole tonnes above. */
export function tonnes(fmt: Formatter, kg: number): string {
  const t = kg / 1000;
  return `${fmt.num(t, Math.abs(t) >= 100 ? 0 : 1)} t`;
}

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
