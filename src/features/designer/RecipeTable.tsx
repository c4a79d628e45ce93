import { memo, useId, useMemo, useRef, useState } from 'react';
import type { Component } from '../../core/formulation/model';
import { entryFieldsInWords, notEnteredFields } from '../../core/formulation/entered-values';
import { CATEGORY_LABEL } from '../../core/formulation/model';
import { moneySymbol, useFormat } from '../../components/format';
import type { Basis } from './fractions';
import type { DraftView, LineView } from './derive';
import { RelayText, type Relay } from '../../components/relay';
import type { RebalanceMode } from './store';
import { FractionInput, type ShareSource } from './FractionInput';

/**
 * A stock of the draft (above 0 %) whose density is not yet entered: volume shares and costs per litre
 * (ρ_blend) would rest on its placeholder, so they read '—'.
 */
function densityPending(v: DraftView): boolean {
  return v.lines.some((l) => l.massFraction > 0 && l.component !== null && notEnteredFields(l.component).includes('density15'));
}

/** A line of the recipe as the table lays it out (which stock; its shares come from the relay). */
export interface TableLine {
  componentId: string;
  component: Component | null;
}

export interface RecipeTableProps {
  /** The recipe's lines in order (changes only when a stock is added or removed). */
  lines: readonly TableLine[];
  /** The derived numbers of the draft (shares, volume %, cost); each cell shows its own piece. */
  view: Relay<DraftView>;
  basis: Basis;
  rebalanceMode: RebalanceMode;
  balanceId: string | null;
  additiveId: string | null;
  editNote: string;
  /** Stocks that can be added (not withdrawn, not already in the recipe). */
  addable: readonly Component[];
  onEdit: (componentId: string, fraction: number) => void;
  onRemove: (componentId: string) => void;
  onAdd: (componentId: string) => void;
  onBasis: (basis: Basis) => void;
  onRebalanceMode: (mode: RebalanceMode) => void;
  onBalance: (componentId: string) => void;
}

/** The draft's lines by stock, built once per derived view. */
const lineIndex = new WeakMap<DraftView, Map<string, LineView>>();
function lineOf(view: DraftView, id: string): LineView | undefined {
  let m = lineIndex.get(view);
  if (!m) {
    m = new Map(view.lines.map((l) => [l.componentId, l]));
    lineIndex.set(view, m);
  }
  return m.get(id);
}

/** The total cost per litre: unknown (null) when a line has none, rather than short. */
function totalCostOf(view: DraftView): number | null {
  return view.lines.some((l) => l.costPerLitre === null) ? null : view.lines.reduce((s, l) => s + (l.costPerLitre ?? 0), 0);
}

/**
 * The recipe's lines with editable shares, kept at 100 % by the rule stated above the table. The
 * table is laid out per set of lines; an edit re-renders only the numbers it changes (each cell reads
 * its piece of the derived view from the relay).
 */
