// The plan's inputs: which recipes take part and their demand, the limited stocks and their supply,
// the stocks that must stay in use and the tank limit. Every edit is saved and is one undo step.
import { notEnteredFields } from '../../core/formulation/entered-values';
import { useId, useState, type ReactNode } from 'react';
import type { Component, Recipe } from '../../core/formulation/model';
import { NumberField, TextField, type Verdict } from '../../components/fields';
import { useFormat } from '../../components/format';
import { leastUseAboveSupply, linePlanActions, type LinePlanInputs } from '../../state';
import { NUMBER_RULES, checkText } from '../../state/field-rules';
import { limitedStocks, plannedDemands, unplannedDemands, withdrawnSupplies } from './derive';

/** kg per unit the user types in. */
const PER_UNIT = { kg: 1, t: 1000 } as const;

/** A quantity field's verdict in the user's unit, from the stored field's rule [kg]. */
function quantityVerdict(
  rule: 'demandKg' | 'supplyKg' | 'minUseKg',
  unit: 'kg' | 't',
  label: string,
  v: number | null,
  empty: string,
  say: (v: number) => string,
): Verdict {
  if (v === null) return {};
  const r = NUMBER_RULES[rule];
  const kg = v * PER_UNIT[unit];
  const max = r.max / PER_UNIT[unit];
  if (r.minExclusive ? kg <= r.min : kg < r.min) {
    return { error: `${label}: must be ${r.minExclusive ? 'above' : 'at least'} ${say(r.min / PER_UNIT[unit])} ${unit}${empty}` };
  }
  if (kg > r.max) return { error: `${label}: at most ${say(max)} ${unit} can be planned` };
  return {};
}

