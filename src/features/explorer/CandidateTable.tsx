import { memo, useMemo, useState } from 'react';
import type { Component } from '../../core/formulation/model';
import type { SubstituteCandidate } from '../../core/search/substitutes';
import { useFormat } from '../../components/format';
import { useExplorerStore, type SortKey } from './store';

const PAGE = 25;

const VALUE: Record<SortKey, (c: SubstituteCandidate) => number> = {
  rank: (c) => c.rank,
  size: (c) => c.componentIds.length,
  cost: (c) => c.costPerLitre,
  kv40: (c) => c.kv40,
  vi: (c) => c.vi ?? Number.NEGATIVE_INFINITY,
  aniline: (c) => c.anilinePoint ?? Number.POSITIVE_INFINITY,
  oxidation: (c) => c.oxidationRating ?? Number.NEGATIVE_INFINITY,
};

export function sortCandidates(list: readonly SubstituteCandidate[], key: SortKey, dir: 'asc' | 'desc'): SubstituteCandidate[] {
  const f = VALUE[key];
  const sign = dir === 'asc' ? 1 : -1;
  return [...list].sort((a, b) => sign * (f(a) - f(b)) || a.rank - b.rank);
}

/** The ranked candidates; click a column heading to sort, a row's button to compare it. */
export const CandidateTable = memo(function CandidateTable({
  candidates,
  components,
  referenceCost,
  frontierCount,
  total,
  forcedIds,
}: {
  candidates: readonly SubstituteCandidate[];
  components: ReadonlyMap<string, Component>;
  referenceCost: number | null;
  frontierCount: number;
  total: number;
  /** Components in every candidate (the fixed additive): listed once, above the table. */
  forcedIds: readonly string[];
}) {
  const fmt = useFormat();
  const sort = useExplorerStore((s) => s.sort);
  const selectedKey = useExplorerStore((s) => s.selectedKey);
  const adopted = useExplorerStore((s) => s.adopted);
  const [shown, setShown] = useState(PAGE);
  const sorted = useMemo(() => sortCandidates(candidates, sort.key, sort.dir), [candidates, sort]);
  const head = (key: SortKey, label: string, numeric = true) => (
    <th scope="col" className={numeric ? 'num' : undefined} aria-sort={sort.key === key ? (sort.dir === 'asc' ? 'ascending' : 'descending') : undefined}>
      <button type="button" className="sort" onClick={() => useExplorerStore.getState().sortBy(key)}>
        {label}
        <span aria-hidden="true">{sort.key === key ? (sort.dir === 'asc' ? ' ▲' : ' ▼') : ''}</span>
      </button>
    </th>
  );
  return (
    <section className="candidates" aria-labelledby="cand-h">
      <h3 id="cand-h">
        Candidates <span className="muted">({total} distinct recipes{total > candidates.length ? `, best ${candidates.length} listed` : ''}; {frontierCount} on the cost–solvency frontier)</span>
      </h3>
      {forcedIds.length > 0 && (
        <p className="muted">
          Every candidate also holds {forcedIds.map((id) => components.get(id)?.code ?? id).join(', ')} at its fixed share (not repeated below).
        </p>
      )}
      <table className="data-table" data-testid="candidates">
        <thead>
          <tr>
            {head('rank', 'Rank')}
            <th scope="col">Recipe (mass %)</th>
            {head('cost', `Cost, ${fmt.settings.currencySymbol}/L`)}
            <th scope="col" className="num">vs reference</th>
            {head('kv40', 'ν40')}
            {head('vi', 'VI')}
            {head('aniline', `Aniline pt, ${fmt.tempUnit}`)}
            {head('oxidation', 'Oxid. rating')}
            <th scope="col">Frontier</th>
            <th scope="col">
              <span className="visually-hidden">Compare</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {sorted.slice(0, shown).map((c) => {
            const isSel = c.key === selectedKey;
            const delta = referenceCost === null ? null : c.costPerLitre - referenceCost;
            return (
              <tr key={c.key} className={isSel ? 'selected' : undefined} aria-selected={isSel} data-key={c.key}>
                <td className="num">{c.rank}</td>
                <td className="recipe-cell">
                  {c.lines.filter((l) => !forcedIds.includes(l.componentId)).map((l) => (
                    <span key={l.componentId} className="chip">
                      <span className="code">{components.get(l.componentId)?.code ?? l.componentId}</span> {fmt.num(l.massFraction * 100, 1)}
                    </span>
                  ))}
                  {adopted[c.key] && <span className="tag">adopted</span>}
                </td>
                <td className="num">{fmt.num(c.costPerLitre, 3)}</td>
                <td className={`num ${delta !== null && delta > 0 ? 'worse' : 'better'}`}>
                  {delta === null ? '—' : `${delta > 0 ? '+' : ''}${fmt.num(delta, 3)}`}
                </td>
                <td className="num">{fmt.num(c.kv40, 1)}</td>
                <td className="num">{c.vi === null ? '—' : fmt.num(c.vi, 0)}</td>
                <td className="num">{c.anilinePoint === null ? '—' : fmt.num(fmt.tempValue(c.anilinePoint), 1)}</td>
                <td className="num">{c.oxidationRating === null ? '—' : fmt.num(c.oxidationRating, 1)}</td>
                <td className="center">{c.onFrontier ? <span aria-label="on the frontier">●</span> : ''}</td>
                <td>
                  <button type="button" className="link" aria-pressed={isSel} onClick={() => useExplorerStore.getState().select(c.key)}>
                    {isSel ? 'comparing' : 'compare'}
                    <span className="visually-hidden"> candidate {c.rank}</span>
                  </button>
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
      {sorted.length > shown && (
        <button type="button" onClick={() => setShown((n) => n + PAGE)}>
          Show {Math.min(PAGE, sorted.length - shown)} more
        </button>
      )}
    </section>
  );
});