export const RecipeTable = memo(function RecipeTable(p: RecipeTableProps) {
  const fmt = useFormat();
  // One edit callback per line, kept across renders (calling the latest onEdit), so a line whose
  // share did not change is not re-rendered (balance-stock mode).
  const onEditRef = useRef(p.onEdit);
  onEditRef.current = p.onEdit;
  const editors = useRef(new Map<string, (f: number) => void>()).current;
  const editorFor = (id: string) => {
    let e = editors.get(id);
    if (!e) {
      e = (f: number) => onEditRef.current(id, f);
      editors.set(id, e);
    }
    return e;
  };
  // Likewise one balance-choice callback per line: React rewrites a radio button's attributes
  // whenever its props change, so a new callback at every render would touch every row's radio.
  const onBalanceRef = useRef(p.onBalance);
  onBalanceRef.current = p.onBalance;
  const balancers = useRef(new Map<string, () => void>()).current;
  const balancerFor = (id: string) => {
    let b = balancers.get(id);
    if (!b) {
      b = () => onBalanceRef.current(id);
      balancers.set(id, b);
    }
    return b;
  };
  const editable = (id: string) => !(p.rebalanceMode === 'balance' && p.balanceId === id);
  const totals = useMemo(
    () => ({
      mass: (v: DraftView) => fmt.num(v.total * 100, 2),
      volume: (v: DraftView) => (densityPending(v) ? '—' : fmt.num(v.lines.reduce((s, l) => s + l.volumeFraction, 0) * 100, 2)),
      cost: (v: DraftView) => {
        const t = totalCostOf(v);
        return t === null ? '—' : fmt.num(t, 3);
      },
    }),
    [fmt],
  );
  return (
    <section className="recipe-table" aria-labelledby="recipe-h">
      <h3 id="recipe-h">Recipe</h3>
      <RecipeControls basis={p.basis} rebalanceMode={p.rebalanceMode} onBasis={p.onBasis} onRebalanceMode={p.onRebalanceMode} />
      <table className="data-table" data-testid="recipe-lines">
        <thead>
          <tr>
            <th scope="col">Stock</th>
            <th scope="col">Category</th>
            <th scope="col" className="num">Mass %</th>
            <th scope="col" className="num">Volume %</th>
            <th scope="col" className="num">ν40, mm²/s</th>
            <th scope="col" className="num">Cost share, {moneySymbol(fmt.settings)}/L at 15 °C</th>
            {p.rebalanceMode === 'balance' && <th scope="col">Balance</th>}
            <th scope="col"><span className="visually-hidden">Remove</span></th>
          </tr>
        </thead>
        <tbody>
          {p.lines.map((l) => (
            <RecipeRow
              key={l.componentId}
              line={l}
              view={p.view}
              editBasis={editable(l.componentId) ? p.basis : null}
              isAdditive={l.componentId === p.additiveId}
              balance={p.rebalanceMode === 'balance' ? p.balanceId === l.componentId : null}
              onEdit={editorFor(l.componentId)}
              onBalance={balancerFor(l.componentId)}
              onRemove={p.onRemove}
            />
          ))}
        </tbody>
        <tfoot>
          <tr>
            <th scope="row">Total</th>
            <td />
            <td className="num" data-testid="total-mass">
              <RelayText relay={p.view} select={totals.mass} />
            </td>
            <td className="num">
              <RelayText relay={p.view} select={totals.volume} />
            </td>
            <td />
            <td className="num">
              <RelayText relay={p.view} select={totals.cost} />
            </td>
            {p.rebalanceMode === 'balance' && <td />}
            <td />
          </tr>
        </tfoot>
      </table>
      {p.editNote && (
        <p className="field-warning" role="status">
          {p.editNote}
        </p>
      )}
      <AddLine addable={p.addable} onAdd={p.onAdd} />
    </section>
  );
});

/** One line of the recipe; its numbers follow the relay, the rest changes only with its props. */
const RecipeRow = memo(function RecipeRow({
  line,
  view,
  editBasis,
  isAdditive,
  balance,
  onEdit,
  onBalance,
  onRemove,
}: {
  line: TableLine;
  view: Relay<DraftView>;
  /** The basis its share is edited on; null when it is not editable (the balance stock). */
  editBasis: Basis | null;
  isAdditive: boolean;
  /** Whether it is the balance stock; null when the recipe is not kept at 100 % by a balance stock. */
  balance: boolean | null;
  onEdit: (fraction: number) => void;
  onBalance: () => void;
  onRemove: (componentId: string) => void;
}) {
  const fmt = useFormat();
  const id = line.componentId;
  const c = line.component;
  const code = c?.code ?? id;
  const text = useMemo(
    () => ({
      mass: (v: DraftView) => {
        const l = lineOf(v, id);
        return l ? fmt.num(l.massFraction * 100, 2) : '';
      },
      volume: (v: DraftView) => {
        const l = lineOf(v, id);
        return !l ? '' : densityPending(v) ? '—' : fmt.num(l.volumeFraction * 100, 2);
      },
      cost: (v: DraftView) => {
        const l = lineOf(v, id);
        return !l || l.costPerLitre === null || densityPending(v) ? '—' : fmt.num(l.costPerLitre, 3);
      },
    }),
    [fmt, id],
  );
  const share = (basis: Basis) =>
    editBasis === basis ? (
      <LineShare view={view} id={id} basis={basis} label={`${basis === 'mass' ? 'Mass' : 'Volume'} % of ${code}`} onEdit={onEdit} />
    ) : (
      <RelayText relay={view} select={text[basis]} />
    );
  return (
    <tr data-component={code}>
      <th scope="row">
        <span className="code">{code}</span> <span className="muted">{c?.name ?? 'unknown stock'}</span>
        {c?.availability === 'withdrawn' && <span className="tag tag-bad"> withdrawn</span>}
        {c?.availability === 'limited' && <span className="tag"> limited</span>}
        {isAdditive && <span className="tag"> fixed treat</span>}
        {c && notEnteredFields(c).length > 0 && (
          <span className="tag tag-bad" data-testid="line-values-pending" title="Its prediction rests on placeholders: enter the values on Stocks">
            {' '}
            {entryFieldsInWords(notEnteredFields(c))} not entered
          </span>
        )}
      </th>
      <td>{c ? CATEGORY_LABEL[c.category] : '—'}</td>
      <td className="num">{share('mass')}</td>
      <td className="num">{share('volume')}</td>
      <td className="num">{c && !notEnteredFields(c).includes('kv40') ? fmt.sig(c.viscosityPoints.find((v) => v.tempC === 40)?.kv ?? NaN, 3) : '—'}</td>
      <td className="num">
        <RelayText relay={view} select={text.cost} />
      </td>
      {balance !== null && (
        <td className="center">
          <input type="radio" name="balance-line" aria-label={`Use ${code} as balance stock`} checked={balance} disabled={isAdditive} onChange={onBalance} />
        </td>
      )}
      <td>
        <button type="button" className="link" aria-label={`Remove ${code}`} onClick={() => onRemove(id)}>
          remove
        </button>
      </td>
    </tr>
  );
});

