// The two plans side by side, the cost of the withdrawal, the marginal value of each limited stock,
// where each limited stock goes, and adopting a plan's recipes as new revisions.
import type { ComponentType } from 'react';
import type { Recipe } from '../../core/formulation/model';
import type { LinePlanOptimal, LinePlanResult, LinePlanScenarios } from '../../core/lineplan/plan';
import { probabilityText } from '../../components/format';
import { MethodNote, Notice } from '../../components/notices';
import { changeText, limitedCodes, marginalSentence, overPeriod, PLAN_TITLE, planAssumes, quantity, quantityNumber, marginalStep, type PlanView } from './words';
import type { PlanWhich } from './store';

import type { AllocationPanelProps } from './AllocationPanel';

/** What adopting a plan's recipes needs: the state of the confirmation and the actions. */
export interface AdoptProps {
  /** The saved recipes (to name the revisions an adoption made). */
  recipes: readonly Recipe[];
  /** The inputs changed since the run: adopting is refused until the line is planned again. */
  stale: boolean;
  confirming: PlanWhich | null;
  adopted: { which: PlanWhich; ids: Record<string, string> } | null;
  onConfirm: (which: PlanWhich | null) => void;
  onAdopt: (which: PlanWhich) => void;
  onUndoAdopt: () => void;
}

export interface ResultsProps {
  result: LinePlanScenarios;
  /** Which run this is (data-run on the result). */
  run: number;
  view: PlanView;
  /** Current recipes' use of each limited stock over the period [kg], by id. */
  currentUseKg: Readonly<Record<string, number>>;
  adopt: AdoptProps;
  /** The chart panel, once its code (with the charts) has loaded; null → a placeholder. */
  AllocationPanel: ComponentType<AllocationPanelProps> | null;
}

export function PlanResults({ result, run, view, currentUseKg, adopt, AllocationPanel }: ResultsProps) {
  const { lasting, after } = result;
  return (
    <div className="lp-results" data-testid="plan-results" data-run={run}>
      <Headline result={result} view={view} currentUseKg={currentUseKg} />
      <MethodNote method={view.method} />
      <div className="lp-side-by-side">
        {(['lasting', 'after'] as const).map((which) => (
          <PlanColumn key={which} which={which} plan={which === 'lasting' ? lasting : after} view={view} adopt={adopt} />
        ))}
      </div>
      {result.marginal.length > 0 && (
        <section className="panel lp-marginal" aria-labelledby="lp-marginal-h">
          <h3 id="lp-marginal-h">{marginalStep(view.fmt, view.unit).heading}</h3>
          <ul data-testid="marginal-values">
            {result.marginal.map((m) => (
              <li key={m.id}>{marginalSentence(m, view)}</li>
            ))}
          </ul>
          <p className="small muted">
            Each limited stock’s supply raised by {marginalStep(view.fmt, view.unit).raised} and the whole line planned again; the saving is the drop in
            the line’s total cost.
          </p>
        </section>
      )}
      {lasting.status === 'optimal' &&
        view.limited.length > 0 &&
        (AllocationPanel ? <AllocationPanel plan={lasting} view={view} /> : <p className="muted">Drawing where the limited stocks go…</p>)}
    </div>
  );
}

