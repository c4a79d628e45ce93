/** Shared pieces that show where a recipe stands: its status badge and the stock data changed since it was saved. */
import type { RecipeStatus } from '../core/formulation/model';
import { RECIPE_STATUS_LABEL } from '../core/formulation/model';
import type { StockChange, StockFieldChange } from '../core/recipes/stock-basis';
import { identityChangeWords } from '../core/recipes/stock-basis';
import { useFormat } from './format';

/** "Draft" / "Approved" / "Superseded", styled by status. */
export function StatusBadge({ status }: { status: RecipeStatus }) {
  return <span className={`status-badge status-${status}`}>{RECIPE_STATUS_LABEL[status]}</span>;
}

/** The stocks whose data differ from what a recipe was saved with, one line each (values in the user's units). */
export function StockChangeList({ changes }: { changes: readonly StockChange[] }) {
  const fmt = useFormat();
  const value = (v: number | null, unit: StockFieldChange['unit']) =>
    v === null ? '—' : unit === '°C' ? fmt.temp(v) : `${fmt.sig(v, 4)} ${unit}`;
  return (
    <ul className="stock-changes">
      {changes.map((c) => (
        <li key={c.componentId}>
          <span className="code">{c.code}</span>:{' '}
          {c.kind === 'deleted'
            ? 'deleted from the library'
            : [...identityChangeWords(c), ...c.fields.map((f) => `${f.property} ${value(f.from, f.unit)} → ${value(f.to, f.unit)}`)].join('; ')}
        </li>
      ))}
    </ul>
  );
}
