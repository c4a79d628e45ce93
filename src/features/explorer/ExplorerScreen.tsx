import { notEnteredFields, notPredictedWords, unenteredStocks } from '../../core/formulation/entered-values';
import { Suspense, lazy, useEffect, useId, useMemo, useState } from 'react';
import type { BlendTargets, Component, Objective, Recipe } from '../../core/formulation/model';
import type { SubstituteCandidate } from '../../core/search/substitutes';
import { Notice, methodText } from '../../components/notices';
import { useFormat, type Formatter } from '../../components/format';
import { kv40kv100FromPoints } from '../../core/viscosity/viscosity-temperature';
import { NumberField, ruleVerdict } from '../../components/fields';
import { componentsById, defaultTargets, recipeActions, useLibrary, usePricedLibrary, useRecipes, useSettings } from '../../state';
import { DEFAULT_MAX_POLYMER_FRACTION } from '../../core/formulation/model';
import { pricingFor, solvableLibrary, unpricedMessage, unpricedTitle, type PricedLibrary } from '../../core/currency/exchange-rates';
import { recordStockBasis, stockBasisChanges } from '../../core/recipes/stock-basis';
import { StockChangeList } from '../../components/recipe-status';
import { prewarmSearchWorkers, releaseSearchWorkers, startSearch, type SearchHandle } from './search-client';
import { useShallow } from 'zustand/react/shallow';
import { resultBasis, useExplorerStore, type ExplorerState, type Scenario } from './store';
import { CandidateTable, polymerShare } from './CandidateTable';
import { ComparisonPanel } from './ComparisonPanel';
import { assess } from './compare';
import { candidatesInBand, recipeProbabilities, type InBandOf } from './in-band';
import { BlendbenchInputError } from '../../core/errors';
import { sayRefusal, userMessage } from '../../state/messages';
import './explorer.css';

const ExplorerCharts = lazy(() => import('./ExplorerCharts'));

/** The rankings in words (the litre at 15 °C, the volume tables' reference, named so in every unit). */
const RANKING_LABEL: Record<Objective, string> = {
  cost: 'least cost per litre (at 15 °C)',
  'cost-kg': 'least cost per kg',
  solvency: 'best solvency (lowest aniline point)',
  oxidation: 'highest oxidation-stability rating',
  closest: 'closest to the reference',
};


let running: SearchHandle | null = null;

/**
 * Targets of the search: the reference's stored targets (or defaults for its grade), ranked by
 * `objective`. The polymer cap: `polymerCap` when given (null = none); otherwise the recipe's own cap,
 * or the common-practice default when the recipe has none (an uncapped search offers thickener-rich
 * blends no plant would make).
 */
export function scenarioTargets(
  reference: Recipe,
  stored: BlendTargets | undefined,
  components: readonly Component[],
  objective: Objective,
  polymerCap?: number | null,
  minInBandProbability?: number | null,
): BlendTargets {
  const additive = components.find((c) => c.category === 'additive-package' && c.availability !== 'withdrawn') ?? null;
  const base = stored ?? defaultTargets(reference.grade, additive?.id ?? null, reference.id);
  const cap = polymerCap !== undefined ? polymerCap : (base.maxPolymerFraction ?? DEFAULT_MAX_POLYMER_FRACTION);
  const pMin = minInBandProbability !== undefined ? minInBandProbability : (base.minInBandProbability ?? null);
  return { ...base, grade: reference.grade, objective, referenceRecipeId: reference.id, maxPolymerFraction: cap, minInBandProbability: pMin };
}

/**
 * The prices a search runs with, as one comparable text: the base currency and every stock's price
 * restated in it (or left unpriced). Two searches with the same key were costed alike.
 */
export function pricingKey(priced: PricedLibrary): string {
  return `${priced.base}|${priced.components.map((c) => `${c.id}:${c.price.amount}:${c.price.basis}:${c.price.currency}`).join('|')}`;
}

