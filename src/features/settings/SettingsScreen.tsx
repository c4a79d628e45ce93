import { useId, useState } from 'react';
import { NumberField, SelectField, TextField } from '../../components/fields';
import { makeFormatter, useFormat } from '../../components/format';
import { Notice, persistentStorageText } from '../../components/notices';
import { downloadText, readFileText } from '../../components/download';
import {
  baseChangeProblem,
  requestPersistentStorage,
  resetDemo,
  settingsActions,
  useLibrary,
  usePricedLibrary,
  useSettings,
  useStorageStatus,
  DEMO_PLANT,
} from '../../state';
import { checkDate, checkNumber, checkText } from '../../state/field-rules';
import { currencyCodeProblem, normaliseCurrency, unpricedMessage, unpricedTitle, type ExchangeRate } from '../../core/currency/exchange-rates';
import { STORE_KEYS, STORE_LABEL } from '../../state/persistence';
import { applyBackup, backupFileName, makeBackupText, parseBackupText, putBackReplaced, type BackupParse, type ReplacedWork } from '../../state/backup';
import { BLEND_METHODS, BLEND_METHOD_LABEL, type BlendMethod } from '../../core/blending/blend-viscosity';
import { D341_FORMS, D341_FORM_LABEL, type D341Form } from '../../core/viscosity/viscosity-temperature';

const update = settingsActions.updateSettings;