function Headline({ result, view, currentUseKg }: { result: LinePlanScenarios; view: PlanView; currentUseKg: Readonly<Record<string, number>> }) {
  const { lasting, after, withdrawalCost } = result;
  const { fmt, supplyKg, code, unit } = view;
  const over = overPeriod(view.period);
  const current = lasting.status === 'optimal' ? lasting.currentTotalCost : after.status === 'optimal' ? after.currentTotalCost : null;
  // Limited stocks the current recipes would need more of than is on offer.
  const shortNow: string[] = [];
  for (const [id, kg] of Object.entries(currentUseKg)) {
    const s = supplyKg[id];
    if (s !== undefined && kg > s + 1) shortNow.push(`${quantity(fmt, unit, kg)} of ${code(id)} (${quantity(fmt, unit, s)} on offer)`);
  }
  // The line's costs, each where there is one ("While they last the line costs €…; after they are gone €…; …").
  const costs: string[] = [];
  // No stock limited: the two plans are one plan, and there is no withdrawal to cost.
  const none = view.limited.length === 0;
  if (none && lasting.status === 'optimal') costs.push(`The line costs ${fmt.money(lasting.totalCost, 0)} ${over}`);
  else if (lasting.status === 'optimal') costs.push(`While they last the line costs ${fmt.money(lasting.totalCost, 0)}`);
  if (after.status === 'optimal' && !(none && lasting.status === 'optimal')) {
    costs.push(lasting.status === 'optimal' ? `after they are gone ${fmt.money(after.totalCost, 0)}` : `After they are gone the line costs ${fmt.money(after.totalCost, 0)}`);
  }
  // (the current recipes' cost comes with an optimal plan, so it never opens the sentence)
  if (current !== null) costs.push(`the current recipes would cost ${fmt.money(current, 0)} ${over} at today’s prices`);
  return (
    <section className="lp-headline" aria-label="Cost of the withdrawal" data-testid="plan-headline">
      {none ? (
        <p className="lp-big">
          No stock is limited in this plan, so nothing is withdrawn and the two plans are the same. Mark a stock limited on Stocks, or limit one
          for this plan above, to see what its withdrawal costs the line.
        </p>
      ) : withdrawalCost !== null ? (
        <p className="lp-big">
          The withdrawal of {limitedCodes(view)} costs the line <strong data-testid="withdrawal-cost">{fmt.money(withdrawalCost, 0)}</strong> {over}.
        </p>
      ) : (
        <p className="lp-big">
          The cost of the withdrawal cannot be given:{' '}
          {lasting.status !== 'optimal' && after.status !== 'optimal'
            ? 'neither plan can be made'
            : `the plan ${lasting.status !== 'optimal' ? 'while they last' : 'after they are gone'} cannot be made`}{' '}
          (see below).
        </p>
      )}
      {costs.length > 0 && <p>{costs.join('; ')}.</p>}
      {shortNow.length > 0 && <p>The current recipes would need more than is on offer: {shortNow.join('; ')}.</p>}
    </section>
  );
}

/** One plan's column: its title, and its recipes or why there are none. */
function PlanColumn({ which, plan, view, adopt }: { which: PlanWhich; plan: LinePlanResult; view: PlanView; adopt: AdoptProps }) {
  const hId = `lp-${which}-h`;
  return (
    <section className="panel lp-plan" aria-labelledby={hId} data-testid={`plan-${which}`}>
      <h3 id={hId}>
        {PLAN_TITLE[which]} <span className="small muted">({planAssumes(view, which)})</span>
      </h3>
      {plan.status === 'invalid-input' && (
        <Notice tone="error" title="This plan cannot be made from these inputs">
          {plan.message}
        </Notice>
      )}
      {plan.status === 'infeasible' && (
        <Notice tone="warning" title="No plan meets every limit">
          <span data-testid={`reason-${which}`}>{view.unit === 'kg' ? (plan.reasonKg ?? plan.reason) : plan.reason}</span>
        </Notice>
      )}
      {plan.status === 'optimal' && <PlanBody which={which} plan={plan} view={view} adopt={adopt} />}
    </section>
  );
}

