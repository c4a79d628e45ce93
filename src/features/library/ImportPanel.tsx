import { useId, useRef, useState } from 'react';
import { Notice } from '../../components/notices';
import { readFileText } from '../../components/download';
import { applyLibraryImport, CSV_COLUMNS, previewLibraryImport, type ImportPreview } from '../../state/library-io';
import { useLibrary } from '../../state';

/** Choose a CSV or JSON file, see a preview with per-row errors, confirm only a valid set. */
export function ImportPanel({ onClose, onImported }: { onClose: () => void; onImported: (msg: string) => void }) {
  const fileId = useId();
  const [fileName, setFileName] = useState('');
  const [preview, setPreview] = useState<ImportPreview | null>(null);
  const [reading, setReading] = useState(false);
  const inputRef = useRef<HTMLInputElement>(null);
  const components = useLibrary((s) => s.components);

  const choose = async (file: File | undefined) => {
    if (!file) return;
    setReading(true);
    setFileName(file.name);
    try {
      const text = await readFileText(file);
      setPreview(previewLibraryImport(file.name, text, components));
    } catch (e) {
      setPreview({ format: 'csv', fileErrors: [`The file could not be read: ${(e as Error).message}`], rows: [], valid: false, adds: 0, updates: 0 });
    } finally {
      setReading(false);
    }
  };
  const errorRows = preview?.rows.filter((r) => r.errors.length) ?? [];
  const warnRows = preview?.rows.filter((r) => !r.errors.length && r.warnings.length) ?? [];

  return (
    <section className="panel import-panel" aria-labelledby={`${fileId}-h`}>
      <h3 id={`${fileId}-h`}>Import stocks from CSV or JSON</h3>
      <p className="small">
        Rows are matched on stock code: a known code updates that stock (recipes keep using it), a new code adds one.
        Nothing changes until you confirm a file without errors. CSV columns: <code>{CSV_COLUMNS.join(', ')}</code> (temperatures in
        °C, viscosities in mm²/s, density in kg/L).
      </p>
      <label htmlFor={fileId} className="field-label">
        File
      </label>{' '}
      <input ref={inputRef} id={fileId} type="file" accept=".csv,.json,text/csv,application/json" onChange={(e) => void choose(e.target.files?.[0])} />
      {reading ? <p role="status">Reading {fileName}…</p> : null}
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
          ) : errorRows.length ? (
            <Notice tone="error" title={`${errorRows.length} of ${preview.rows.length} rows have errors; nothing was imported.`}>
              Correct the file and choose it again. The library is unchanged.
            </Notice>
          ) : (
            <Notice tone="success" title={`${fileName} is valid.`}>
              It will add {preview.adds} and update {preview.updates} stocks{warnRows.length ? `; ${warnRows.length} rows carry warnings (shown below)` : ''}.
            </Notice>
          )}
          {preview.rows.length ? (
            <div className="table-scroll">
              <table className="data import-table" aria-label="Import preview">
                <thead>
                  <tr>
                    <th scope="col">{preview.format === 'csv' ? 'Line' : 'Item'}</th>
                    <th scope="col">Code</th>
                    <th scope="col">Name</th>
                    <th scope="col">Result</th>
                    <th scope="col">Errors and warnings</th>
                  </tr>
                </thead>
                <tbody>
                  {preview.rows.slice(0, 500).map((r) => (
                    <tr key={r.line} className={r.errors.length ? 'row-error' : r.warnings.length ? 'row-warning' : undefined}>
                      <td className="num">{r.line}</td>
                      <td>{r.code || '—'}</td>
                      <td>{r.name}</td>
                      <td>{r.errors.length ? 'error' : r.action === 'add' ? 'add' : 'update'}</td>
                      <td>
                        {r.errors.length || r.warnings.length ? (
                          <ul className="issues">
                            {r.errors.map((e, i) => (
                              <li key={`e${i}`} className="issue-error">
                                {e}
                              </li>
                            ))}
                            {r.warnings.map((w, i) => (
                              <li key={`w${i}`} className="issue-warning">
                                {w}
                              </li>
                            ))}
                          </ul>
                        ) : (
                          'ok'
                        )}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
              {preview.rows.length > 500 ? <p className="small">Showing the first 500 of {preview.rows.length} rows.</p> : null}
            </div>
          ) : null}
        </div>
      ) : null}
      <div className="button-row">
        <button
          type="button"
          className="primary"
          disabled={!preview?.valid}
          onClick={() => {
            if (preview && applyLibraryImport(preview)) {
              onImported(`Imported ${fileName}: ${preview.adds} added, ${preview.updates} updated.`);
            }
          }}
        >
          {preview?.valid ? `Import: add ${preview.adds}, update ${preview.updates}` : 'Import'}
        </button>
        <button type="button" onClick={onClose}>
          Cancel
        </button>
      </div>
    </section>
  );
}
