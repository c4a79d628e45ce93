// The two plans side by side, the cost of the withdrawal, the marginal value of each limited stock,
// where each limited stock goes, and adopting a plan's recipes as new revisions.
import type { ComponentType } from 'react';
import type { Component, Recipe } from '../../core/formulation/model';
import type { LinePlanOptimal, LinePlanResult, LinePlanScenarios } from '../../core/lineplan/plan';
import { Notice } from '../../components/notices';
import { useFormat, type Formatter } from '../../components/format';
import { changeText, limitedText, marginalSentence, overPeriod, tonnes } from './words';
import type { PlanWhich } from './store';

import type { AllocationPanelProps } from './AllocationPanel';

export const PLAN_TITLE: Record<PlanWhich, string> = {
  lasting: 'While the limited stocks last',
  after: 'After they are gone',
};

export interface ResultsProps {
  result: LinePlanScenarios;
  /** Which run this is (data-run on the result). */
  run: number;
  /** The saved recipes (to name the revisions an adoption made). */
  recipes: readonly Recipe[];
  components: readonly Component[];
  limited: readonly string[];
  period: string;
  /** Current recipes' use of each limited stock over the period [kg], by id. */
  currentUseKg: Readonly<Record<string, number>>;
  /** Supplies of the limited stocks [kg], by id (those entered). */
  supplyKg: Readonly<Record<string, number>>;
  stale: boolean;
  confirming: PlanWhich | null;
  adopted: { which: PlanWhich; ids: Record<string, string> } | null;
  onConfirm: (which: PlanWhich | null) => void;
  onAdopt: (which: PlanWhich) => void;
  onUndoAdopt: () => void;
  /** The chart panel, once its code (with the charts) has loaded; null → a placeholder. */
  AllocationPanel: ComponentType<AllocationPanelProps> | null;
}

export function PlanResults(props: ResultsProps) {
  const { AllocationPanel } = props;
  const { result, period } = props;
  const fmt = useFormat();
  const byId = new Map(props.components.map((c) => [c.id, c]));
  const code = (id: string) => byId.get(id)?.code ?? id;
  const { lasting, after } = result;
  const limitedCodes = props.limited.map(code);
  return (
    <div className="lp-results" data-testid="plan-results" data-run={props.run}>
      <Headline
        result={result}
        period={period}
        fmt={fmt}
        limitedCodes={limitedCodes}
        currentUseKg={props.currentUseKg}
        supplyKg={props.supplyKg}
        code={code}
      />
      <div className="lp-side-by-side">
        {(['lasting', 'after'] as const).map((which) => (
          <PlanColumn
            key={which}
            which={which}
            plan={which === 'lasting' ? lasting : after}
            code={code}
            fmt={fmt}
            period={period}
            limitedCodes={limitedCodes}
            lastingText={limitedText(props.limited, props.supplyKg, code, fmt)}
            stale={props.stale}
            confirming={props.confirming === which}
            adopted={props.adopted?.which === which ? props.adopted.ids : null}
            recipes={props.recipes}
            onConfirm={props.onConfirm}
            onAdopt={props.onAdopt}
            onUndoAdopt={props.onUndoAdopt}
          />
        ))}
      </div>
      {result.marginal.length > 0 && (
        <section className="panel lp-marginal" aria-labelledby="lp-marginal-h">
          <h3 id="lp-marginal-h">What one more tonne is worth</h3>
          <ul data-testid="marginal-values">
            {result.marginal.map((m) => (
              <li key={m.id}>{marginalSentence(m, fmt, period)}</li>
            ))}
          </ul>
          <p className="small muted">
            Each limited stock’s supply raised by one tonne and the whole line planned again; the saving is the drop in the line’s total cost.
          </p>
        </section>
      )}
      {lasting.status === 'optimal' &&
        props.limited.length > 0 &&
        (AllocationPanel ? (
          <AllocationPanel plan={lasting} limited={props.limited} supplyKg={props.supplyKg} code={code} period={period} />
        ) : (
          <p className="muted">Drawing where the limited stocks go…</p>
        ))}
    </div>
  );
}