function PlanBody({ which, plan, view, adopt }: { which: PlanWhich; plan: LinePlanOptimal; view: PlanView; adopt: AdoptProps }) {
  const { fmt, period, code, unit } = view;
  const { stale, recipes, onConfirm, onAdopt, onUndoAdopt } = adopt;
  const confirming = adopt.confirming === which;
  const adopted = adopt.adopted?.which === which ? adopt.adopted.ids : null;
  const change = plan.currentTotalCost === null ? null : plan.totalCost - plan.currentTotalCost;
  return (
    <>
      <dl className="lp-totals">
        <div>
          <dt>Line cost {overPeriod(period)}</dt>
          <dd data-testid={`total-${which}`}>{fmt.money(plan.totalCost, 0)}</dd>
        </div>
        <div>
          <dt>Against the current recipes</dt>
          <dd>{change === null ? '—' : changeText(fmt, change, plan.currentTotalCost)}</dd>
        </div>
      </dl>
      <div className="table-scroll">
        <table className="data lp-grade-table">
          <thead>
            <tr>
              <th scope="col">Grade</th>
              <th scope="col" className="num">
                Demand [{unit}]
              </th>
              <th scope="col">Recipe (mass %)</th>
              <th scope="col" className="num">
                Cost per litre <span className="lp-keep">(15 °C)</span>
              </th>
              <th scope="col" className="num">
                Change
              </th>
            </tr>
          </thead>
          <tbody>
            {plan.grades.map((g) => (
              <tr key={g.id}>
                <th scope="row">{g.label}</th>
                <td className="num">{quantityNumber(fmt, unit, g.demandKg)}</td>
                <td className="lp-recipe">
                  {g.lines.map((l) => (
                    <span key={l.componentId} className="lp-line">
                      <span className="code">{code(l.componentId)}</span> {fmt.num(100 * l.massFraction, 1)}
                    </span>
                  ))}
                </td>
                <td className="num">{fmt.money(g.costPerLitre, 3)}</td>
                <td className="num">{g.current ? changeText(fmt, g.costPerLitre - g.current.costPerLitre, null, 3) : '—'}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <InBandNote plan={plan} which={which} view={view} />
      <p className="small">
        <strong>The line needs {plan.stocksUsed.length} stocks:</strong> {plan.stocksUsed.map(code).join(', ')}.
        {plan.stocksNoLongerNeeded.length > 0 && (
          <>
            {' '}
            <strong>No longer needed:</strong> {plan.stocksNoLongerNeeded.map(code).join(', ')}.
          </>
        )}
        {plan.stocksNewlyNeeded.length > 0 && (
          <>
            {' '}
            <strong>New to these grades:</strong> {plan.stocksNewlyNeeded.map(code).join(', ')}.
          </>
        )}
      </p>
      <div className="lp-adopt">
        {adopted ? (
          <Notice
            tone="success"
            title="Saved as draft revisions"
            actions={
              <button type="button" onClick={onUndoAdopt}>
                Undo
              </button>
            }
          >
            <span data-testid={`adopted-${which}`}>
              {plan.grades
                .map((g) => `${g.label} revision ${recipes.find((r) => r.id === adopted[g.id])?.revision ?? '?'}`)
                .join(', ')}
              . Each supersedes the recipe it replaces once approved on <a href="#/recipes">Recipes</a>, after laboratory confirmation; their{' '}
              <a href={`#/blend-sheet/${encodeURIComponent(adopted[plan.grades[0]!.id] ?? '')}`}>blend sheets</a> print them, held until then.
            </span>
          </Notice>
        ) : confirming ? (
          <div className="lp-confirm" role="group" aria-label="Confirm adoption">
            {stale && (
              <p className="field-msg field-error" role="alert" id={`lp-stale-${which}`}>
                Not saved: the inputs changed since this plan was made (here, in another tab or by an undo): plan again, then adopt.
              </p>
            )}
            <p>
              Save these {plan.grades.length} recipes as new draft revisions of {plan.grades.map((g) => g.label).join(', ')}? The recipes made now
              stay approved until the new revisions are approved on Recipes. Predicted properties need laboratory confirmation before release.
            </p>
            <div className="button-row">
              <button type="button" className="primary" onClick={() => onAdopt(which)} disabled={stale} aria-describedby={stale ? `lp-stale-${which}` : undefined}>
                Save the new revisions
              </button>
              <button type="button" onClick={() => onConfirm(null)}>
                Keep the current recipes
              </button>
            </div>
          </div>
        ) : (
          <button type="button" onClick={() => onConfirm(which)} disabled={stale} title={stale ? 'Plan again first: the inputs changed' : undefined}>
            Adopt these recipes…
          </button>
        )}
      </div>
    </>
  );
}

/**
 * The grades' minimum probabilities in band, met by the plan, and what they cost the line: the plan
 * solved once more without them (its total cost and each grade's probability then).
 */
function InBandNote({ plan, which, view }: { plan: LinePlanOptimal; which: PlanWhich; view: PlanView }) {
  const { fmt, period } = view;
  const robust = plan.grades.filter((g) => g.inBand !== null);
  if (robust.length === 0) return null;
  const p = (x: number) => probabilityText(x, (v, d) => fmt.num(v, d));
  const premium = plan.nominalTotalCost === null ? null : plan.totalCost - plan.nominalTotalCost;
  return (
    <p className="small" data-testid={`in-band-${which}`}>
      <strong>Probability in band</strong> (the stocks’ lot spread of ν40):{' '}
      {robust
        .map((g) => {
          const b = g.inBand!;
          return `${g.label} ${p(b.probability)}, at least ${p(b.minimum)} asked${b.nominalProbability === null ? '' : ` (${p(b.nominalProbability)} if planned without it)`}`;
        })
        .join('; ')}
      .{' '}
      {premium === null
        ? 'Without these minimums the line has no plan, so their premium is not stated.'
        : `These minimums cost the line ${changeText(fmt, premium, plan.nominalTotalCost)} ${overPeriod(period)} (${fmt.money(plan.nominalTotalCost, 0)} without them).`}
    </p>
  );
}