/** A line's editable share, read from the relay (its text cell follows each edit without a React render). */
function LineShare({ view, id, basis, label, onEdit }: { view: Relay<DraftView>; id: string; basis: Basis; label: string; onEdit: (f: number) => void }) {
  const share = useMemo<ShareSource>(
    () => ({
      get: () => {
        const l = lineOf(view.get(), id);
        return l ? (basis === 'mass' ? l.massFraction : l.volumeFraction) : 0;
      },
      subscribe: view.subscribe,
    }),
    [view, id, basis],
  );
  return <FractionInput label={label} share={share} onEdit={onEdit} />;
}

/** Adds a stock to the recipe (its own component: an edit of a share does not re-render the list of stocks). */
const AddLine = memo(function AddLine({ addable, onAdd }: { addable: readonly Component[]; onAdd: (componentId: string) => void }) {
  const addId = useId();
  const [toAdd, setToAdd] = useState('');
  return (
    <form
      className="add-line"
      onSubmit={(e) => {
        e.preventDefault();
        if (toAdd) {
          onAdd(toAdd);
          setToAdd('');
        }
      }}
    >
      <label htmlFor={addId}>Add a stock</label>
      <select id={addId} value={toAdd} onChange={(e) => setToAdd(e.target.value)}>
        <option value="">choose…</option>
        {addable.map((c) => (
          <option key={c.id} value={c.id}>
            {c.code} — {c.name}
            {notEnteredFields(c).length ? ` (${entryFieldsInWords(notEnteredFields(c))} not entered)` : ''}
          </option>
        ))}
      </select>
      <button type="submit" disabled={!toAdd}>
        Add
      </button>
    </form>
  );
});

/**
 * How shares are edited and kept at 100 %, with the rule in words (its own component: an edit of a
 * share leaves its radio buttons untouched).
 */
const RecipeControls = memo(function RecipeControls({
  basis,
  rebalanceMode,
  onBasis,
  onRebalanceMode,
}: {
  basis: Basis;
  rebalanceMode: RebalanceMode;
  onBasis: (basis: Basis) => void;
  onRebalanceMode: (mode: RebalanceMode) => void;
}) {
  return (
    <>
      <div className="recipe-controls">
        <fieldset className="inline">
          <legend>Edit shares as</legend>
          <label className="radio">
            <input type="radio" name="basis" checked={basis === 'mass'} onChange={() => onBasis('mass')} /> mass %
          </label>
          <label className="radio">
            <input type="radio" name="basis" checked={basis === 'volume'} onChange={() => onBasis('volume')} /> volume %
          </label>
        </fieldset>
        <fieldset className="inline">
          <legend>Keep 100 % by</legend>
          <label className="radio">
            <input type="radio" name="rebalance" checked={rebalanceMode === 'proportional'} onChange={() => onRebalanceMode('proportional')} />{' '}
            scaling the other lines
          </label>
          <label className="radio">
            <input type="radio" name="rebalance" checked={rebalanceMode === 'balance'} onChange={() => onRebalanceMode('balance')} /> a balance
            stock
          </label>
        </fieldset>
      </div>
      <p className="rule-note" data-testid="rebalance-rule">
        {rebalanceMode === 'balance'
          ? 'When you change a line, only the balance stock (marked ●) changes to keep the total at 100 %; every other line keeps its mass fraction.'
          : 'When you change a line, the other lines are scaled in proportion to keep the total at 100 %; the additive package keeps its treat rate.'}{' '}
        Volume % assumes ideal mixing at 15 °C.
      </p>
    </>
  );
});
