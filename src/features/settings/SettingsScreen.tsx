import { useId, useState } from 'react';
import { NumberField, SelectField, TextField } from '../../components/fields';
import { makeFormatter, useFormat } from '../../components/format';
import { Notice } from '../../components/notices';
import { downloadText, readFileText } from '../../components/download';
import { requestPersistentStorage, resetDemo, settingsActions, useSettings, useStorageStatus, DEMO_PLANT } from '../../state';
import { STORE_KEYS, STORE_LABEL } from '../../state/persistence';
import { applyBackup, backupFileName, makeBackupText, parseBackupText, type BackupParse } from '../../state/backup';

const update = settingsActions.updateSettings;

function BackupImport() {
  const id = useId();
  const [name, setName] = useState('');
  const [parsed, setParsed] = useState<BackupParse | null>(null);
  const [done, setDone] = useState('');
  return (
    <div className="backup-import">
      <label htmlFor={id} className="field-label">
        Import a backup (replaces the library, recipes and settings)
      </label>{' '}
      <input
        id={id}
        type="file"
        accept=".json,application/json"
        onChange={async (e) => {
          const f = e.target.files?.[0];
          setDone('');
          if (!f) return;
          setName(f.name);
          try {
            setParsed(parseBackupText(await readFileText(f)));
          } catch (err) {
            setParsed({ ok: false, errors: [`The file could not be read: ${(err as Error).message}`] });
          }
        }}
      />
      {parsed && !parsed.ok ? (
        <Notice tone="error" title={`${name} cannot be imported; nothing was changed.`}>
          <ul>
            {parsed.errors.slice(0, 20).map((e, i) => (
              <li key={i}>{e}</li>
            ))}
          </ul>
        </Notice>
      ) : null}
      {parsed?.ok ? (
        <Notice
          tone="warning"
          title={`${name} is a valid backup: ${parsed.summary}.`}
          actions={
            <>
              <button
                type="button"
                className="primary"
                onClick={() => {
                  applyBackup(parsed.backup);
                  setParsed(null);
                  setDone(`Restored ${name}. Undo on the Stocks screen brings back the previous library if needed.`);
                }}
              >
                Replace everything with this backup
              </button>
              <button type="button" onClick={() => setParsed(null)}>
                Cancel
              </button>
            </>
          }
        >
          Importing it replaces the current library, recipes and settings. Export a backup of the current work first if you may want it
          back.
          {parsed.warnings.length ? <> {parsed.warnings.join(' ')}</> : null}
        </Notice>
      ) : null}
      {done ? <Notice tone="success">{done}</Notice> : null}
    </div>
  );
}