function Headline({
  result,
  period,
  fmt,
  limitedCodes,
  currentUseKg,
  supplyKg,
  code,
}: {
  result: LinePlanScenarios;
  period: string;
  fmt: Formatter;
  limitedCodes: string[];
  currentUseKg: Readonly<Record<string, number>>;
  supplyKg: Readonly<Record<string, number>>;
  code: (id: string) => string;
}) {
  const { lasting, after, withdrawalCost } = result;
  const over = overPeriod(period);
  const current = lasting.status === 'optimal' ? lasting.currentTotalCost : after.status === 'optimal' ? after.currentTotalCost : null;
  // Limited stocks the current recipes would need more of than is on offer.
  const shortNow: string[] = [];
  for (const [id, kg] of Object.entries(currentUseKg)) {
    const s = supplyKg[id];
    if (s !== undefined && kg > s + 1) shortNow.push(`${tonnes(fmt, kg)} of ${code(id)} (${tonnes(fmt, s)} on offer)`);
  }
  return (
    <section className="lp-headline" aria-label="Cost of the withdrawal" data-testid="plan-headline">
      {withdrawalCost !== null ? (
        <p className="lp-big">
          The withdrawal of {limitedCodes.join(', ') || 'the limited stocks'} costs the line <strong data-testid="withdrawal-cost">{fmt.money(withdrawalCost, 0)}</strong> {over}.
        </p>
      ) : (
        <p className="lp-big">The cost of the withdrawal cannot be given: one of the two plans has no answer (see below).</p>
      )}
      <p>
        {lasting.status === 'optimal' && <>While they last the line costs {fmt.money(lasting.totalCost, 0)}; </>}
        {after.status === 'optimal' && <>after they are gone {fmt.money(after.totalCost, 0)}; </>}
        {current !== null && <>the current recipes would cost {fmt.money(current, 0)} {over} at today’s prices.</>}
      </p>
      {shortNow.length > 0 && <p>The current recipes would need more than is on offer: {shortNow.join('; ')}.</p>}
    </section>
  );
}

/** What one plan's column shows and does. */
interface ColumnProps {
  which: PlanWhich;
  plan: LinePlanResult;
  code: (id: string) => string;
  fmt: Formatter;
  period: string;
  limitedCodes: string[];
  /** The limited stocks as the plan while they last takes them. */
  lastingText: string;
  stale: boolean;
  confirming: boolean;
  adopted: Record<string, string> | null;
  recipes: readonly Recipe[];
  onConfirm: (which: PlanWhich | null) => void;
  onAdopt: (which: PlanWhich) => void;
  onUndoAdopt: () => void;
}

function PlanColumn(props: ColumnProps) {
  const { which, plan, limitedCodes, lastingText } = props;
  const title = PLAN_TITLE[which];
  const hId = `lp-${which}-h`;
  const sub = which === 'lasting' ? lastingText : `without ${limitedCodes.join(', ') || 'the limited stocks'}`;
  return (
    <section className="panel lp-plan" aria-labelledby={hId} data-testid={`plan-${which}`}>
      <h3 id={hId}>
        {title} <span className="small muted">({sub})</span>
      </h3>
      {plan.status === 'invalid-input' && (
        <Notice tone="error" title="This plan cannot be made from these inputs">
          {plan.message}
        </Notice>
      )}
      {plan.status === 'infeasible' && (
        <Notice tone="warning" title="No plan meets every limit">
          <span data-testid={`reason-${which}`}>{plan.reason}</span>
        </Notice>
      )}
      {plan.status === 'optimal' && <PlanBody {...props} plan={plan} />}
    </section>
  );
}

function PlanBody({
  which,
  plan,
  code,
  fmt,
  period,
  stale,
  confirming,
  adopted,
  recipes,
  onConfirm,
  onAdopt,
  onUndoAdopt,
}: ColumnProps & { plan: LinePlanOptimal }) {
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
                Demand
              </th>
              <th scope="col">Recipe (mass %)</th>
              <th scope="col" className="num">
                Cost per litre (15 °C)
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
                <td className="num">{tonnes(fmt, g.demandKg)}</td>
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
      {plan.grades
        .filter((g) => g.inBand && g.inBand.probability < g.inBand.minimum)
        .map((g) => (
          <p key={g.id} className="small text-warning">
            {g.label} asks for {fmt.pct(g.inBand!.minimum, 1)} of batches in band; the planned recipe lands in band with{' '}
            {fmt.pct(g.inBand!.probability, 1)} under the stocks’ lot spread. The line plan plans each grade to its band only: make this one robust
            in the recipe designer.
          </p>
        ))}
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
            <p>
              Save these {plan.grades.length} recipes as new draft revisions of {plan.grades.map((g) => g.label).join(', ')}? The recipes made now
              stay approved until the new revisions are approved on Recipes. Predicted properties need laboratory confirmation before release.
            </p>
            <div className="button-row">
              <button type="button" className="primary" onClick={() => onAdopt(which)}>
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