/**
 * Why no substitute was found, in numbers, where the stocks searched alone say it: every one lighter than
 * the ν40 band (the heaviest named) or every one heavier (the lightest named). Polymers count unless the
 * search's polymer cap is 0; the additive package is left out. Empty when the stocks span the band.
 */
function poolReach(
  result: { poolIds: readonly string[]; band: { min: number; max: number } },
  byId: ReadonlyMap<string, Component>,
  polymerCap: number | null | undefined,
  fmt: Formatter,
): string {
  const pool: { code: string; kv40: number }[] = [];
  for (const id of result.poolIds) {
    const c = byId.get(id);
    if (!c || c.category === 'additive-package' || (c.category === 'polymer' && polymerCap === 0)) continue;
    try {
      pool.push({ code: c.code, kv40: kv40kv100FromPoints(c.viscosityPoints).kv40 });
    } catch {
      return '';
    }
  }
  if (pool.length === 0) return '';
  const heaviest = pool.reduce((a, b) => (b.kv40 > a.kv40 ? b : a));
  const lightest = pool.reduce((a, b) => (b.kv40 < a.kv40 ? b : a));
  if (heaviest.kv40 < result.band.min) return ` The heaviest stock searched, ${heaviest.code}, has ν40 ${fmt.sig(heaviest.kv40, 3)} mm²/s, below the band.`;
  if (lightest.kv40 > result.band.max) return ` The lightest stock searched, ${lightest.code}, has ν40 ${fmt.sig(lightest.kv40, 3)} mm²/s, above the band.`;
  return '';
}

