// The whole-line plan: every grade of the line planned together against the limited stocks, the plan
// while they last beside the plan after they are gone, adopt as new revisions, a printable summary.
import { useCallback, useDeferredValue, useEffect, useMemo, useState, type ComponentType } from 'react';
import type { AllocationPanelProps, ChartWarmUp as ChartWarmUpType } from './AllocationPanel';
import { Notice } from '../../components/notices';
import { useFormat } from '../../components/format';
import { adoptPlanRevisions, todayIso, useLibrary, usePricedLibrary, useRecipes, useRecipesHistory, useSettings, type LinePlanInputs } from '../../state';
import { pricingFor, solvableLibrary, unpricedMessage } from '../../core/currency/exchange-rates';
import { recordStockBasis } from '../../core/recipes/stock-basis';
import { BlendbenchInputError } from '../../core/errors';
import type { LinePlanResult } from '../../core/lineplan/plan';
import { userMessage } from '../../state/messages';
import { derivePlan } from './derive';
import { PlanInputs } from './PlanInputs';
import { PlanResults, type AdoptProps } from './PlanResults';
import { PlanSummary } from './PlanSummary';
import { cancelPlan, runPlan, warmPlanWorker } from './plan-client';
import { screenActions, useLinePlanScreen, type PlanWhich } from './store';
import { limitedCodes, overPeriod, PLAN_TITLE, planAssumes, planView } from './words';
import './lineplan.css';

/** The same plan inputs, but perhaps for the unit they are shown in (which changes no plan). */
function samePlanBesidesUnit(a: LinePlanInputs, b: LinePlanInputs): boolean {
  if (a === b) return true;
  const keys = new Set([...Object.keys(a), ...Object.keys(b)] as (keyof LinePlanInputs)[]);
  return [...keys].every((k) => k === 'demandUnit' || a[k] === b[k]);
}

