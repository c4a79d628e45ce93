import { memo, useMemo, useState } from 'react';
import type { Component } from '../../core/formulation/model';
import type { SubstituteCandidate } from '../../core/search/substitutes';
import { useFormat } from '../../components/format';
import { MethodNote } from '../../components/notices';
import type { BlendMethod } from '../../core/blending/blend-viscosity';
import {
  DEFAULT_EQUIVALENCE_TOLERANCE,
  groupCandidates,
  sourceGroups,
  type CandidateGroup,
} from '../../core/search/equivalent-sources';
import { useExplorerStore, type SortKey } from './store';
import { useRecipes } from '../../state';
import { probabilityText } from '../../components/format';
import type { InBandOf } from './in-band';

const PAGE = 25;
const NO_PROBABILITIES: ReadonlyMap<string, InBandOf> = new Map();

const VALUE: Record<Exclude<SortKey, 'inBand'>, (c: SubstituteCandidate) => number> = {
  rank: (c) => c.rank,
  size: (c) => c.componentIds.length,
  cost: (c) => c.costPerLitre,
  kv40: (c) => c.kv40,
  vi: (c) => c.vi ?? Number.NEGATIVE_INFINITY,
  aniline: (c) => c.anilinePoint ?? Number.POSITIVE_INFINITY,
  oxidation: (c) => c.oxidationRating ?? Number.NEGATIVE_INFINITY,
};

/**
 * Candidates sorted by a column (ties by rank). 'inBand' sorts by the probability in the plant band,
 * read from `inBand` (a candidate without one sorts last).
 */
export function sortCandidates(
  list: readonly SubstituteCandidate[],
  key: SortKey,
  dir: 'asc' | 'desc',
  inBand?: ReadonlyMap<string, InBandOf>,
): SubstituteCandidate[] {
  const f = key === 'inBand' ? (c: SubstituteCandidate) => inBand?.get(c.key)?.plant ?? (dir === 'asc' ? 2 : -1) : VALUE[key];
  const sign = dir === 'asc' ? 1 : -1;
  return [...list].sort((a, b) => sign * (f(a) - f(b)) || a.rank - b.rank);
}

/** Total mass share of polymer stocks in a candidate (0–1). */
export function polymerShare(c: Pick<SubstituteCandidate, 'lines'>, components: ReadonlyMap<string, Component>): number {
  return c.lines.reduce((s, l) => s + (components.get(l.componentId)?.category === 'polymer' ? l.massFraction : 0), 0);
}

/**
 * The ranked candidates; click a column heading to sort, a row's button to compare it. Candidates
 * that differ only by equivalent sources (same category, viscosities, density and aniline point
 * within DEFAULT_EQUIVALENCE_TOLERANCE) share one row that expands to the alternatives.
 */
