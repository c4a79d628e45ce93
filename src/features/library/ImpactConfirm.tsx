// Before a change of a stock's viscosities, density or calibration is stored: the saved recipes it
// moves, each ν40 old → new and whether it leaves its grade band, and a choice to store or keep.
import { useEffect, useRef } from 'react';
import type { RecipeImpact } from '../../core/recipes/impact';
import { useFormat } from '../../components/format';
import { StatusBadge } from '../../components/recipe-status';

/** What a stock edit did: stored, waiting for the user's confirmation, or refused (the message). */
export type StockUpdateOutcome =
  | { kind: 'stored' }
  /** Waiting for the user's answer in the window; `settled` resolves true when stored, false when cancelled. */
  | { kind: 'confirm'; settled: Promise<boolean> }
  | { kind: 'refused'; message: string };

export interface PendingStockChange {
  /** The stock's code and what changes, in words ("calibration", "ν40", "density"). */
  code: string;
  what: string;
  impact: RecipeImpact[];
  apply: () => void;
  /** Told the answer (true = stored) when the window closes. */
  settle: (applied: boolean) => void;
}

export function ImpactConfirm({ pending, onDone }: { pending: PendingStockChange; onDone: (applied: boolean) => void }) {
  // Focus the dialog itself, not a button: the Enter that committed the field must not answer it.
  const box = useRef<HTMLDivElement>(null);
  useEffect(() => box.current?.focus(), []);
  const leaving = pending.impact.filter((r) => r.inBandBefore && !r.inBandAfter).length;
  return (
    <div className="impact-backdrop">
      <div
        ref={box}
        tabIndex={-1}
        className="impact-dialog"
        role="alertdialog"
        aria-modal="true"
        aria-labelledby="impact-h"
        aria-describedby="impact-d"
        onKeyDown={(e) => {
          if (e.key === 'Escape') onDone(false);
        }}
      >
        <h3 id="impact-h">
          Changing the {pending.what} of {pending.code} moves {pending.impact.length} saved {pending.impact.length === 1 ? 'recipe' : 'recipes'}
        </h3>
        <p id="impact-d">
          Their predictions would change as below{leaving ? `; ${leaving} would leave ${leaving === 1 ? 'its' : 'their'} ISO viscosity grade` : ''}.
          Approved recipes are not changed, but their blend sheets will show the new predictions and flag the changed stock data.
        </p>
        <ImpactTable impact={pending.impact} />
        <div className="button-row">
          <button
            type="button"
            onClick={() => {
              pending.apply();
              onDone(true);
            }}
          >
            Store the change ({pending.impact.length} {pending.impact.length === 1 ? 'recipe moves' : 'recipes move'})
          </button>
          <button type="button" className="primary" onClick={() => onDone(false)}>
            Cancel — keep the stored data
          </button>
        </div>
      </div>
    </div>
  );
}

/** The saved recipes a change of stock data moves: each ν40 now → after, the change and the grade band. */
export function ImpactTable({ impact }: { impact: readonly RecipeImpact[] }) {
  const fmt = useFormat();
  const kv = (p: RecipeImpact['before']) => ('error' in p ? 'cannot be predicted' : `${fmt.num(p.kv40, 1)}`);
  return (
    <div className="table-scroll">
      <table className="data impact-table" data-testid="impact-table">
        <thead>
          <tr>
            <th scope="col">Recipe</th>
            <th scope="col">Status</th>
            <th scope="col" className="num">ν40 now, mm²/s</th>
            <th scope="col" className="num">ν40 after</th>
            <th scope="col" className="num">Change</th>
            <th scope="col">Grade band</th>
          </tr>
        </thead>
        <tbody>
          {impact.map((r) => {
            const pct = 'error' in r.before || 'error' in r.after ? null : (100 * (r.after.kv40 - r.before.kv40)) / r.before.kv40;
            return (
              <tr key={r.recipeId} className={r.inBandBefore && !r.inBandAfter ? 'leaves-band' : undefined}>
                <th scope="row">
                  {r.name} <span className="muted">rev. {r.revision}</span>
                </th>
                <td>
                  <StatusBadge status={r.status} />
                </td>
                <td className="num">{kv(r.before)}</td>
                <td className="num">{kv(r.after)}</td>
                <td className="num">{pct === null ? '—' : `${pct > 0 ? '+' : pct < 0 ? '−' : ''}${fmt.num(Math.abs(pct), 1)} %`}</td>
                <td>
                  {r.band === null
                    ? '—'
                    : `VG ${r.grade} (${fmt.num(r.band.min, 1)}–${fmt.num(r.band.max, 1)}): ${
                        r.inBandAfter ? (r.inBandBefore ? 'stays inside' : 'comes inside') : r.inBandBefore ? 'LEAVES the band' : 'outside, as before'
                      }`}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
