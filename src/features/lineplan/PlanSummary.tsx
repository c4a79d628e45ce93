// The one-page printable summary of a line plan: grades × stocks with mass %, demand, supply use,
// totals and cautions. Printed through the shared print path (components/print.css), as the blend sheet.
import { useId, type ReactNode } from 'react';
import type { LinePlanGradeResult, LinePlanScenarios } from '../../core/lineplan/plan';
import { describeRate, rateDecimals, unpricedMessage, type ExchangeRate, type UnpricedStock } from '../../core/currency/exchange-rates';
import { MethodNote } from '../../components/notices';
import '../../components/print.css';
import type { PlanWhich } from './store';
import { changeText, marginalSentence, overPeriod, PLAN_TITLE, planAssumes, quantityNumber, type PlanView } from './words';

export const SUMMARY_CAUTIONS: readonly string[] = [
  'Predicted properties are estimates by published methods (the blend-viscosity method named above, ASTM D2270 VI): every recipe requires laboratory confirmation (ASTM D445, D2270, D4052, D92, D97 and the plant’s release tests) before release.',
  'Costs use the library’s prices as they stood when the plan was made; demands and supplies are the planner’s own figures.',
  'Safety data sheets, site procedures and local regulations govern the handling of hot oil and additive packages; this plan does not replace them.',
];

export interface PlanSummaryProps {
  result: LinePlanScenarios;
  which: PlanWhich;
  view: PlanView;
  companyName: string;
  /** Date printed on the summary (YYYY-MM-DD). */
  today: string;
  paper: 'a4' | 'letter';
  /** The base currency of every cost, the exchange rates behind them and the stocks left out for want of a rate. */
  pricing?: { base: string; ratesUsed: readonly ExchangeRate[]; unpriced: readonly UnpricedStock[] };
  /** The inputs, recipes, library or settings changed after the plan was made: printed as out of date. */
  stale?: boolean;
}

/** Printed under the title of a plan made before its inputs last changed. */
export const PLAN_OUT_OF_DATE =
  'Out of date: the plan’s inputs, the recipes, the library or the settings changed after this plan was made, so these figures are not today’s. Plan the line again before relying on them.';

/** Printed under the title: the summary plans, it does not release (item 11 of issue 10). */
export const PLAN_NOT_FOR_RELEASE =
  'Plan only — not for batching or release: each planned recipe is a prediction, made only after it is adopted as a new revision, approved, and batched from its own blend sheet.';