export const CandidateTable = memo(function CandidateTable({
  candidates,
  components,
  referenceCost,
  frontierCount,
  total,
  forcedIds,
  polymerCap,
  inBand = NO_PROBABILITIES,
  minInBandProbability = null,
  method,
}: {
  candidates: readonly SubstituteCandidate[];
  components: ReadonlyMap<string, Component>;
  referenceCost: number | null;
  frontierCount: number;
  total: number;
  /** Components in every candidate (the fixed additive): listed once, above the table. */
  forcedIds: readonly string[];
  /** Polymer cap to warn against (mass fraction; the search's cap, or the common-practice default when it has none). */
  polymerCap: number;
  /** Probabilities in the plant and ISO bands by candidate key (and the nominal recipe of its stocks). */
  inBand?: ReadonlyMap<string, InBandOf>;
  /** The least probability in the plant band the search asked for (null: none). */
  minInBandProbability?: number | null;
  /** Blend-viscosity method the candidates were solved with, named above the table. */
  method: BlendMethod;
}) {
  const fmt = useFormat();
  const sort = useExplorerStore((s) => s.sort);
  const selectedKey = useExplorerStore((s) => s.selectedKey);
  const adoptedIds = useExplorerStore((s) => s.adopted);
  // A candidate counts as adopted while its recipe is saved (an undo of the adoption takes the mark away).
  const recipes = useRecipes((s) => s.recipes);
  const adopted = useMemo(() => {
    const saved = new Set(recipes.map((r) => r.id));
    return Object.fromEntries(Object.entries(adoptedIds).filter(([, id]) => saved.has(id)));
  }, [adoptedIds, recipes]);
  const [shown, setShown] = useState(PAGE);
  const [open, setOpen] = useState<ReadonlySet<string>>(() => new Set());
  const sorted = useMemo(() => sortCandidates(candidates, sort.key, sort.dir, inBand), [candidates, sort, inBand]);
  const prob = (p: number | undefined) => (p === undefined ? '—' : probabilityText(p, (x, d) => fmt.num(x, d)));
  // Group equivalent sources among the stocks the candidates use (only those: grouping is quadratic).
  const groups = useMemo(() => {
    const used = new Set(candidates.flatMap((c) => c.componentIds));
    const stocks = [...components.values()].filter((c) => used.has(c.id));
    return groupCandidates(sorted, sourceGroups(stocks));
  }, [candidates, components, sorted]);
  const tol = DEFAULT_EQUIVALENCE_TOLERANCE;
  // A group opens when asked, or when the candidate being compared is one of its alternatives.
  const isOpen = (g: CandidateGroup<SubstituteCandidate>) => open.has(g.key) || g.alternatives.some((a) => a.key === selectedKey);
  const head = (key: SortKey, label: string, numeric = true) => (
    <th scope="col" className={numeric ? 'num' : undefined} aria-sort={sort.key === key ? (sort.dir === 'asc' ? 'ascending' : 'descending') : undefined}>
      <button type="button" className="sort" onClick={() => useExplorerStore.getState().sortBy(key)}>
        {label}
        <span aria-hidden="true">{sort.key === key ? (sort.dir === 'asc' ? ' ▲' : ' ▼') : ''}</span>
      </button>
    </th>
  );
  const premiumCell = (b: InBandOf | undefined, cost: number) => {
    if (!b?.nominal) return '—';
    const d = cost - b.nominal.costPerLitre;
    return (
      <span title={`${prob(b.plant)} instead of ${prob(b.nominal.probability)} in the plant band (the same stocks without the condition: ${fmt.num(b.nominal.costPerLitre, 3)} ${fmt.settings.currencySymbol}/L at 15 °C)`}>
        {d >= 0 ? '+' : '−'}
        {fmt.num(Math.abs(d), 3)}
        <span className="visually-hidden">
          {' '}
          buys {prob(b.plant)} instead of {prob(b.nominal.probability)}
        </span>
      </span>
    );
  };
  const row = (c: SubstituteCandidate, group: CandidateGroup<SubstituteCandidate> | null, alternative: boolean) => {
    const isSel = c.key === selectedKey;
    const delta = referenceCost === null ? null : c.costPerLitre - referenceCost;
    const poly = polymerShare(c, components);
    const expanded = group !== null && isOpen(group);
    // Stocks by share, largest first (the fixed additive is listed once above the table).
    const lines = c.lines.filter((l) => !forcedIds.includes(l.componentId)).sort((a, b) => b.massFraction - a.massFraction);
    return (
      <tr key={c.key} className={`${isSel ? 'selected' : ''}${alternative ? ' alternative' : ''}`} aria-selected={isSel} data-key={c.key}>
        <td className="num">{c.rank}</td>
        <td className="recipe-cell">
          {alternative ? <span className="visually-hidden">Alternative source: </span> : null}
          {lines.map((l) => {
            const stock = components.get(l.componentId);
            return (
              <span key={l.componentId} className="chip">
                <span className="code">{stock?.code ?? l.componentId}</span> {fmt.num(l.massFraction * 100, 1)}
                {stock?.availability === 'limited' ? <span className="tag tag-limited">limited</span> : null}
              </span>
            );
          })}
          {poly > polymerCap + 1e-6 && (
            <span className="tag tag-bad" data-testid="polymer-warning">
              polymer {fmt.num(poly * 100, 0)} % — above the {fmt.num(polymerCap * 100, 0)} % cap
            </span>
          )}
          {adopted[c.key] && <span className="tag">adopted</span>}
          {group && group.alternatives.length > 0 && (
            <div>
              <button
                type="button"
                className="link"
                aria-expanded={expanded}
                onClick={() =>
                  setOpen((o) => {
                    const n = new Set(o);
                    if (n.has(group.key)) n.delete(group.key);
                    else n.add(group.key);
                    return n;
                  })
                }
              >
                {expanded ? 'hide' : 'show'} {group.alternatives.length} with equivalent sources
                <span className="visually-hidden"> for candidate {c.rank}</span>
              </button>
            </div>
          )}
        </td>
        <td className="num">{fmt.num(c.costPerLitre, 3)}</td>
        <td className={`num ${delta !== null && delta > 0 ? 'worse' : 'better'}`}>
          {delta === null ? '—' : `${delta > 0 ? '+' : ''}${fmt.num(delta, 3)}`}
        </td>
        <td className="num">{fmt.num(c.kv40, 1)}</td>
        <td className="num">{c.vi === null ? '—' : fmt.num(c.vi, 0)}</td>
        <td className="num">{c.anilinePoint === null ? '—' : fmt.num(fmt.tempValue(c.anilinePoint), 1)}</td>
        <td className="num">{c.oxidationRating === null ? '—' : fmt.num(c.oxidationRating, 1)}</td>
        <td className="num nowrap" data-testid="p-plant">{prob(inBand.get(c.key)?.plant)}</td>
        <td className="num nowrap" data-testid="p-iso">{prob(inBand.get(c.key)?.iso)}</td>
        {minInBandProbability !== null && <td className="num nowrap" data-testid="premium">{premiumCell(inBand.get(c.key), c.costPerLitre)}</td>}
        <td className="center">{c.onFrontier ? <span aria-label="on the frontier">●</span> : ''}</td>
        <td>
          <button type="button" className="link" aria-pressed={isSel} onClick={() => useExplorerStore.getState().select(c.key)}>
            {isSel ? 'comparing' : 'compare'}
            <span className="visually-hidden"> candidate {c.rank}</span>
          </button>
        </td>
      </tr>
    );
  };
  return (
    <section className="candidates" aria-labelledby="cand-h">
      <h3 id="cand-h">
        Candidates <span className="muted">({total} distinct recipes{total > candidates.length ? `, best ${candidates.length} listed` : ''}; {frontierCount} on the cost–solvency frontier)</span>
      </h3>
      <MethodNote method={method} />
      {forcedIds.length > 0 && (
        <p className="muted">
          Every candidate also holds {forcedIds.map((id) => components.get(id)?.code ?? id).join(', ')} at its fixed share (not repeated below).
        </p>
      )}
      <p className="muted" data-testid="in-band-note">
        Probability that a batch lands in the plant band (the search’s ν40 band) and in the ISO band, from each stock’s lot-to-lot spread
        of ν40 (Stocks; category defaults are common practice, no source).{' '}
        {minInBandProbability !== null
          ? `Every candidate lands in the plant band with at least ${prob(minInBandProbability)}; the premium is its extra cost per litre over the least-cost recipe of the same stocks without that condition.`
          : 'Least-cost recipes sit on the band’s edge, so about half their batches land outside: set a probability to plan robust recipes.'}
      </p>
      <p className="muted" data-testid="grouping-note">
        Stocks listed by share, largest first. Recipes that differ only by an equivalent source share a row: same category, ν40 and ν100
        within {fmt.num(tol.viscosityPct, 0)} %, density within {fmt.num(tol.densityKgL, 3)} kg/L, aniline point within{' '}
        {fmt.num(fmt.tempValue(tol.anilineC) - fmt.tempValue(0), fmt.tempUnit === '°C' ? 0 : 1)} {fmt.tempUnit} (common practice, no source).
      </p>
      <table className="data-table" data-testid="candidates">
        <thead>
          <tr>
            {head('rank', 'Rank')}
            <th scope="col">Recipe (mass %)</th>
            {head('cost', `Cost, ${fmt.settings.currencySymbol}/L at 15 °C`)}
            <th scope="col" className="num">vs reference</th>
            {head('kv40', 'ν40')}
            {head('vi', 'VI')}
            {head('aniline', `Aniline pt, ${fmt.tempUnit}`)}
            {head('oxidation', 'Oxid. rating')}
            {head('inBand', 'In plant band')}
            <th scope="col" className="num">
              In ISO band
            </th>
            {minInBandProbability !== null && (
              <th scope="col" className="num">
                Premium, {fmt.settings.currencySymbol}/L at 15 °C
              </th>
            )}
            <th scope="col">Frontier</th>
            <th scope="col">
              <span className="visually-hidden">Compare</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {groups.slice(0, shown).flatMap((g) => [
            row(g.lead, g, false),
            ...(isOpen(g) ? g.alternatives.map((a) => row(a, null, true)) : []),
          ])}
        </tbody>
      </table>
      {groups.length > shown && (
        <button type="button" onClick={() => setShown((n) => n + PAGE)}>
          Show {Math.min(PAGE, groups.length - shown)} more
        </button>
      )}
    </section>
  );
});
