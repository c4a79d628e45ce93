import { useEffect, useId, useMemo, useRef, useState } from 'react';
import { useFormat } from '../../components/format';
import { Notice } from '../../components/notices';
import { readFileText } from '../../components/download';
import { applyLibraryImport, CSV_COLUMNS, type ImportPreview, type ImportRow } from '../../state/library-io';
import { COLLECTION_LIMITS } from '../../state/field-rules';
import { libraryRoomProblem, useLibrary, useRecipes, useSettings } from '../../state';
import type { Component } from '../../core/formulation/model';
import { predictionImpact, type RecipeImpact } from '../../core/recipes/impact';
import { ImpactTable } from './ImpactConfirm';
import { startImportPreview, type ImportHandle } from './import-client';
import { normaliseCurrency } from '../../core/currency/exchange-rates';

type RowFilter = 'all' | 'errors' | 'update' | 'add' | 'unchanged';
const SHOWN_ROWS = 500;

const emptyPreview = (message: string): ImportPreview => ({
  format: 'csv',
  fileErrors: [message],
  fileWarnings: [],
  rows: [],
  valid: false,
  adds: 0,
  updates: 0,
  unchanged: 0,
});

function resultLabel(r: ImportRow): string {
  if (r.errors.length) return 'error';
  if (r.action === 'unchanged') return 'no change';
  return r.action;
}

/**
 * Choose a CSV or JSON file; its rows are checked off the page's main thread with a progress bar and
 * Cancel; the preview shows every row's errors and, for an update, every field that would change
 * (stored → imported). Only a file without errors can be confirmed.
 */