export function PlanSummary({ result, which, view, companyName, today, paper, pricing, stale = false }: PlanSummaryProps) {
  const id = useId();
  const { fmt, period, supplyKg, code, unit } = view;
  const plan = which === 'lasting' ? result.lasting : result.after;
  const other = which === 'lasting' ? result.after : result.lasting;
  const t = (kg: number) => quantityNumber(fmt, unit, kg);
  return (
    <article className={`lp-summary print-page lp-paper-${paper}`} aria-labelledby={`${id}-title`} data-testid="plan-summary">
      <style>{`@page { size: ${paper === 'a4' ? 'A4' : 'letter'} portrait; margin: 9mm 10mm; }`}</style>
      <header className="lps-head">
        <span className="lps-company">{companyName || 'Blending plant'}</span>
        <span id={`${id}-title`} className="lps-title">
          Whole-line plan — summary
        </span>
      </header>
      <p className="lps-sub">
        <strong>{PLAN_TITLE[which]}</strong> ({planAssumes(view, which)})
        {' · '}Demand {overPeriod(period)} · Printed {today} · Least total cost over the period, each grade to its own saved limits
      </p>
      <p className="lps-hold" data-testid="summary-not-for-release">
        <strong>{PLAN_NOT_FOR_RELEASE}</strong>
      </p>
      {stale && (
        <p className="lps-hold lps-stale" data-testid="summary-out-of-date">
          <strong>{PLAN_OUT_OF_DATE}</strong>
        </p>
      )}
      <MethodNote method={view.method} className="lps-method" />

      {plan.status !== 'optimal' ? (
        <p className="lps-none">
          <strong>No plan.</strong> {plan.status === 'invalid-input' ? plan.message : unit === 'kg' ? (plan.reasonKg ?? plan.reason) : plan.reason}
        </p>
      ) : (
        <>
          <table className="lps-table">
            <caption>Recipes by grade, mass % (predicted)</caption>
            <thead>
              <tr>
                <th scope="col">Stock</th>
                {plan.grades.map((g) => (
                  <th key={g.id} scope="col" className="lps-num">
                    {g.label}
                  </th>
                ))}
                <th scope="col" className="lps-num">
                  Use [{unit}]
                </th>
                <th scope="col" className="lps-num">
                  Supply [{unit}]
                </th>
              </tr>
            </thead>
            <tbody>
              {plan.stockUse.map((u) => (
                <tr key={u.id}>
                  <th scope="row">
                    <span className="lps-code">{u.code}</span> <span className="lps-name">{view.name(u.id)}</span>
                  </th>
                  {plan.grades.map((g) => {
                    const w = g.lines.find((l) => l.componentId === u.id)?.massFraction ?? 0;
                    return (
                      <td key={g.id} className="lps-num">
                        {w > 0 ? fmt.num(100 * w, 1) : ''}
                      </td>
                    );
                  })}
                  <td className="lps-num">{t(u.useKg)}</td>
                  <td className="lps-num">{supplyKg[u.id] === undefined ? '' : t(supplyKg[u.id]!)}</td>
                </tr>
              ))}
            </tbody>
            <tfoot>
              <tr>
                <th scope="row">Demand [{unit}]</th>
                {plan.grades.map((g) => (
                  <td key={g.id} className="lps-num">
                    {t(g.demandKg)}
                  </td>
                ))}
                <td className="lps-num">{t(plan.grades.reduce((s, g) => s + g.demandKg, 0))}</td>
                <td />
              </tr>
              <GradeRow grades={plan.grades} label="ν40 [mm²/s] · VI" cell={(g) => `${fmt.num(g.properties.kv40, 0)} · ${g.properties.reportedVi ?? '—'}`} />
              <GradeRow grades={plan.grades} label="Cost per litre (15 °C)" cell={(g) => fmt.money(g.costPerLitre, 3)} />
              <GradeRow
                grades={plan.grades}
                label="Change per litre (15 °C)"
                cell={(g) => (g.current ? changeText(fmt, g.costPerLitre - g.current.costPerLitre, null, 3) : '—')}
              />
            </tfoot>
          </table>

          <div className="lps-columns">
            <section>
              <h3>Totals {overPeriod(period)}</h3>
              <table className="lps-table lps-totals">
                <tbody>
                  <tr>
                    <th scope="row">This plan</th>
                    <td className="lps-num">{fmt.money(plan.totalCost, 0)}</td>
                  </tr>
                  <tr>
                    <th scope="row">{PLAN_TITLE[which === 'lasting' ? 'after' : 'lasting']}</th>
                    <td className="lps-num">{other.status === 'optimal' ? fmt.money(other.totalCost, 0) : 'no plan'}</td>
                  </tr>
                  <tr>
                    <th scope="row">Cost of the withdrawal</th>
                    <td className="lps-num">{view.limited.length === 0 ? 'none: no stock limited' : result.withdrawalCost === null ? '—' : fmt.money(result.withdrawalCost, 0)}</td>
                  </tr>
                  <tr>
                    <th scope="row">Current recipes, same demand</th>
                    <td className="lps-num">{plan.currentTotalCost === null ? '—' : fmt.money(plan.currentTotalCost, 0)}</td>
                  </tr>
                </tbody>
              </table>
            </section>
            <section>
              <h3>Stocks</h3>
              <p>
                <strong>In use ({plan.stocksUsed.length}):</strong> {plan.stocksUsed.map(code).join(', ')}.
              </p>
              {plan.stocksNoLongerNeeded.length > 0 && (
                <p>
                  <strong>No longer needed:</strong> {plan.stocksNoLongerNeeded.map(code).join(', ')}.
                </p>
              )}
              {which === 'lasting' && result.marginal.length > 0 && (
                <ul>
                  {result.marginal.map((m) => (
                    <li key={m.id}>{marginalSentence(m, view)}</li>
                  ))}
                </ul>
              )}
            </section>
          </div>
        </>
      )}

      {pricing && (pricing.ratesUsed.length > 0 || pricing.unpriced.length > 0) && (
        <p className="lps-pricing" data-testid="summary-pricing">
          {pricing.ratesUsed.length > 0 &&
            `Prices converted at ${pricing.ratesUsed.map((r) => describeRate(r, pricing.base, (x) => fmt.num(x, rateDecimals(x)))).join('; ')}. `}
          {pricing.unpriced.length > 0 && unpricedMessage(pricing.unpriced, pricing.base)}
        </p>
      )}
      <section className="lps-cautions">
        <h3>Cautions</h3>
        <ul>
          {SUMMARY_CAUTIONS.map((c) => (
            <li key={c}>{c}</li>
          ))}
        </ul>
      </section>
      <div className="lps-signoff">
        {['Prepared by', 'Checked by (laboratory)', 'Approved by'].map((r) => (
          <div key={r}>
            <div className="lps-sign-role">{r}</div>
            <div className="lps-sign-line">Name, signature, date</div>
          </div>
        ))}
      </div>
    </article>
  );
}

/** A footer row of the grades × stocks table: one cell per grade, the use and supply columns empty. */
function GradeRow({ grades, label, cell }: { grades: readonly LinePlanGradeResult[]; label: string; cell: (g: LinePlanGradeResult) => ReactNode }) {
  return (
    <tr>
      <th scope="row">{label}</th>
      {grades.map((g) => (
        <td key={g.id} className="lps-num">
          {cell(g)}
        </td>
      ))}
      <td colSpan={2} />
    </tr>
  );
}