export function PlanInputs({
  plan,
  recipes,
  components,
  disabled,
}: {
  plan: LinePlanInputs;
  recipes: readonly Recipe[];
  components: readonly Component[];
  disabled: boolean;
}) {
  const fmt = useFormat();
  const unit = plan.demandUnit;
  const toShown = (kg: number | null | undefined) => (kg === null || kg === undefined ? null : kg / PER_UNIT[unit]);
  const toKg = (v: number) => v * PER_UNIT[unit];
  const [showAll, setShowAll] = useState(false);
  const unitId = useId();

  // Recipes that can take part: not replaced by an approved revision, not archived. By default the
  // approved ones and those with a demand; drafts on request.
  const demands = plannedDemands(recipes, plan);
  const unplanned = unplannedDemands(recipes, plan);
  const sorted = recipes
    .filter((r) => r.status !== 'superseded' && !r.archived)
    .sort((a, b) => a.grade - b.grade || a.name.localeCompare(b.name));
  const shown = showAll ? sorted : sorted.filter((r) => r.status === 'approved' || demands.has(r.id));
  const hidden = sorted.length - shown.length;
  const limited = limitedStocks(components, plan);
  const goneSupplies = withdrawnSupplies(components, recipes, plan);
  const limitable = components.filter((c) => c.availability !== 'withdrawn' && !limited.includes(c));
  const keepIds = Object.keys(plan.keep).filter((id) => components.some((c) => c.id === id));
  const keepable = components.filter((c) => c.availability !== 'withdrawn' && !(c.id in plan.keep));
  const byId = new Map(components.map((c) => [c.id, c]));
  const plannedTotal = [...demands.values()].reduce((s, d) => s + d.kg, 0);
  const amount = (kg: number) => `${fmt.say(kg / PER_UNIT[unit])} ${unit}`;
  /** A supply typed below the stock's least use, or a least use above its supply, in the user's words. */
  const overSupply = (c: Component, change: { keepKg?: number | null; supplyKg?: number | null }): string | undefined => {
    const over = leastUseAboveSupply(plan, c.id, change);
    if (!over) return undefined;
    return change.supplyKg !== undefined
      ? `${c.code}: a supply of ${amount(over.supplyKg)} is below its least use of ${amount(over.leastUseKg)} (Stocks that must stay in use). Raise the supply or lower the least use.`
      : `${c.code}: a least use of ${amount(over.leastUseKg)} is above its supply of ${amount(over.supplyKg)} over the period (Limited stocks). Lower the least use or raise the supply.`;
  };

  return (
    <div className="lp-inputs">
      <section className="panel lp-grades" aria-labelledby={`${unitId}-grades`}>
        <h3 id={`${unitId}-grades`}>Grades and demand</h3>
        <div className="lp-row">
          <TextField
            label="Planning period"
            value={plan.period}
            placeholder="e.g. 2026"
            size={12}
            validate={(v) => ({ error: checkText('planPeriod', v) ?? undefined })}
            onCommit={(v) => linePlanActions.setPeriod(v)}
            disabled={disabled}
          />
          <fieldset className="lp-unit" disabled={disabled}>
            <legend id={unitId}>Quantities in</legend>
            {(['t', 'kg'] as const).map((u) => (
              <label key={u}>
                <input type="radio" name={unitId} checked={unit === u} onChange={() => linePlanActions.setDemandUnit(u)} /> {u === 't' ? 'tonnes' : 'kg'}
              </label>
            ))}
          </fieldset>
        </div>
        <p className="small muted">Give each recipe that takes part its demand over the period; leave it empty to keep a recipe out of the plan.</p>
        <div className="table-scroll">
          <table className="data lp-demand-table">
            <thead>
              <tr>
                <th scope="col">Grade</th>
                <th scope="col">Recipe</th>
                <th scope="col" className="num">
                  Demand [{unit}]
                </th>
              </tr>
            </thead>
            <tbody>
              {shown.map((r) => (
                <tr key={r.id}>
                  <td>VG {r.grade}</td>
                  <th scope="row">
                    {r.name} <span className="small muted">rev. {r.revision}</span>
                    {r.status === 'draft' ? <span className="tag"> draft</span> : null}
                  </th>
                  <td className="num">
                    <NumberField
                      label={`Demand of “${r.name}”`}
                      hideLabel
                      allowEmpty
                      size={9}
                      value={toShown(demands.get(r.id)?.kg)}
                      validate={(v) => quantityVerdict('demandKg', unit, `Demand of ${r.name}`, v, ' (leave it empty to keep the recipe out of the plan)', fmt.say)}
                      onCommit={(v) => linePlanActions.setDemand(r.id, v === null ? null : toKg(v), demands.get(r.id)?.keys)}
                      disabled={disabled}
                    />
                  </td>
                </tr>
              ))}
            </tbody>
            <tfoot>
              <tr>
                <th scope="row" colSpan={2}>
                  Total demand
                </th>
                <td className="num">
                  {fmt.num(plannedTotal / PER_UNIT[unit], unit === 't' ? 1 : 0)} {unit}
                </td>
              </tr>
            </tfoot>
          </table>
        </div>
        {unplanned.length > 0 && (
          <p className="small" role="status" data-testid="unplanned-demands">
            Not planned:{' '}
            {unplanned
              .map((u) => `${fmt.num(u.kg / PER_UNIT[unit], unit === 't' ? 1 : 0)} ${unit} for ${u.recipe ? `“${u.recipe.name}” (archived)` : 'a recipe since deleted'}`)
              .join('; ')}
            . Restore the recipe on Recipes to plan it again, or{' '}
            <button
              type="button"
              className="link-button"
              disabled={disabled}
              onClick={() => linePlanActions.setDemand(unplanned[0]!.key, null, unplanned.slice(1).map((u) => u.key))}
            >
              Clear these demands
            </button>
          </p>
        )}
        {(hidden > 0 || showAll) && (
          <button type="button" className="link-button" onClick={() => setShowAll(!showAll)}>
            {showAll ? 'Show only approved and planned recipes' : `Show drafts too (${hidden} more)`}
          </button>
        )}
      </section>

      <section className="panel lp-limited" aria-labelledby={`${unitId}-limited`}>
        <h3 id={`${unitId}-limited`}>Limited stocks</h3>
        <p className="small muted">
          Supply over the period. While they last the plan shares it between the grades; in the plan after they are gone these stocks are not used.
        </p>
        {limited.length === 0 ? (
          <p className="muted">No stock is limited. Mark a stock limited on Stocks, or limit one for this plan below.</p>
        ) : (
          <StockQuantities
            stocks={limited}
            quantity="Supply"
            rule="supplyKg"
            unit={unit}
            column={{ title: 'Limited', cell: (c) => (c.availability === 'limited' ? 'in the library' : 'in this plan') }}
            value={(c) => plan.supplies[c.id] ?? null}
            across={(c, kg) => overSupply(c, { supplyKg: kg })}
            onCommit={(c, kg) => linePlanActions.setSupply(c.id, kg)}
            remove={(c) => (c.availability === 'limited' ? null : { label: `Stop limiting ${c.code} in this plan`, run: () => linePlanActions.unlimitStock(c.id) })}
            disabled={disabled}
          />
        )}
        {goneSupplies.length > 0 && (
          <p className="small" role="status" data-testid="withdrawn-supplies">
            {goneSupplies
              .map((g) => {
                const saved = g.kg === null ? 'its limit in this plan is left out' : `its saved supply of ${fmt.num(g.kg / PER_UNIT[unit], unit === 't' ? 1 : 0)} ${unit} is left out`;
                const held = g.grades.length
                  ? ` The current recipe${g.grades.length > 1 ? 's' : ''} of ${g.grades.length > 1 ? `${g.grades.slice(0, -1).join(', ')} and ${g.grades.at(-1)}` : g.grades[0]} still hold${g.grades.length > 1 ? '' : 's'} it: ${g.grades.length > 1 ? 'their costs are those of recipes' : 'its cost is that of a recipe'} that cannot be made now.`
                  : '';
                return `${g.code} is withdrawn on Stocks, so neither plan uses it: ${saved}.${held}`;
              })
              .join(' ')}
          </p>
        )}
        <AddStock
          label="Limit another stock in this plan"
          button="Limit"
          stocks={limitable}
          onAdd={(id) => linePlanActions.limitStock(id)}
          disabled={disabled}
        />
      </section>

      <section className="panel lp-limits" aria-labelledby={`${unitId}-line`}>
        <h3 id={`${unitId}-line`}>Tanks and stocks kept</h3>
        <NumberField
          label="Most distinct stocks across the line"
          allowEmpty
          size={5}
          value={plan.maxStocks}
          digits={0}
          validate={(v) => {
            if (v === null) return {};
            const r = NUMBER_RULES.maxStocks;
            if (!Number.isInteger(v) || v < r.min || v > r.max) {
              return { error: `Most distinct stocks: a whole number from ${r.min} to ${r.max} (or empty for no limit)` };
            }
            return {};
          }}
          onCommit={(v) => linePlanActions.setMaxStocks(v)}
          hint={<span className="small muted"> Empty: no limit. Every stock in use counts, the additive package too.</span>}
          disabled={disabled}
        />
        <h4>Stocks that must stay in use</h4>
        {keepIds.length === 0 ? (
          <p className="small muted">None. A stock kept in use always counts toward the limit and is used at least as much as you give.</p>
        ) : (
          <StockQuantities
            stocks={keepIds.map((id) => byId.get(id)!)}
            quantity="Least use"
            rule="minUseKg"
            unit={unit}
            required
            value={(c) => plan.keep[c.id] ?? 0}
            across={(c, kg) => overSupply(c, { keepKg: kg })}
            onCommit={(c, kg) => linePlanActions.setKeep(c.id, kg ?? 0)}
            remove={(c) => ({ label: `No longer keep ${c.code} in use`, run: () => linePlanActions.setKeep(c.id, null) })}
            disabled={disabled}
          />
        )}
        <AddStock label="Keep a stock in use" button="Keep" stocks={keepable} onAdd={(id) => linePlanActions.setKeep(id, 0)} disabled={disabled} />
      </section>
    </div>
  );
}

