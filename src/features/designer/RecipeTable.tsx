import { memo, useId, useRef, useState } from 'react';
import type { Component } from '../../core/formulation/model';
import { CATEGORY_LABEL } from '../../core/formulation/model';
import { useFormat } from '../../components/format';
import type { Basis } from './fractions';
import type { DraftView } from './derive';
import type { RebalanceMode } from './store';
import { FractionInput } from './FractionInput';

export interface RecipeTableProps {
  view: DraftView;
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

/** The recipe's lines with editable shares, kept at 100 % by the rule stated above the table. */
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
  // whenever its props change, so a new callback at every edit would touch every row's radio.
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
  // A line without a cost (no price, or no exchange rate) leaves the total unknown rather than short.
  const totalCost = p.view.lines.some((l) => l.costPerLitre === null) ? null : p.view.lines.reduce((s, l) => s + (l.costPerLitre ?? 0), 0);
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
            <th scope="col" className="num">Cost share, {fmt.settings.currencySymbol}/L at 15 °C</th>
            {p.rebalanceMode === 'balance' && <th scope="col">Balance</th>}
            <th scope="col"><span className="visually-hidden">Remove</span></th>
          </tr>
        </thead>
        <tbody>
          {p.view.lines.map((l) => {
            const c = l.component;
            const code = c?.code ?? l.componentId;
            const isAdd = l.componentId === p.additiveId;
            const canEdit = editable(l.componentId);
            const massCell =
              p.basis === 'mass' && canEdit ? (
                <FractionInput label={`Mass % of ${code}`} value={l.massFraction} onEdit={editorFor(l.componentId)} />
              ) : (
                fmt.num(l.massFraction * 100, 2)
              );
            const volCell =
              p.basis === 'volume' && canEdit ? (
                <FractionInput label={`Volume % of ${code}`} value={l.volumeFraction} onEdit={editorFor(l.componentId)} />
              ) : (
                fmt.num(l.volumeFraction * 100, 2)
              );
            return (
              <tr key={l.componentId} data-component={code}>
                <th scope="row">
                  <span className="code">{code}</span> <span className="muted">{c?.name ?? 'unknown stock'}</span>
                  {c?.availability === 'withdrawn' && <span className="tag tag-bad"> withdrawn</span>}
                  {c?.availability === 'limited' && <span className="tag"> limited</span>}
                  {isAdd && <span className="tag"> fixed treat</span>}
                </th>
                <td>{c ? CATEGORY_LABEL[c.category] : '—'}</td>
                <td className="num">{massCell}</td>
                <td className="num">{volCell}</td>
                <td className="num">{c ? fmt.sig(c.viscosityPoints.find((v) => v.tempC === 40)?.kv ?? NaN, 3) : '—'}</td>
                <td className="num">{l.costPerLitre === null ? '—' : fmt.num(l.costPerLitre, 3)}</td>
                {p.rebalanceMode === 'balance' && (
                  <td className="center">
                    <input
                      type="radio"
                      name="balance-line"
                      aria-label={`Use ${code} as balance stock`}
                      checked={p.balanceId === l.componentId}
                      disabled={isAdd}
                      onChange={balancerFor(l.componentId)}
                    />
                  </td>
                )}
                <td>
                  <button type="button" className="link" aria-label={`Remove ${code}`} onClick={() => p.onRemove(l.componentId)}>
                    remove
                  </button>
                </td>
              </tr>
            );
          })}
        </tbody>
        <tfoot>
          <tr>
            <th scope="row">Total</th>
            <td />
            <td className="num" data-testid="total-mass">{fmt.num(p.view.total * 100, 2)}</td>
            <td className="num">{fmt.num(p.view.lines.reduce((s, l) => s + l.volumeFraction, 0) * 100, 2)}</td>
            <td />
            <td className="num">{totalCost === null ? '—' : fmt.num(totalCost, 3)}</td>
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