function BackupImport() {
  const id = useId();
  const [name, setName] = useState('');
  const [parsed, setParsed] = useState<BackupParse | null>(null);
  const [done, setDone] = useState('');
  // The work the last restore replaced, while it can still be put back from here.
  const [replaced, setReplaced] = useState<{ work: ReplacedWork; name: string } | null>(null);
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
          const input = e.currentTarget;
          const f = input.files?.[0];
          setDone('');
          setReplaced(null);
          if (!f) return;
          setName(f.name);
          try {
            setParsed(parseBackupText(await readFileText(f)));
          } catch (err) {
            setParsed({ ok: false, errors: [`The file could not be read: ${(err as Error).message}`] });
          }
          // The notice names the file; the field is emptied so that the same file chosen again (after
          // Cancel, or corrected after a refusal) is read again — the browser reports no change otherwise.
          input.value = '';
        }}
      />
      {parsed && !parsed.ok ? (
        <Notice tone="error" title={`${name} cannot be imported; nothing was changed.`}>
          <ul className="backup-errors">
            {parsed.errors.map((e, i) => (
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
                  setReplaced({ work: applyBackup(parsed.backup), name });
                  setParsed(null);
                  setDone(`Restored ${name}. The library, recipes and settings it replaced can be put back below until you leave this screen.`);
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
      {done ? (
        <Notice
          tone="success"
          actions={
            replaced ? (
              <button
                type="button"
                onClick={() => {
                  putBackReplaced(replaced.work);
                  setReplaced(null);
                  setDone(`Put back the library, recipes and settings that were there before ${replaced.name} was restored.`);
                }}
              >
                Put back the work before the restore
              </button>
            ) : undefined
          }
        >
          {done}
        </Notice>
      ) : null}
    </div>
  );
}

/**
 * Base currency and exchange rates: every cost figure and solve works in the base currency; a stock
 * priced in a currency without a rate is named and left out until a rate is entered.
 */
function ExchangeRates() {
  const s = useSettings();
  const fmt = useFormat();
  const components = useLibrary((st) => st.components);
  const priced = usePricedLibrary();
  const [adding, setAdding] = useState({ currency: '', rate: '', asOf: '' });
  const [message, setMessage] = useState('');
  const base = normaliseCurrency(s.baseCurrency);
  // Currencies the library uses, with how many stocks each.
  const inUse = new Map<string, number>();
  for (const c of components) {
    const k = normaliseCurrency(c.price.currency);
    inUse.set(k, (inUse.get(k) ?? 0) + 1);
  }
  const setRates = (rates: ExchangeRate[]): string | null => update({ exchangeRates: rates });
  const add = () => {
    const currency = normaliseCurrency(adding.currency);
    const read = fmt.parseEntry(adding.rate);
    const rate = read.error === undefined ? read.value : Number.NaN;
    const who = `the rate for ${currency || '(no currency)'}`;
    const problem =
      checkText('rateCurrency', currency, who) ??
      currencyCodeProblem(currency) ??
      (currency === base ? `${currency} is the base currency; it needs no rate` : null) ??
      (s.exchangeRates.some((r) => normaliseCurrency(r.currency) === currency) ? `${currency} has a rate already; change that one` : null) ??
      (read.error !== undefined
        ? `${who}: ${read.error}`
        : rate === null
          ? `${who}: enter the rate`
          : rate <= 0
            ? `${who}: an exchange rate must be above 0.`
            : checkNumber('exchangeRate', rate, who, fmt)) ??
      checkDate('rateAsOf', adding.asOf, who);
    if (problem) {
      // Every message here begins with a capital, whichever check wrote it.
      setMessage(problem.charAt(0).toUpperCase() + problem.slice(1));
      return;
    }
    const refused = setRates([...s.exchangeRates, { currency, rate: rate!, asOf: adding.asOf }]);
    setMessage(refused ?? '');
    if (!refused) setAdding({ currency: '', rate: '', asOf: '' });
  };
  return (
    <fieldset className="wide exchange-rates">
      <legend>Currency and exchange rates</legend>
      <p className="small">
        Every cost, the solver and the explorer work in the base currency. A stock priced in another currency is restated with its rate;
        a stock whose currency has no rate is named wherever costs are shown and left out of costing and solving until you enter one.
        Costing copies of the blend sheet print the rates used with their dates.
      </p>
      <TextField
        label="Base currency (code)"
        size={6}
        value={s.baseCurrency}
        validate={(v) => ({
          error: checkText('baseCurrency', normaliseCurrency(v)) ?? currencyCodeProblem(normaliseCurrency(v)) ?? baseChangeProblem(s, { baseCurrency: v }) ?? undefined,
        })}
        onCommit={(v) => {
          setMessage(update({ baseCurrency: normaliseCurrency(v) }) ?? '');
        }}
      />
      <p className="small muted">
        The currency symbol above ({s.currencySymbol}) is printed with costs. It follows a change of the base currency it named; a symbol that
        names another currency than the base one is shown as the base code instead.
      </p>
      <table className="data rates-table">
        <caption className="visually-hidden">Exchange rates to {base}</caption>
        <thead>
          <tr>
            <th scope="col">Currency</th>
            <th scope="col" className="num">
              {base} per unit
            </th>
            <th scope="col">As of</th>
            <th scope="col">Stocks</th>
            <th scope="col">
              <span className="visually-hidden">Remove</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {s.exchangeRates.map((r, i) => (
            <tr key={normaliseCurrency(r.currency)}>
              <th scope="row">{normaliseCurrency(r.currency)}</th>
              <td className="num">
                <NumberField
                  label={`Rate ${normaliseCurrency(r.currency)} → ${base}`}
                  hideLabel
                  size={9}
                  value={r.rate}
                  validate={(v) => ({ error: checkNumber('exchangeRate', v, `the rate for ${r.currency}`) ?? undefined })}
                  onCommit={(v) => v !== null && setMessage(setRates(s.exchangeRates.map((x, j) => (j === i ? { ...x, rate: v } : x))) ?? '')}
                />
              </td>
              <td>
                <TextField
                  label={`Rate ${normaliseCurrency(r.currency)} as of (YYYY-MM-DD)`}
                  hideLabel
                  size={11}
                  maxLength={10}
                  value={r.asOf}
                  validate={(v) => ({ error: checkDate('rateAsOf', v.trim()) ?? undefined })}
                  onCommit={(v) => setMessage(setRates(s.exchangeRates.map((x, j) => (j === i ? { ...x, asOf: v.trim() } : x))) ?? '')}
                />
              </td>
              <td>{inUse.get(normaliseCurrency(r.currency)) ?? 0}</td>
              <td>
                <button type="button" onClick={() => setMessage(setRates(s.exchangeRates.filter((_, j) => j !== i)) ?? '')}>
                  Remove<span className="visually-hidden"> the rate for {r.currency}</span>
                </button>
              </td>
            </tr>
          ))}
          {s.exchangeRates.length === 0 && (
            <tr>
              <td colSpan={5} className="muted">
                No rates yet.
              </td>
            </tr>
          )}
        </tbody>
      </table>
      <form
        className="add-rate"
        aria-label="Add an exchange rate"
        onSubmit={(e) => {
          e.preventDefault();
          add();
        }}
      >
        <label className="inline-field">
          Currency
          <input size={6} value={adding.currency} onChange={(e) => setAdding({ ...adding, currency: e.target.value })} />
        </label>
        <label className="inline-field">
          {base} per unit
          <input size={9} inputMode="decimal" value={adding.rate} onChange={(e) => setAdding({ ...adding, rate: e.target.value })} />
        </label>
        <label className="inline-field">
          As of
          <input type="date" value={adding.asOf} onChange={(e) => setAdding({ ...adding, asOf: e.target.value })} />
        </label>
        <button type="submit">Add rate</button>
      </form>
      {message && (
        <p className="field-error" role="alert">
          {message}
        </p>
      )}
      {priced.unpriced.length > 0 ? (
        <Notice tone="warning" title={unpricedTitle(priced.unpriced)}>
          <p data-testid="unpriced">{unpricedMessage(priced.unpriced, base)}</p>
        </Notice>
      ) : (
        <p className="small muted">Every stock in the library is priced in {base} or has a rate.</p>
      )}
    </fieldset>
  );
}

export default function SettingsScreen() {
  const s = useSettings();
  const fmt = useFormat();
  const status = useStorageStatus();
  const [resetDone, setResetDone] = useState(false);
  const sample = makeFormatter(s);
  // A range given in °C, said in the unit of the settings ("between −76 °F and 392 °F").
  const between = (loC: number, hiC: number) => `between ${fmt.sayTemp(loC)} and ${fmt.sayTemp(hiC)}`;

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
            rule="currencySymbol"
            trimForRule
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
            kg/L; prices are restated in the base currency only with the exchange rates below.
          </p>
        </fieldset>

        <fieldset>
          <legend>Plant defaults</legend>
          <TextField
            label="Company or plant name (printed on the blend sheet)"
            size={34}
            rule="companyName"
            value={s.companyName}
            onCommit={(companyName) => update({ companyName })}
          />
          <NumberField
            label="Gearbox operating temperature"
            unit={fmt.tempUnit}
            digits={s.temperatureUnit === 'F' ? 1 : undefined}
            value={fmt.tempValue(s.operatingTempC)}
            validate={(v) => ({ error: v !== null && !(fmt.tempToC(v) >= -60 && fmt.tempToC(v) <= 200) ? between(-60, 200) : undefined })}
            onCommit={(v) => v !== null && update({ operatingTempC: fmt.tempToC(v) })}
          />
          <NumberField
            label="Cold-start temperature"
            unit={fmt.tempUnit}
            digits={s.temperatureUnit === 'F' ? 1 : undefined}
            value={fmt.tempValue(s.coldStartTempC)}
            validate={(v) => ({ error: v !== null && !(fmt.tempToC(v) >= -60 && fmt.tempToC(v) <= 60) ? between(-60, 60) : undefined })}
            onCommit={(v) => v !== null && update({ coldStartTempC: fmt.tempToC(v) })}
          />
          <NumberField
            label="Metering temperature (litres on the blend sheet)"
            unit={fmt.tempUnit}
            digits={s.temperatureUnit === 'F' ? 1 : undefined}
            value={fmt.tempValue(s.meteringTempC)}
            validate={(v) => ({ error: v !== null && !(fmt.tempToC(v) >= -20 && fmt.tempToC(v) <= 150) ? between(-20, 150) : undefined })}
            onCommit={(v) => v !== null && update({ meteringTempC: fmt.tempToC(v) })}
          />
          <NumberField
            label="Delivery temperature (cost per delivered litre)"
            unit={fmt.tempUnit}
            digits={s.temperatureUnit === 'F' ? 1 : undefined}
            value={fmt.tempValue(s.deliveryTempC)}
            validate={(v) => ({ error: v !== null && !(fmt.tempToC(v) >= -20 && fmt.tempToC(v) <= 150) ? between(-20, 150) : undefined })}
            onCommit={(v) => v !== null && update({ deliveryTempC: fmt.tempToC(v) })}
          />
          <p className="small muted">
            Litres at a temperature follow the petroleum measurement tables for lubricating oils (ASTM D1250-80 / ISO 91-1,
            Table 54D); litres without a temperature are at 15 °C.
          </p>
          <SelectField<BlendMethod>
            label="Blend viscosity method"
            value={s.blendMethod}
            options={BLEND_METHODS.map((m) => ({ value: m, label: BLEND_METHOD_LABEL[m] }))}
            onChange={(blendMethod) => update({ blendMethod })}
          />
          <p className="small muted">
            The D7152 Wright method uses each stock’s viscosity at two temperatures; ASTM D7152 calls it generally preferred to its
            ASTM Blending Method (one temperature). Refutas is a separate, mass-based rule, not part of D7152.
          </p>
          <SelectField<D341Form>
            label="Viscosity–temperature line (ASTM D341)"
            value={s.d341Form}
            options={D341_FORMS.map((f) => ({ value: f, label: D341_FORM_LABEL[f] }))}
            onChange={(d341Form) => update({ d341Form })}
          />
          <p className="small muted">
            Used for the viscosity at the operating and cold-start temperatures and for the viscosity–temperature charts. The
            full D341-20 form is the current standard; the simple form Z = ν + 0.7 of the older editions agrees with it to
            0.03 % above 2.5 mm²/s, so for gear oils the two differ only in name. The D7152 blending methods always use the
            D341-20 form.
          </p>
        </fieldset>

        <ExchangeRates />

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
            <span data-testid="persistence-setting">{persistentStorageText(status.persistent).text}</span>{' '}
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
              if (window.confirm(
                  'Replace the library and recipes with the invented demo, and the company name with the demo plant’s? ' +
                    '(Undo on the Stocks screen brings back the library, Undo on the Recipes screen the recipes; the company name is typed again here.)',
                )) {
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