export default function ExplorerScreen() {
  const fmt = useFormat();
  const settings = useSettings();
  // Prices in the base currency at the boundary; stocks without an exchange rate are left out of the search.
  const priced = usePricedLibrary();
  const components = priced.components;
  const byId = componentsById(components);
  const recipes = useRecipes((s) => s.recipes);
  const storedTargets = useRecipes((s) => s.targets);
  const activeRecipeId = useRecipes((s) => s.activeRecipeId);
  // Everything but the progress counts (RunStatusView follows those), so that a progress message
  // does not re-render the candidate table while the search runs.
  const st = useExplorerStore(useShallow(screenState));

  // Search workers are started when the explorer opens and ended when it closes.
  useEffect(() => {
    prewarmSearchWorkers();
    return releaseSearchWorkers;
  }, []);

  // First visit after a start: the session kept from the last visit (reference, withdrawn set, ranked
  // result) comes back; the screen only renders once saved work is read. Then, when there is no
  // reference (or it was deleted): the active recipe if it is a reference, else the first reference recipe.
  useEffect(() => {
    useExplorerStore.getState().restoreSession();
    const current = useExplorerStore.getState().referenceId;
    if (current && recipes.some((r) => r.id === current)) return;
    const active = recipes.find((r) => r.id === activeRecipeId && r.isReference);
    const first = active ?? recipes.find((r) => r.isReference) ?? recipes[0];
    useExplorerStore.getState().setReference(first?.id ?? null);
  }, [st.referenceId, recipes, activeRecipeId]);

  const reference = recipes.find((r) => r.id === st.referenceId) ?? null;
  const storedForRef = reference ? storedTargets[reference.id] : undefined;
  const targets = useMemo(
    () => (reference ? scenarioTargets(reference, storedForRef, components, st.objective, st.polymerCap, st.minInBandProbability) : null),
    [reference, storedForRef, components, st.objective, st.polymerCap, st.minInBandProbability],
  );
  // A reference holding a stock whose values are not yet entered is neither predicted nor costed (its
  // placeholders are not data): the comparison and the charts show no reference figure.
  const refUnentered = useMemo(() => (reference ? unenteredStocks(reference.lines, components) : []), [reference, components]);
  const refAssessed = useMemo(
    () =>
      reference && refUnentered.length === 0
        ? assess(components, reference.lines, {
            method: settings.blendMethod,
            grade: reference.grade,
            operatingTempC: settings.operatingTempC,
            coldTempC: settings.coldStartTempC,
            d341Form: settings.d341Form,
            deliveryTempC: settings.deliveryTempC,
          })
        : null,
    [reference, refUnentered, components, settings.blendMethod, settings.d341Form, settings.operatingTempC, settings.coldStartTempC, settings.deliveryTempC],
  );

  const quoted = useLibrary((x) => x.components);
  const currentPricing = useMemo(() => pricingKey(priced), [priced]);
  // The reference's cost only in the base currency (a stock without a rate leaves it not costed).
  const refCost = refAssessed && refAssessed.props.currency === priced.base ? refAssessed.props.costPerLitre : null;

  // What a result is computed from: the stocks searched, the reference recipe and its saved targets, the
  // blending rule. A result whose fingerprint differs (the library or that recipe changed since) is
  // marked stale, never shown as current. The scenario's own choices (objective, cap, withdrawn set) are
  // compared separately (`stale` below).
  const resultRef = st.resultFor ? (recipes.find((r) => r.id === st.resultFor?.referenceId) ?? null) : null;
  const resultRefTargets = resultRef ? storedTargets[resultRef.id] : undefined;
  const basisNow = useMemo(
    () => (st.result ? resultBasis(solvableLibrary(priced), resultRef, resultRefTargets, settings.blendMethod) : null),
    [st.result, priced, resultRef, resultRefTargets, settings.blendMethod],
  );
  const libraryStale = Boolean(st.result && st.resultBasis && basisNow !== st.resultBasis);
  const candidates = st.result?.candidates ?? [];
  // Probability in the plant band (the search's band) and the ISO band of every candidate and of the
  // reference; with a minimum probability, the recipe of the same stocks without it (the premium).
  const inBand = useMemo(() => {
    if (!st.result || !st.resultFor || !targets) return new Map<string, InBandOf>();
    const t = { ...targets, minInBandProbability: st.resultFor.minInBandProbability ?? null };
    return candidatesInBand(solvableLibrary(priced), st.result.candidates, t, st.result.band, st.result.forcedIds, settings.blendMethod);
  }, [st.result, st.resultFor, targets, priced, settings.blendMethod]);
  const refInBand = useMemo(
    () => (st.result && reference && refUnentered.length === 0 ? recipeProbabilities(components, reference.lines, reference.grade, st.result.band, settings.blendMethod) : null),
    [st.result, reference, refUnentered, components, settings.blendMethod],
  );
  const selected = candidates.find((c) => c.key === st.selectedKey) ?? null;
  const running_ = st.status === 'running';

  const run = () => {
    if (!reference || !targets || running) return;
    const scenario: Scenario = {
      referenceId: reference.id,
      withdrawn: [...st.withdrawn],
      maxComponents: st.maxComponents,
      objective: st.objective,
      polymerCap: targets.maxPolymerFraction,
      minInBandProbability: targets.minInBandProbability ?? null,
      pricingKey: currentPricing,
      referenceCost: refCost,
      method: settings.blendMethod,
    };
    const s = useExplorerStore.getState();
    const searched = solvableLibrary(priced);
    s.started(scenario, resultBasis(searched, reference, storedForRef, settings.blendMethod));
    const handle = startSearch(
      {
        components: searched,
        targets,
        reference,
        withdrawn: scenario.withdrawn,
        maxComponents: scenario.maxComponents,
        method: settings.blendMethod,
        limit: 200,
      },
      (p) => useExplorerStore.getState().progressed(p),
      (r) => useExplorerStore.getState().ranked(r),
    );
    running = handle;
    void handle.outcome.then((o) => {
      if (running === handle) running = null;
      const s2 = useExplorerStore.getState();
      if (o.kind === 'done') s2.finished(o.result);
      else if (o.kind === 'cancelled') s2.cancelled();
      else s2.failed(userMessage(o.field === undefined ? new Error(o.message) : new BlendbenchInputError(o.field, o.value, o.message), { components, words: fmt }));
    });
  };

  const [adoptRefused, setAdoptRefused] = useState<{ key: string; message: string } | null>(null);
  const adopt = (c: SubstituteCandidate) => {
    if (!reference || !targets) return;
    const codes = c.componentIds.map((id) => byId.get(id)?.code ?? id);
    const withdrawnCodes = [...new Set([...(st.resultFor?.withdrawn ?? []), ...components.filter((x) => x.availability === 'withdrawn').map((x) => x.id)])]
      .filter((id) => reference.lines.some((l) => l.componentId === id))
      .map((id) => byId.get(id)?.code ?? id);
    let id: string;
    try {
      id = recipeActions.addRecipe({
      name: `VG ${reference.grade} substitute: ${codes.join(' + ')}`,
      grade: reference.grade,
      lines: c.lines,
      notes:
        `Adopted from the substitute explorer as a replacement for “${reference.name}”` +
        (withdrawnCodes.length ? ` (withdrawn: ${withdrawnCodes.join(', ')})` : '') +
        `. Ranked ${c.rank} by ${RANKING_LABEL[st.resultFor?.objective ?? 'cost']}. ${methodText(st.resultFor?.method ?? settings.blendMethod)} ` +
        'Predicted, not yet confirmed in the laboratory.',
      // Same product: the reference's release specification; the stock data the candidate was solved with.
      specification: reference.specification,
      stockBasis: recordStockBasis(components, c.lines, new Date().toISOString()),
      reasonForChange: withdrawnCodes.length ? `Substitute for withdrawn ${withdrawnCodes.join(', ')}` : '',
      // Saved with the recipe in one step: one undo removes both. The stocks the search treated as withdrawn
      // stay excluded (maximum 0 %) in the substitute's targets, so a solve in the designer cannot bring them back.
      targets: {
        ...targets,
        referenceRecipeId: reference.id,
        bounds: { ...targets.bounds, ...Object.fromEntries((st.resultFor?.withdrawn ?? []).map((wid) => [wid, { max: 0 }])) },
      },
      activate: true,
      });
    } catch (e) {
      // At the collection limit (or a field the rules refuse): said beside the button, nothing is stored.
      setAdoptRefused({
        key: c.key,
        message: `Not adopted: ${sayRefusal(e instanceof Error ? e.message : String(e), fmt)}. Nothing was saved; delete recipes that are no longer needed on the Recipes screen to make room.`,
      });
      return;
    }
    setAdoptRefused(null);
    useExplorerStore.getState().markAdopted(c.key, id);
  };

  const stale =
    st.result &&
    st.resultFor &&
    (st.resultFor.referenceId !== st.referenceId ||
      st.resultFor.maxComponents !== st.maxComponents ||
      st.resultFor.objective !== st.objective ||
      (st.resultFor.method !== undefined && st.resultFor.method !== settings.blendMethod) ||
      (st.resultFor.polymerCap ?? null) !== (targets?.maxPolymerFraction ?? null) ||
      (st.resultFor.minInBandProbability ?? null) !== (targets?.minInBandProbability ?? null) ||
      [...st.resultFor.withdrawn].sort().join() !== [...st.withdrawn].sort().join());
  // Prices or exchange rates changed since the search: its costs stay at the prices it ran with.
  const pricesChanged = Boolean(st.result && st.resultFor?.pricingKey !== undefined && st.resultFor.pricingKey !== currentPricing);
  const adoptedId = selected ? st.adopted[selected.key] : undefined;
  const adoptedRecipe = adoptedId ? recipes.find((r) => r.id === adoptedId) : undefined;

  return (
    <section className="explorer" aria-labelledby="explorer-h" data-testid="explorer">
      <h2 id="explorer-h">Substitute explorer</h2>
      <p className="lead">
        Find every recipe that still makes the grade when stocks are withdrawn: each combination of up to {st.maxComponents} remaining stocks
        (plus the fixed additive package) is solved to the reference recipe’s targets and ranked.
      </p>
      <ScenarioForm
        recipes={recipes}
        reference={reference}
        components={components}
        targets={targets}
        storedCap={storedForRef ? storedForRef.maxPolymerFraction : null}
        storedP={storedForRef?.minInBandProbability ?? null}
        running={running_}
        onRun={run}
        onCancel={() => running?.cancel()}
      />
      {priced.unpriced.length > 0 && (
        <Notice tone="warning" title={unpricedTitle(priced.unpriced)}>
          <p data-testid="unpriced">{unpricedMessage(priced.unpriced, priced.base)}</p>
        </Notice>
      )}
      <RunStatusView />
      {st.fromLastSession && st.result && !libraryStale && (
        <p className="muted" role="status">
          Result restored from your last session; the library, targets and blending rule are unchanged since it was computed.
        </p>
      )}
      {libraryStale && (
        <p className="stale" role="status" data-testid="stale-library">
          Stale result: the library, the reference recipe’s targets or the blending rule changed since it was computed
          {st.fromLastSession ? ' (restored from your last session)' : ''}. It does not show what the search gives now: run the search again.
        </p>
      )}
      {stale && !libraryStale && <p className="stale" role="status">The settings changed since this result was computed: run the search again to update it.</p>}
      {pricesChanged && (
        <p className="stale" role="status" data-testid="prices-changed">
          Prices or exchange rates changed since this search: the table’s costs and differences are at the prices the search ran with —
          run the search again to cost the candidates at today’s prices.
        </p>
      )}
      {st.result && (
        <>
          {running_ && (
            <p className="muted" role="status" data-testid="ranked-so-far">
              Ranked so far: every recipe of up to {st.result.completedSize} {st.result.completedSize === 1 ? 'stock' : 'stocks'} (besides the fixed
              additive package) is in the list; larger combinations are still being searched.
            </p>
          )}
          {candidates.length === 0 ? (
            running_ ? null : (
            <Notice tone="warning" title="No substitute found">
              No combination of up to {st.result.maxComponents} remaining {st.result.maxComponents === 1 ? 'stock' : 'stocks'} meets the targets (ν40
              band {fmt.num(st.result.band.min, 1)}–{fmt.num(st.result.band.max, 1)} mm²/s).
              {poolReach(st.result, byId, st.resultFor?.polymerCap, fmt)} Allow more components per recipe, relax the reference recipe’s targets in the
              designer, or add a heavier stock or thickener to the library.
            </Notice>
            )
          ) : (
            <div className="explorer-results">
              <CandidateTable
                candidates={candidates}
                components={byId}
                referenceCost={st.resultFor?.referenceCost !== undefined ? st.resultFor.referenceCost : refCost}
                frontierCount={st.result.frontier.length}
                total={st.result.distinct}
                forcedIds={st.result.forcedIds}
                polymerCap={st.resultFor?.polymerCap ?? DEFAULT_MAX_POLYMER_FRACTION}
                inBand={inBand}
                minInBandProbability={st.resultFor?.minInBandProbability ?? null}
                method={st.resultFor?.method ?? settings.blendMethod}
              />
              {selected && reference && targets && (
                <ComparisonPanel
                  reference={reference}
                  candidate={selected}
                  components={components}
                  targets={targets}
                  refAssessed={refAssessed}
                  settings={settings}
                  inBand={{ reference: refInBand, candidate: inBand.get(selected.key) ?? null, minimum: st.resultFor?.minInBandProbability ?? null }}
                  adoptedName={adoptedRecipe?.name ?? null}
                  adoptBlocked={libraryStale || stale ? 'This result is stale: run the search again before adopting a candidate.' : null}
                  adoptRefused={adoptRefused && adoptRefused.key === selected.key ? adoptRefused.message : null}
                  onAdopt={() => adopt(selected)}
                  polymerCap={st.resultFor?.polymerCap ?? DEFAULT_MAX_POLYMER_FRACTION}
                  pricing={{
                    base: priced.base,
                    ...pricingFor(priced, quoted, [...reference.lines.map((l) => l.componentId), ...selected.componentIds]),
                  }}
                />
              )}
            </div>
          )}
          {candidates.length > 0 && running_ && <p className="muted">The charts are drawn when the search has ended.</p>}
          {candidates.length > 0 && !running_ && (
            <Suspense fallback={<p className="muted">Loading charts…</p>}>
              <ExplorerCharts
                candidates={candidates}
                frontier={st.result.frontier}
                selected={selected}
                reference={reference}
                refAssessed={refAssessed}
                referenceCost={st.resultFor?.referenceCost !== undefined ? st.resultFor.referenceCost : refCost}
                components={components}
                settings={settings}
                onSelect={(key: string) => useExplorerStore.getState().select(key)}
              />
            </Suspense>
          )}
        </>
      )}
    </section>
  );
}