/**
 * A table of stocks each with a quantity over the period, typed in the user's unit and saved in kg
 * (the limited stocks' supplies, the least use of stocks kept in use), and a Remove button.
 */
function StockQuantities({
  stocks,
  quantity,
  rule,
  unit,
  required = false,
  column,
  value,
  across,
  onCommit,
  remove,
  disabled,
}: {
  stocks: readonly Component[];
  /** "Supply": heads the column and names each field ("Supply of BW-190"). */
  quantity: string;
  rule: 'supplyKg' | 'minUseKg';
  unit: 'kg' | 't';
  /** An empty field is refused (else it is saved as null). */
  required?: boolean;
  /** A column between the stock and its quantity. */
  column?: { title: string; cell: (c: Component) => ReactNode };
  /** The saved quantity [kg]. */
  value: (c: Component) => number | null;
  /** A refusal across fields for the quantity being typed [kg] (least use above supply), or undefined. */
  across?: (c: Component, kg: number) => string | undefined;
  onCommit: (c: Component, kg: number | null) => void;
  /** The Remove button's accessible name and action, or null for none. */
  remove: (c: Component) => { label: string; run: () => void } | null;
  disabled: boolean;
}) {
  const fmt = useFormat();
  return (
    <table className="data">
      <thead>
        <tr>
          <th scope="col">Stock</th>
          {column && <th scope="col">{column.title}</th>}
          <th scope="col" className="num">
            {quantity} [{unit}]
          </th>
          <th scope="col">
            <span className="visually-hidden">Actions</span>
          </th>
        </tr>
      </thead>
      <tbody>
        {stocks.map((c) => {
          const label = `${quantity} of ${c.code}`;
          const v = value(c);
          const r = remove(c);
          return (
            <tr key={c.id}>
              <th scope="row">
                <span className="code">{c.code}</span> <span className="small">{c.name}</span>
                {c.availability === 'withdrawn' ? <span className="text-error small"> withdrawn</span> : null}
                {notEnteredFields(c).length ? (
                  // Left out of both plans (never planned with its placeholders) until its values are entered.
                  <span className="text-error small" data-testid="plan-values-pending">
                    {' '}
                    values not entered: not used until entered on Stocks
                  </span>
                ) : null}
              </th>
              {column && <td className="small">{column.cell(c)}</td>}
              <td className="num">
                <NumberField
                  label={label}
                  hideLabel
                  allowEmpty={!required}
                  size={9}
                  value={v === null ? null : v / PER_UNIT[unit]}
                  validate={(x) => {
                    const own = quantityVerdict(rule, unit, label, x, '', fmt.say);
                    if (own.error || x === null || !across) return own;
                    const error = across(c, x * PER_UNIT[unit]);
                    return error ? { error } : own;
                  }}
                  onCommit={(x) => onCommit(c, x === null ? null : x * PER_UNIT[unit])}
                  disabled={disabled}
                />
              </td>
              <td>
                {r && (
                  <button type="button" onClick={r.run} disabled={disabled} aria-label={r.label}>
                    Remove
                  </button>
                )}
              </td>
            </tr>
          );
        })}
      </tbody>
    </table>
  );
}

/** A stock picker with its button (limit a stock, keep a stock in use). */
function AddStock({
  label,
  button,
  stocks,
  onAdd,
  disabled,
}: {
  label: string;
  button: string;
  stocks: readonly Component[];
  onAdd: (id: string) => void;
  disabled: boolean;
}) {
  const id = useId();
  const [picked, setPicked] = useState('');
  return (
    <div className="lp-add">
      <label htmlFor={id}>{label}</label>
      <select id={id} value={picked} onChange={(e) => setPicked(e.target.value)} disabled={disabled}>
        <option value="">Choose a stock…</option>
        {stocks.map((c) => (
          <option key={c.id} value={c.id}>
            {c.code} — {c.name}
            {notEnteredFields(c).length ? ' (values not entered)' : ''}
          </option>
        ))}
      </select>
      <button
        type="button"
        disabled={disabled || !picked}
        onClick={() => {
          onAdd(picked);
          setPicked('');
        }}
      >
        {button}
      </button>
    </div>
  );
}