export function ImportPanel({ onClose, onImported }: { onClose: () => void; onImported: (msg: string) => void }) {
  const fmt = useFormat();
  const fileId = useId();
  const [fileName, setFileName] = useState('');
  const [preview, setPreview] = useState<ImportPreview | null>(null);
  const [progress, setProgress] = useState<{ done: number; total: number } | null>(null);
  const [filter, setFilter] = useState<RowFilter>('all');
  const run = useRef<ImportHandle | null>(null);
  const inputRef = useRef<HTMLInputElement>(null);
  const components = useLibrary((s) => s.components);
  const { decimalSeparator, baseCurrency: baseSetting } = useSettings();
  const baseCurrency = normaliseCurrency(baseSetting) || 'EUR';

  useEffect(() => () => run.current?.cancel(), []);

  const choose = async (file: File | undefined) => {
    if (!file) return;
    run.current?.cancel();
    setFileName(file.name);
    setPreview(null);
    setFilter('all');
    setProgress({ done: 0, total: 0 });
    let text: string;
    try {
      text = await readFileText(file);
    } catch (e) {
      setProgress(null);
      setPreview(emptyPreview(`The file could not be read: ${(e as Error).message}`));
      return;
    } finally {
      // The preview names the file; the field is emptied so that the file, corrected and chosen again
      // as a refusal asks, is read again (the browser reports no change for the same file otherwise).
      if (inputRef.current) inputRef.current.value = '';
    }
    // A "could mean 1.25 or 1250" the file does not settle is written with the settings' decimal separator.
    const handle = startImportPreview(file.name, text, components, (done, total) => setProgress({ done, total }), { decimalSeparator, baseCurrency });
    run.current = handle;
    const outcome = await handle.outcome;
    if (run.current !== handle) return; // a newer file was chosen
    run.current = null;
    setProgress(null);
    if (outcome.kind === 'done') setPreview(outcome.preview);
    else if (outcome.kind === 'error') setPreview(emptyPreview(`The file could not be checked: ${outcome.message}`));
    else {
      setFileName('');
      if (inputRef.current) inputRef.current.value = '';
    }
  };

  // The saved recipes the import would move (issue 10, item 14): shown before it is confirmed.
  const recipes = useRecipes((s) => s.recipes);
  const blendMethod = useSettings().blendMethod;
  const impact = useMemo(
    (): RecipeImpact[] => (preview?.valid ? importImpact(preview, components, recipes, blendMethod) : []),
    [preview, components, recipes, blendMethod],
  );

  const leaving = impact.filter((r) => r.inBandBefore && !r.inBandAfter).length;
  const counts = useMemo(() => {
    const rows = preview?.rows ?? [];
    return { errors: rows.filter((r) => r.errors.length).length, warnings: rows.filter((r) => !r.errors.length && r.warnings.length).length };
  }, [preview]);
  const shown = useMemo(() => {
    const rows = preview?.rows ?? [];
    const keep = (r: ImportRow) =>
      filter === 'all' ? true : filter === 'errors' ? r.errors.length > 0 : !r.errors.length && r.action === filter;
    return rows.filter(keep);
  }, [preview, filter]);
  const checking = progress !== null;
  // A valid file whose additions would take the library over its one stock limit.
  const full =
    preview && preview.valid ? libraryRoomProblem(components.length, preview.adds, 'import', (n) => fmt.num(n, 0)) : null;

  return (
    <section className="panel import-panel" aria-labelledby={`${fileId}-h`}>
      <h3 id={`${fileId}-h`}>Import stocks from CSV or JSON</h3>
      <p className="small">
        Rows are matched on stock code: a known code updates that stock (recipes keep using it), a new code adds one. In a CSV
        update, a column the file does not have keeps the stored value; an empty cell clears an optional value. Nothing changes
        until you confirm a file without errors. Up to {fmt.num(COLLECTION_LIMITS.importRows, 0)} rows. CSV columns:{' '}
        <code>{CSV_COLUMNS.join(', ')}</code> (temperatures in °C, viscosities in mm²/s, density in kg/L, shear losses in %;
        kv40_lot_spread_pct is the lot-to-lot relative standard deviation of ν40 in %, blank = the category default). A new
        stock whose row names no currency is priced in the base currency ({baseCurrency}); one with no price_basis, per kg.
      </p>
      <label htmlFor={fileId} className="field-label">
        File
      </label>{' '}
      <input ref={inputRef} id={fileId} type="file" accept=".csv,.json,text/csv,application/json" onChange={(e) => void choose(e.target.files?.[0])} />
      {checking ? (
        <div className="import-progress" role="status">
          <label htmlFor={`${fileId}-progress`}>
            Checking {fileName}:{' '}
            {progress.total ? `${fmt.num(progress.done, 0)} of ${fmt.num(progress.total, 0)} rows` : 'reading…'}
          </label>{' '}
          <progress id={`${fileId}-progress`} max={progress.total || 1} value={progress.done} />{' '}
          <button type="button" onClick={() => run.current?.cancel()}>
            Cancel checking
          </button>
        </div>
      ) : null}
      {preview ? (
        <div className="import-preview">
          {preview.fileErrors.length ? (
            <Notice tone="error" title={`${fileName} cannot be imported.`}>
              <ul>
                {preview.fileErrors.map((e, i) => (
                  <li key={i}>{e}</li>
                ))}
              </ul>
            </Notice>
          ) : full ? (
            <Notice tone="error" title={`${fileName} cannot be imported.`}>
              {full}
            </Notice>
          ) : counts.errors ? (
            <Notice tone="error" title={`${counts.errors} of ${preview.rows.length} rows have errors; nothing was imported.`}>
              Correct the file and choose it again. The library is unchanged.
            </Notice>
          ) : (
            <Notice tone="success" title={`${fileName} is valid.`}>
              It will add {preview.adds} and update {preview.updates} stocks; {preview.unchanged} rows match a stored stock
              without changing it{counts.warnings ? `; ${counts.warnings} rows carry warnings (shown below)` : ''}. Each update
              lists the fields it changes, stored → imported.
            </Notice>
          )}
          {preview.fileWarnings.length ? (
            <Notice tone="warning" title="Not everything in the file is read">
              <ul>
                {preview.fileWarnings.map((w, i) => (
                  <li key={i}>{w}</li>
                ))}
              </ul>
            </Notice>
          ) : null}
          {preview.rows.length ? (
            <>
              <label className="field-label" htmlFor={`${fileId}-filter`}>
                Show
              </label>{' '}
              <select id={`${fileId}-filter`} value={filter} onChange={(e) => setFilter(e.target.value as RowFilter)}>
                <option value="all">all rows ({preview.rows.length})</option>
                <option value="errors">rows with errors ({counts.errors})</option>
                <option value="update">updates ({preview.updates})</option>
                <option value="add">additions ({preview.adds})</option>
                <option value="unchanged">no change ({preview.unchanged})</option>
              </select>
              <div className="table-scroll">
                <table className="data import-table" aria-label="Import preview">
                  <thead>
                    <tr>
                      <th scope="col">{preview.format === 'csv' ? 'Line' : 'Item'}</th>
                      <th scope="col">Code</th>
                      <th scope="col">Name</th>
                      <th scope="col">Result</th>
                      <th scope="col">Changes, errors and warnings</th>
                    </tr>
                  </thead>
                  <tbody>
                    {shown.slice(0, SHOWN_ROWS).map((r) => (
                      <tr key={r.line} className={r.errors.length ? 'row-error' : r.warnings.length ? 'row-warning' : undefined}>
                        <td className="num">{r.line}</td>
                        <td>{r.code || '—'}</td>
                        <td>{r.name}</td>
                        <td>{resultLabel(r)}</td>
                        <td>
                          {r.errors.length || r.warnings.length || r.changes.length ? (
                            <ul className="issues">
                              {r.errors.map((e, i) => (
                                <li key={`e${i}`} className="issue-error">
                                  {e}
                                </li>
                              ))}
                              {r.changes.map((c, i) => (
                                <li key={`c${i}`} className="issue-change">
                                  {c.field}: {c.from} → {c.to}
                                </li>
                              ))}
                              {r.warnings.map((w, i) => (
                                <li key={`w${i}`} className="issue-warning">
                                  {w}
                                </li>
                              ))}
                            </ul>
                          ) : r.action === 'unchanged' ? (
                            'every field as stored'
                          ) : (
                            'ok'
                          )}
                        </td>
                      </tr>
                    ))}
                  </tbody>
                </table>
                {shown.length > SHOWN_ROWS ? (
                  <p className="small">
                    Showing the first {SHOWN_ROWS} of {shown.length} rows; choose what to show above.
                  </p>
                ) : null}
              </div>
            </>
          ) : null}
        </div>
      ) : null}
      {impact.length > 0 && (
        <section className="import-impact" aria-labelledby={`${fileId}-impact`} data-testid="import-impact">
          <h4 id={`${fileId}-impact`}>
            This import moves {impact.length} saved {impact.length === 1 ? 'recipe' : 'recipes'}
            {leaving > 0 ? `; ${leaving} would leave ${leaving === 1 ? 'its' : 'their'} ISO viscosity grade` : ''}
          </h4>
          <p className="small">
            Their predictions would change as below. Approved recipes are not changed, but their blend sheets will show the new predictions
            and flag the changed stock data.
          </p>
          <ImpactTable impact={impact} />
        </section>
      )}
      <div className="button-row">
        <button
          type="button"
          className="primary"
          disabled={!preview?.valid || checking || full !== null}
          onClick={() => {
            if (preview && applyLibraryImport(preview)) {
              onImported(
                `Imported ${fileName}: ${preview.adds} added, ${preview.updates} updated${preview.unchanged ? `, ${preview.unchanged} unchanged` : ''}.`,
              );
            }
          }}
        >
          {preview?.valid
            ? `Import: add ${preview.adds}, update ${preview.updates}${impact.length ? ` (${impact.length} saved ${impact.length === 1 ? 'recipe moves' : 'recipes move'})` : ''}`
            : 'Import'}
        </button>
        <button type="button" onClick={onClose}>
          Cancel
        </button>
      </div>
    </section>
  );
}

/**
 * The saved recipes whose predictions an import would move: the library after the import (updates
 * matched by code, as the import stores them) against the library now.
 */
function importImpact(preview: ImportPreview, before: readonly Component[], recipes: Parameters<typeof predictionImpact>[0], method: Parameters<typeof predictionImpact>[4]): RecipeImpact[] {
  const updates = new Map<string, Component>();
  for (const r of preview.rows) if (r.action === 'update' && r.component) updates.set(r.component.code.trim().toLowerCase(), r.component);
  if (updates.size === 0) return [];
  const changed: string[] = [];
  const after = before.map((c) => {
    const k = c.code.trim().toLowerCase();
    const u = updates.get(k);
    if (!u) return c;
    updates.delete(k); // the first stock with the code is the one updated (as the import stores it)
    changed.push(c.id);
    return { ...u, id: c.id };
  });
  return predictionImpact(recipes, before, after, changed, method);
}