export default function LinePlanScreen() {
  // Prices restated in the base currency at the boundary (Settings → exchange rates); stocks whose
  // currency has no rate are left out of the plan, and the screen says so.
  const quoted = useLibrary((s) => s.components);
  const priced = usePricedLibrary();
  const components = priced.components;
  const recipes = useRecipes((s) => s.recipes);
  const targets = useRecipes((s) => s.targets);
  const linePlan = useRecipes((s) => s.linePlan);
  const settings = useSettings();
  const history = useRecipesHistory();
  const fmt = useFormat();
  const st = useLinePlanScreen();
  const today = useMemo(() => todayIso(), []);
  const derived = useMemo(() => {
    const d = derivePlan(solvableLibrary(priced), recipes, targets, linePlan, settings);
    const unpriced = unpricedMessage(priced.unpriced, settings.baseCurrency);
    return unpriced ? { ...d, warnings: [unpriced, ...d.warnings] } : d;
  }, [priced, recipes, targets, linePlan, settings]);
  const planning = st.status === 'planning';
  // The printable summary follows the result in a later, interruptible render: the plans show first.
  const summaryResult = useDeferredValue(st.result);
  // The exchange rates behind the summary's costs: the stocks of both plans and of the current recipes.
  const summaryPricing = useMemo(() => {
    const ids = new Set(derived.grades.flatMap((g) => g.recipe.lines.map((l) => l.componentId)));
    for (const plan of summaryResult ? [summaryResult.lasting, summaryResult.after] : []) {
      if (plan.status === 'optimal') for (const u of plan.stockUse) ids.add(u.id);
    }
    return { base: priced.base, ...pricingFor(priced, quoted, ids) };
  }, [derived, summaryResult, priced, quoted]);
  const b = st.basis;
  // A change of the unit alone ("Quantities in") changes how the plan is shown, not the plan.
  const planChanged = b !== null && !samePlanBesidesUnit(b.linePlan, linePlan);
  const stale =
    b !== null &&
    (b.components !== components || b.recipes !== recipes || b.targets !== targets || planChanged || b.settings !== settings);
  // The printed summary is out of date as the plan is, except for the new revisions its own adoption saved.
  const after = st.adopted?.after;
  const summaryStale =
    stale &&
    (b.components !== components ||
      planChanged ||
      b.settings !== settings ||
      !(after !== undefined && after.recipes === recipes && after.targets === targets));

  // The worker and the result's charts load while the user is still entering the plan (held in
  // state, not React.lazy: a lazy component would suspend on its first render and React holds a
  // revealed fallback back for a while).
  const [AllocationPanel, setAllocationPanel] = useState<ComponentType<AllocationPanelProps> | null>(null);
  const [WarmUp, setWarmUp] = useState<typeof ChartWarmUpType | null>(null);
  const warmedUp = useCallback(() => setWarmUp(null), []);
  useEffect(() => {
    warmPlanWorker();
    let live = true;
    void import('./AllocationPanel').then((m) => {
      if (!live) return;
      setAllocationPanel(() => m.default);
      setWarmUp(() => m.ChartWarmUp);
    });
    return () => {
      live = false;
    };
  }, []);

  const run = async () => {
    if (!derived.input) return;
    screenActions.started();
    const basis = { components, recipes, targets, linePlan, settings };
    const t0 = performance.now();
    const o = await runPlan(derived.input, derived.limited);
    // The core names fields and functions (for programmers): the screen says it in the user's words.
    const say = (r: LinePlanResult): LinePlanResult =>
      r.status === 'invalid-input' ? { ...r, message: userMessage(new BlendbenchInputError(r.field, r.value, r.message), { components, words: fmt }) } : r;
    if (o.kind === 'done') {
      const result = { ...o.result, lasting: say(o.result.lasting), after: say(o.result.after) };
      screenActions.finished(result, basis, derived.limited, derived.input.supplyKg ?? {}, performance.now() - t0);
    } else if (o.kind === 'cancelled') screenActions.cancelled();
    else screenActions.failed(userMessage(new Error(o.message), { components, words: fmt }));
  };

  // What the views of the result share (the run's limited stocks and supplies, codes, period, format).
  const runMethod = st.basis?.settings.blendMethod ?? settings.blendMethod;
  // The period the plan was made for (its demands are over that period), not one typed since.
  const runPeriod = st.basis?.linePlan.period ?? linePlan.period;
  // Quantities in the unit chosen now (a display choice: every quantity of the result follows it at once).
  const unit = linePlan.demandUnit;
  const view = useMemo(
    () => planView(components, st.limited, st.supplyKg, runPeriod, fmt, runMethod, unit),
    [components, st.limited, st.supplyKg, runPeriod, fmt, runMethod, unit],
  );

  const adopt = (which: PlanWhich) => {
    const plan = which === 'lasting' ? st.result?.lasting : st.result?.after;
    // A plan made from inputs changed since (here, another tab, an undo) is never saved as recipes.
    if (!plan || plan.status !== 'optimal' || stale) return;
    const what = which === 'lasting' ? `while the limited stocks last (${planAssumes(view, which)})` : `after ${limitedCodes(view)} are gone`;
    const reason =
      `Whole-line plan ${overPeriod(linePlan.period)} (${today}): the plan ${what}, least total cost for the line. ` +
      'Predicted, not yet confirmed in the laboratory.';
    const stamp = new Date().toISOString();
    const r = adoptPlanRevisions(
      plan.grades.map((g) => ({ recipeId: g.id, lines: g.lines, stockBasis: recordStockBasis(components, g.lines, stamp) })),
      reason,
    );
    if (r.ok) {
      const now = useRecipes.getState();
      screenActions.adopted(which, r.ids, { recipes: now.recipes, targets: now.targets });
    }
    else screenActions.failed(`The recipes were not saved: ${r.message}`);
  };

  const adoptProps: AdoptProps = {
    recipes,
    stale,
    confirming: st.confirming,
    adopted: st.adopted,
    onConfirm: screenActions.confirm,
    onAdopt: adopt,
    onUndoAdopt: () => {
      history.undo();
      screenActions.unadopted();
    },
  };

  // Use of each limited stock by the current recipes at the planned demands [kg].
  const currentUseKg = useMemo(() => {
    const out: Record<string, number> = {};
    for (const id of derived.limited) out[id] = 0;
    for (const g of derived.grades) {
      for (const l of g.recipe.lines) if (l.componentId in out) out[l.componentId]! += g.demandKg * l.massFraction;
    }
    return out;
  }, [derived]);

  return (
    <section className="lineplan" aria-labelledby="lineplan-h" data-testid="lineplan">
      <h2 id="lineplan-h">Whole-line plan</h2>
      {WarmUp && !st.result && <WarmUp onDone={warmedUp} />}
      <p className="lead">
        Plan every grade of the line at once, at the least total cost over the period: the limited stocks go where they save most, each grade keeps
        its own saved limits (band, minimum VI, aniline point, polymer, additive, per-stock limits), and the plan after the limited stocks are gone
        shows what their withdrawal costs.
      </p>
      <PlanInputs plan={linePlan} recipes={recipes} components={components} disabled={planning} />

      <div className="toolbar lp-toolbar">
        <button type="button" className="primary" onClick={() => void run()} disabled={planning || !derived.input}>
          Plan the line
        </button>
        {planning && (
          <>
            <span role="status" className="lp-status">
              Planning {derived.grades.length} grades…
            </span>
            <button type="button" onClick={cancelPlan}>
              Cancel
            </button>
          </>
        )}
        {!planning && st.status === 'done' && st.ms !== null && (
          <span className="small muted lp-status" role="status">
            Planned in {fmt.num(st.ms, 0)} ms ({st.result?.lpCount ?? 0} LPs).
          </span>
        )}
        <span className="toolbar-gap" />
        <button type="button" onClick={history.undo} disabled={!history.canUndo || planning} title="Undo the last change to the plan or the recipes">
          Undo
        </button>
        <button type="button" onClick={history.redo} disabled={!history.canRedo || planning}>
          Redo
        </button>
      </div>
      {!derived.input && <p className="muted">Give at least one recipe a demand to plan the line.</p>}
      {derived.warnings.length > 0 && (
        <Notice tone="info">
          <ul>
            {derived.warnings.map((w) => (
              <li key={w}>{w}</li>
            ))}
          </ul>
        </Notice>
      )}
      {st.status === 'error' && (
        <Notice tone="error" title="The plan could not be made">
          {st.error}
        </Notice>
      )}
      {stale && st.result && (
        <p className="stale" role="status">
          The plan’s inputs, the recipes or the library changed since this plan was made: plan again to update it.
        </p>
      )}
      {st.result && (
        <>
          <PlanResults result={st.result} run={st.runs} view={view} currentUseKg={currentUseKg} adopt={adoptProps} AllocationPanel={AllocationPanel} />
          <section className="lp-summary-area" aria-labelledby="lp-summary-h">
            <div className="no-print lp-summary-controls">
              <h3 id="lp-summary-h">One-page summary</h3>
              <div className="toolbar">
                <label>
                  Summary of{' '}
                  <select value={st.summaryOf} onChange={(e) => screenActions.summaryOf(e.target.value as PlanWhich)}>
                    {(['lasting', 'after'] as const).map((w) => (
                      <option key={w} value={w}>
                        {PLAN_TITLE[w].toLowerCase()}
                      </option>
                    ))}
                  </select>
                </label>
                <label>
                  Paper{' '}
                  <select value={st.paper} onChange={(e) => screenActions.paper(e.target.value as 'a4' | 'letter')}>
                    <option value="a4">A4</option>
                    <option value="letter">US Letter</option>
                  </select>
                </label>
                <button type="button" onClick={() => window.print()} disabled={summaryResult !== st.result}>
                  Print summary
                </button>
              </div>
              <p className="small muted">Your browser’s print dialog also saves a PDF.</p>
            </div>
            {summaryResult && (
              <PlanSummary result={summaryResult} which={st.summaryOf} view={view} companyName={settings.companyName} today={today} paper={st.paper} pricing={summaryPricing} stale={summaryStale} />
            )}
          </section>
        </>
      )}
    </section>
  );
}