export default function SettingsScreen() {
  const s = useSettings();
  const fmt = useFormat();
  const status = useStorageStatus();
  const [resetDone, setResetDone] = useState(false);
  const sample = makeFormatter(s);

  return (
    <section className="settings-screen" aria-labelledby="settings-h">
      <h2 id="settings-h">Settings</h2>

      <div className="settings-grid">
        <fieldset>
          <legend>Units and number format</legend>
          <SelectField<'C' | 'F'>
            label="Temperatures in"
            value={s.temperatureUnit}
            options={[
              { value: 'C', label: 'degrees Celsius (°C)' },
              { value: 'F', label: 'degrees Fahrenheit (°F)' },
            ]}
            onChange={(temperatureUnit) => update({ temperatureUnit })}
          />
          <TextField
            label="Currency symbol"
            size={4}
            maxLength={8}
            value={s.currencySymbol}
            validate={(v) => ({ error: v.trim() ? undefined : 'enter a symbol or code, e.g. € or EUR' })}
            onCommit={(currencySymbol) => update({ currencySymbol: currencySymbol.trim() })}
          />
          <SelectField<'.' | ','>
            label="Decimal separator"
            value={s.decimalSeparator}
            options={[
              { value: '.', label: 'point (1 234.5)' },
              { value: ',', label: 'comma (1.234,5)' },
            ]}
            onChange={(decimalSeparator) => update({ decimalSeparator })}
          />
          <span className="field">
            <label className="check">
              <input type="checkbox" checked={s.thousandsGrouping} onChange={(e) => update({ thousandsGrouping: e.target.checked })} /> Group
              thousands
            </label>
          </span>
          <p className="small muted">
            Example: {sample.num(12345.678, 2)} mm²/s · {sample.money(1234.5)} · {sample.temp(40)}. Stored values stay in °C, mm²/s and
            kg/L; prices are never converted between currencies.
          </p>
        </fieldset>

        <fieldset>
          <legend>Plant defaults</legend>
          <TextField
            label="Company or plant name (printed on the blend sheet)"
            size={34}
            maxLength={200}
            value={s.companyName}
            onCommit={(companyName) => update({ companyName })}
          />
          <NumberField
            label="Gearbox operating temperature"
            unit={fmt.tempUnit}
            digits={s.temperatureUnit === 'F' ? 1 : undefined}
            value={fmt.tempValue(s.operatingTempC)}
            validate={(v) => ({ error: v !== null && (fmt.tempToC(v) < -60 || fmt.tempToC(v) > 200) ? 'between −60 and 200 °C' : undefined })}
            onCommit={(v) => v !== null && update({ operatingTempC: fmt.tempToC(v) })}
          />
          <NumberField
            label="Cold-start temperature"
            unit={fmt.tempUnit}
            digits={s.temperatureUnit === 'F' ? 1 : undefined}
            value={fmt.tempValue(s.coldStartTempC)}
            validate={(v) => ({ error: v !== null && (fmt.tempToC(v) < -60 || fmt.tempToC(v) > 60) ? 'between −60 and 60 °C' : undefined })}
            onCommit={(v) => v !== null && update({ coldStartTempC: fmt.tempToC(v) })}
          />
          <SelectField<'refutas' | 'astm-d7152'>
            label="Blend viscosity method"
            value={s.blendMethod}
            options={[
              { value: 'refutas', label: 'Refutas (mass fractions)' },
              { value: 'astm-d7152', label: 'ASTM D7152 log-log (volume fractions)' },
            ]}
            onChange={(blendMethod) => update({ blendMethod })}
          />
        </fieldset>

        <fieldset className="wide">
          <legend>Saved work</legend>
          <p className="small">
            The library, recipes and settings are saved in this browser automatically (IndexedDB).{' '}
            {STORE_KEYS.map((k) => {
              const st = status.stores[k];
              return (
                <span key={k} className="save-state">
                  {STORE_LABEL[k]}: {st.problem ? 'not loaded (see the message above)' : st.saveError ? 'last save failed' : st.lastSavedAt ? `saved ${st.lastSavedAt.slice(11, 19)}` : 'loaded'}.{' '}
                </span>
              );
            })}
          </p>
          <p className="small">
            Persistent storage:{' '}
            {status.persistent === 'granted'
              ? 'granted — the browser will not clear saved work to free space.'
              : status.persistent === 'refused'
                ? 'refused — the browser may clear saved work when space runs low. Export backups regularly.'
                : status.persistent === 'unsupported'
                  ? 'not offered by this browser. Export backups regularly.'
                  : 'not asked yet.'}{' '}
            {status.persistent !== 'granted' ? (
              <button type="button" onClick={() => void requestPersistentStorage()}>
                Ask the browser again
              </button>
            ) : null}
          </p>
          <p className="small">
            Last backup: {s.lastBackupAt ? s.lastBackupAt.slice(0, 16).replace('T', ' ') : 'none yet'}.{' '}
            <button type="button" className="primary" onClick={() => downloadText(backupFileName(), makeBackupText(), 'application/json')}>
              Export everything (backup file)
            </button>
          </p>
          <BackupImport />
        </fieldset>

        <fieldset className="wide">
          <legend>Demo scenario</legend>
          <p className="small">
            The demo is <strong>invented</strong>: {DEMO_PLANT} is an invented plant, and its stocks, codes, prices and recipes are invented
            examples with generic typical properties — not real products.
          </p>
          <button
            type="button"
            onClick={() => {
              if (window.confirm('Replace the library and recipes with the invented demo? (Undo on the Stocks screen brings them back.)')) {
                resetDemo();
                setResetDone(true);
              }
            }}
          >
            Reset the demo library and recipes
          </button>
          {resetDone ? <Notice tone="success">The invented demo library and recipes are restored.</Notice> : null}
        </fieldset>
      </div>
    </section>
  );
}