function screenState(s: ExplorerState) {
  return {
    referenceId: s.referenceId,
    withdrawn: s.withdrawn,
    maxComponents: s.maxComponents,
    objective: s.objective,
    polymerCap: s.polymerCap,
    minInBandProbability: s.minInBandProbability,
    status: s.status,
    result: s.result,
    resultFor: s.resultFor,
    selectedKey: s.selectedKey,
    adopted: s.adopted,
    resultBasis: s.resultBasis,
    fromLastSession: s.fromLastSession,
    toggleWithdrawn: s.toggleWithdrawn,
    setReference: s.setReference,
    setMaxComponents: s.setMaxComponents,
    setObjective: s.setObjective,
    setPolymerCap: s.setPolymerCap,
    setMinInBandProbability: s.setMinInBandProbability,
  };
}

function ScenarioForm({
  recipes,
  reference,
  components,
  targets,
  storedCap,
  storedP,
  running,
  onRun,
  onCancel,
}: {
  recipes: readonly Recipe[];
  reference: Recipe | null;
  components: readonly Component[];
  targets: BlendTargets | null;
  /** The reference recipe's own polymer cap (null: none saved). */
  storedCap: number | null;
  /** The reference recipe's own minimum probability in band (null: none saved). */
  storedP: number | null;
  running: boolean;
  onRun: () => void;
  onCancel: () => void;
}) {
  const fmt = useFormat();
  const refChanges = useMemo(() => (reference ? stockBasisChanges(reference.stockBasis, components) : []), [reference, components]);
  // The reference's polymer share, held against the search's cap (or the usual one when it has none).
  const refPolymer = useMemo(
    () => (reference ? polymerShare(reference, new Map(components.map((c) => [c.id, c]))) : null),
    [reference, components],
  );
  const refId = useId();
  const kId = useId();
  const objId = useId();
  const st = useExplorerStore(useShallow(screenState));
  const inRef = new Set(reference?.lines.map((l) => l.componentId) ?? []);
  const libWithdrawn = components.filter((c) => c.availability === 'withdrawn');
  const markable = components.filter((c) => c.availability !== 'withdrawn');
  const refStocks = markable.filter((c) => inRef.has(c.id));
  const others = markable.filter((c) => !inRef.has(c.id) && c.category !== 'additive-package');
  const markedOthers = others.filter((c) => st.withdrawn.includes(c.id)).length;
  const row = (c: Component) => (
    <li key={c.id}>
      <label>
        <input
          type="checkbox"
          checked={st.withdrawn.includes(c.id)}
          onChange={(e) => st.toggleWithdrawn(c.id, e.target.checked)}
          disabled={running}
          aria-label={`Treat ${c.code} as withdrawn`}
        />{' '}
        <span className="code">{c.code}</span> {c.name}
        {c.availability === 'limited' ? <span className="tag"> limited</span> : null}
        {notEnteredFields(c).length ? <span className="tag"> (values not entered)</span> : null}
      </label>
    </li>
  );
  return (
    <form
      className="scenario"
      aria-label="Search settings"
      onSubmit={(e) => {
        e.preventDefault();
        onRun();
      }}
    >
      <div className="scenario-grid">
        <div>
          <div className="field">
            <label htmlFor={refId}>Reference recipe (the one to replace)</label>
            <select id={refId} value={reference?.id ?? ''} disabled={running} onChange={(e) => st.setReference(e.target.value || null)}>
              {recipes
                .filter((r) => !r.archived || r.id === reference?.id)
                .map((r) => (
                  <option key={r.id} value={r.id}>
                    {r.name}
                    {r.status !== 'approved' ? ` (${r.status})` : ''}
                  </option>
                ))}
            </select>
          </div>
          {reference && unenteredStocks(reference.lines, components).length > 0 && (
            <p className="stock-changed-note" data-testid="reference-not-predicted">
              {notPredictedWords(unenteredStocks(reference.lines, components))}: the reference recipe is not predicted or costed, so no candidate is
              compared with its figures until the values are entered on Stocks.
            </p>
          )}
          {reference && refChanges.length > 0 && (
            <div className="stock-changed-note" data-testid="reference-stock-changed">
              <strong>Stock data changed since this recipe was saved:</strong>
              <StockChangeList changes={refChanges} />
            </div>
          )}
          {reference && targets && (
            <p className="muted" data-testid="scenario-targets">
              Targets: VG {targets.grade}, ν40 {targets.targetKv40 === null ? 'at the mid-point' : `${fmt.num(targets.targetKv40, 1)} mm²/s`} ±{' '}
              {fmt.num(targets.tolerancePct, 1)} %{targets.minVi !== null ? `, VI ≥ ${fmt.say(targets.minVi)}` : ''}
              {targets.maxAnilinePoint !== null ? `, aniline point ≤ ${fmt.temp(targets.maxAnilinePoint)}` : ''}
              {targets.additive ? `, additive package at ${fmt.pct(targets.additive.massFraction, 1)}` : ''} (from the recipe’s saved targets; edit
              them in the designer).
            </p>
          )}
          <div className="inline-fields">
            <div className="field">
              <label htmlFor={kId}>Stocks per recipe, at most</label>
              <select id={kId} value={st.maxComponents} disabled={running} onChange={(e) => st.setMaxComponents(Number(e.target.value))}>
                {[1, 2, 3, 4, 5].map((k) => (
                  <option key={k} value={k}>
                    {k}
                  </option>
                ))}
              </select>
            </div>
            <div className="field">
              <label htmlFor={objId}>Rank by</label>
              <select id={objId} value={st.objective} disabled={running} onChange={(e) => st.setObjective(e.target.value as Objective)}>
                {(Object.keys(RANKING_LABEL) as Objective[]).map((o) => (
                  <option key={o} value={o}>
                    {RANKING_LABEL[o]}
                  </option>
                ))}
              </select>
            </div>
            <NumberField
              label="Polymer cap"
              unit="mass %"
              size={5}
              allowEmpty
              disabled={running}
              value={targets?.maxPolymerFraction == null ? null : Number((targets.maxPolymerFraction * 100).toFixed(4))}
              validate={(v) => ruleVerdict('maxPolymerFraction', v, fmt, (x) => x / 100)}
              onCommit={(v) => st.setPolymerCap(v === null ? null : v / 100)}
              hint={
                <span className="field-hint" data-testid="polymer-cap-hint">
                  {st.polymerCap !== undefined
                    ? 'set for this search; blank = no cap'
                    : storedCap === null
                      ? `the reference has no cap: the usual ${fmt.num(DEFAULT_MAX_POLYMER_FRACTION * 100, 0)} % applies (common practice, no source); blank = no cap`
                      : 'the reference recipe’s cap; blank = no cap'}
                </span>
              }
            />
            <NumberField
              label="Probability in the plant band, at least"
              unit="%"
              size={6}
              allowEmpty
              disabled={running}
              value={targets?.minInBandProbability == null ? null : Number((targets.minInBandProbability * 100).toFixed(4))}
              validate={(v) => ruleVerdict('minInBandProbability', v, fmt, (x) => x / 100)}
              onCommit={(v) => st.setMinInBandProbability(v === null || v === 0 ? null : v / 100)}
              hint={
                <span className="field-hint" data-testid="probability-hint">
                  {st.minInBandProbability !== undefined
                    ? 'set for this search'
                    : storedP === null
                      ? 'the reference has none'
                      : 'the reference recipe’s target'}
                  ; blank = least cost on the band’s edge (about half the batches outside). Uses each stock’s lot spread of ν40 (Stocks).
                </span>
              }
            />
          </div>
          {refPolymer !== null && refPolymer > (targets?.maxPolymerFraction ?? DEFAULT_MAX_POLYMER_FRACTION) + 1e-6 && (
            <p className="field-warning" data-testid="reference-polymer-warning">
              The reference recipe holds {fmt.num(refPolymer * 100, 0)} % polymer thickener,{' '}
              {targets?.maxPolymerFraction == null
                ? `above the usual ${fmt.num(DEFAULT_MAX_POLYMER_FRACTION * 100, 0)} % (common practice, no source); this search has no cap.`
                : `above the ${fmt.num(targets.maxPolymerFraction * 100, 0)} % cap: the search offers only recipes within the cap.`}
            </p>
          )}
        </div>
        <fieldset className="withdrawn">
          <legend>Stocks to treat as withdrawn</legend>
          <p className="muted">In the reference recipe:</p>
          <ul className="checklist">{refStocks.map(row)}</ul>
          <details>
            <summary>Other stocks{markedOthers ? ` (${markedOthers} marked)` : ''}</summary>
            <ul className="checklist">{others.map(row)}</ul>
          </details>
          {libWithdrawn.length > 0 && (
            <p className="muted">Already withdrawn in the library (never used): {libWithdrawn.map((c) => c.code).join(', ')}.</p>
          )}
        </fieldset>
      </div>
      <div className="run-row">
        <button type="submit" className="primary" disabled={running || !reference}>
          Run search
        </button>
        <button type="button" onClick={onCancel} disabled={!running}>
          Cancel
        </button>
      </div>
    </form>
  );
}

function RunStatusView() {
  const fmt = useFormat();
  const status = useExplorerStore((s) => s.status);
  const p = useExplorerStore((s) => s.progress);
  const error = useExplorerStore((s) => s.error);
  if (status === 'idle') return null;
  const pct = p && p.total > 0 ? Math.round((100 * p.evaluated) / p.total) : 0;
  return (
    <div className="run-status" data-status={status}>
      {(status === 'running' || p) && (
        <div className="progress-row">
          <label htmlFor="explorer-progress">{status === 'running' ? 'Searching…' : 'Search'}</label>
          <progress id="explorer-progress" max={p?.total ?? 1} value={p?.evaluated ?? 0} aria-valuetext={`${pct} %`} />
          <span role="status" aria-live="polite">
            {p ? `${fmt.num(p.evaluated, 0)} of ${fmt.num(p.total, 0)} combinations, ${fmt.num(p.feasible, 0)} feasible, ${fmt.num(p.distinct, 0)} distinct recipes` : 'starting…'}
            {status === 'cancelled' ? ' — cancelled' : ''}
          </span>
        </div>
      )}
      {status === 'error' && (
        <Notice tone="error" title="The search stopped">
          {error}
        </Notice>
      )}
    </div>
  );
}
