// The blend sheet's QC loop on screen (never printed): the aim, the lots in the tanks and the heel in
// the vessel (the sheet then charges the adjusted recipe), and the QC result of a batch with its
// correction. Entries are saved per recipe through `onChange`; results are derived in qc.ts.
import { useId } from 'react';
import type { Component, Recipe } from '../../core/formulation/model';
import type { RecipeInBand } from '../../core/qc/recipe-spread';
import { blendingViscosities } from '../../core/formulation/blend-properties';
import { entryFieldsInWords, notEnteredFields } from '../../core/formulation/entered-values';
import { NumberField, TextField, ruleVerdict, type Verdict } from '../../components/fields';
import { probabilityText, useFormat } from '../../components/format';
import type { QcInputs } from '../../state';
import type { NumberRuleKey } from '../../state/field-rules';
import { RELEASE_HOLD_LABEL, type HoldReason } from '../../core/release/release-hold';
import { CORRECTION_EDGE_MARGIN_PCT } from '../../core/qc/correction';
import { DEFAULT_CORRECTION_BAND_PCT, HEEL_DEFAULT_DENSITY, aimOf, hasAdjustment, pairProblem, type Adjusted, type Correction } from './qc';

export interface QcPanelProps {
  recipe: Recipe;
  components: readonly Component[];
  /** Other recipes (a heel may be a previous batch of one of them), with their predicted ν40/ν100/density. */
  heelSources: readonly { recipe: Recipe; kv40: number; kv100: number; density15: number; additiveFraction: number }[];
  qc: QcInputs;
  /** Saves a change; returns null or why it was refused (the stored value is kept). */
  onChange: (patch: Partial<QcInputs>) => string | null;
  adjusted: Adjusted | null;
  correction: Correction | null;
  /** Probabilities of the recipe itself in the release band and the ISO band. */
  inBand: RecipeInBand | null;
  releaseBand: { min: number; max: number } | null;
  /** The batch size [kg], heel included (a heel must be less), or null when none is entered. */
  batchKg: number | null;
  onPrintCorrection: () => void;
  /** Why the correction sheet is not for release (printed on it as well); empty → no hold. */
  correctionHold: readonly HoldReason[];
  fmt: (x: number, d: number) => string;
}

/** A number field checked with a stored field's rule (blank allowed). */
function RuleField(props: {
  label: string;
  unit: string;
  rule: NumberRuleKey;
  value: number | null;
  onCommit: (v: number | null) => void;
  /** The value is entered in %, stored as a fraction. */
  percent?: boolean;
  hint?: string;
  size?: number;
  /** Label read by assistive technology only (a table cell under a column heading). */
  hideLabel?: boolean;
  /** A further check of a value the rule allows (e.g. ν100 below the ν40 beside it): why it is refused, or null. */
  also?: (v: number) => string | null;
}) {
  const words = useFormat();
  const scale = props.percent ? 100 : 1;
  const validate = (v: number | null): Verdict => {
    const ruled = ruleVerdict(props.rule, v, words, (x) => x / scale);
    if (ruled.error || v === null) return ruled;
    const also = props.also?.(v / scale) ?? null;
    return also ? { error: also } : {};
  };
  return (
    <NumberField
      label={props.label}
      unit={props.unit}
      size={props.size ?? 7}
      hideLabel={props.hideLabel}
      allowEmpty
      value={props.value === null ? null : props.value * scale}
      validate={validate}
      hint={props.hint ? <span className="field-hint"> {props.hint}</span> : undefined}
      onCommit={(v) => props.onCommit(v === null ? null : v / scale)}
    />
  );
}

/** A measured ν40 and ν100 side by side, each refused where typed unless ν100 is below the ν40 beside it. */
function PairFields(props: {
  who: string;
  labels: readonly [string, string];
  kv40: number | null;
  kv100: number | null;
  kv100Hint?: string;
  onCommit: (patch: { kv40?: number | null; kv100?: number | null }) => void;
}) {
  const words = useFormat();
  const { who, kv40, kv100 } = props;
  return (
    <>
      <RuleField
        label={props.labels[0]}
        unit="mm²/s"
        rule="kv40"
        value={kv40}
        also={(v) => (kv100 === null ? null : pairProblem(who, v, kv100, words))}
        onCommit={(v) => props.onCommit({ kv40: v })}
      />
      <RuleField
        label={props.labels[1]}
        unit="mm²/s"
        rule="kv100"
        value={kv100}
        also={(v) => (kv40 === null ? null : pairProblem(who, kv40, v, words))}
        hint={props.kv100Hint}
        onCommit={(v) => props.onCommit({ kv100: v })}
      />
    </>
  );
}

export function QcPanel(props: QcPanelProps) {
  const { recipe, components, qc, onChange, fmt } = props;
  const words = useFormat();
  const id = useId();
  const byId = new Map(components.map((c) => [c.id, c]));
  const lines = recipe.lines.filter((l) => l.massFraction > 0);
  /** The grade mid-point: the aim when none is typed. */
  const midPoint = aimOf(recipe, { ...qc, aimKv40: null });
  const setLot = (cid: string, field: 'kv40' | 'kv100' | 'density15', v: number | null) =>
    (onChange({ lots: { ...qc.lots, [cid]: { ...{ kv40: null, kv100: null, density15: null }, ...qc.lots[cid], [field]: v } } }));
  const setHeel = (patch: Partial<QcInputs['heel']>) => (onChange({ heel: { ...qc.heel, ...patch } }));
  const setCorr = (patch: Partial<QcInputs['correction']>) => (onChange({ correction: { ...qc.correction, ...patch } }));
  const ib = props.inBand;
  const corr = props.correction;
  const addable = components.filter(
    (c) => c.availability !== 'withdrawn' && !lines.some((l) => l.componentId === c.id) && !qc.correction.stockIds.includes(c.id),
  );
  const corrIds = [...lines.map((l) => l.componentId), ...qc.correction.stockIds];
  const pctText = (p: number) => probabilityText(p, fmt);
  /** A lot's ν40/ν100 against each other, the library's value standing in for one not measured. */
  const lotPair = (code: string, kv40: number | null, kv100: number | null, library: number | undefined, typed: 'kv40' | 'kv100') => {
    const a = typed === 'kv40' ? kv40 : (kv40 ?? library);
    const b = typed === 'kv100' ? kv100 : (kv100 ?? library);
    if (a == null || b == null) return null;
    const src = (k: 'kv40' | 'kv100', measured: number | null) => (k === typed || measured !== null ? 'lot' : 'library');
    return pairProblem(code, a, b, words, { kv40: src('kv40', kv40), kv100: src('kv100', kv100) });
  };

  return (
    <section className="bs-qc-panel bs-no-print" aria-labelledby={`${id}-h`} data-testid="qc-panel">
      <h3 id={`${id}-h`}>QC loop: lots, heel and batch correction</h3>
      {ib && props.releaseBand && (
        <p className="bs-hint" data-testid="sheet-in-band">
          Lot-to-lot spread (model, an estimate): {pctText(ib.plant.probability)} of batches of this recipe land in the release band{' '}
          {fmt(props.releaseBand.min, 1)}–{fmt(props.releaseBand.max, 1)} mm²/s, {pctText(ib.iso.probability)} in the ISO band.
        </p>
      )}

      <details className="bs-qc-block" open={hasAdjustment(qc) || undefined}>
        <summary>Lots in the tanks, heel in the vessel and aim — charge the adjusted recipe</summary>
        <p className="bs-hint">
          Blank = the library’s value. With any entry, the sheet charges the recipe re-solved for these lots to land at the aim with the least
          change from the saved shares, and prints the lot values and both sets of shares.
        </p>
        <RuleField
          label="Aim ν40 of the batch"
          unit="mm²/s"
          rule="targetKv40"
          value={qc.aimKv40}
          hint={`blank = grade mid-point ${fmt(midPoint, 1)}`}
          onCommit={(v) => onChange({ aimKv40: v })}
        />
        <table className="bs-qc-table">
          <caption>Measured lot values</caption>
          <thead>
            <tr>
              <th scope="col">Stock</th>
              <th scope="col">ν40 [mm²/s]</th>
              <th scope="col">ν100 [mm²/s]</th>
              <th scope="col">Density 15 °C [kg/L]</th>
            </tr>
          </thead>
          <tbody>
            {lines.map((l) => {
              const c = byId.get(l.componentId);
              if (!c) return null;
              // A value not yet entered is not a library value: no hint from its placeholder.
              const pending = notEnteredFields(c);
              const kvs = safeKv(c);
              const ownKv40 = pending.includes('kv40') ? null : kvs;
              const ownKv100 = pending.includes('kv100') ? null : kvs;
              const lot = qc.lots[c.id];
              return (
                <tr key={c.id}>
                  <th scope="row">{c.code}</th>
                  <td>
                    <RuleField
                      label={`Lot ν40 of ${c.code}`}
                      hideLabel
                      unit="mm²/s"
                      rule="kv40"
                      value={lot?.kv40 ?? null}
                      hint={ownKv40 ? `library ${fmt(ownKv40.kv40, 1)}` : pending.includes('kv40') ? 'library: not entered' : undefined}
                      also={(v) => lotPair(c.code, v, lot?.kv100 ?? null, ownKv100?.kv100, 'kv40')}
                      onCommit={(v) => setLot(c.id, 'kv40', v)}
                    />
                  </td>
                  <td>
                    <RuleField
                      label={`Lot ν100 of ${c.code}`}
                      hideLabel
                      unit="mm²/s"
                      rule="kv100"
                      value={lot?.kv100 ?? null}
                      hint={ownKv100 ? `library ${fmt(ownKv100.kv100, 2)}` : pending.includes('kv100') ? 'library: not entered' : undefined}
                      also={(v) => lotPair(c.code, lot?.kv40 ?? null, v, ownKv40?.kv40, 'kv100')}
                      onCommit={(v) => setLot(c.id, 'kv100', v)}
                    />
                  </td>
                  <td>
                    <RuleField label={`Lot density of ${c.code}`} hideLabel unit="kg/L" rule="density15" value={lot?.density15 ?? null} hint={pending.includes('density15') ? 'library: not entered' : `library ${fmt(c.density15, 4)}`} onCommit={(v) => setLot(c.id, 'density15', v)} />
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
        <fieldset className="bs-qc-heel">
          <legend>Heel already in the vessel</legend>
          <RuleField
            label="Heel mass"
            unit="kg"
            rule="massKg"
            value={qc.heel.massKg}
            hint="blank or 0 = empty vessel"
            also={(v) => heelOverBatch(v, props.batchKg, words)}
            onCommit={(v) => setHeel({ massKg: v })}
          />
          <label className="field">
            <span className="field-label">Heel is a previous batch of</span>{' '}
            <select
              value=""
              onChange={(e) => {
                const src = props.heelSources.find((s) => s.recipe.id === e.target.value);
                if (src) {
                  setHeel({
                    kv40: round(src.kv40, 2),
                    kv100: round(src.kv100, 3),
                    density15: round(src.density15, 4),
                    additiveFraction: round(src.additiveFraction, 5),
                    source: `previous batch of ${src.recipe.name}`.slice(0, 200),
                  });
                }
              }}
            >
              <option value="">— fill in from a recipe’s prediction —</option>
              {props.heelSources.map((s) => (
                <option key={s.recipe.id} value={s.recipe.id}>
                  {s.recipe.name} (rev. {s.recipe.revision})
                </option>
              ))}
            </select>
          </label>
          <PairFields who="Heel" labels={['Heel ν40', 'Heel ν100']} kv40={qc.heel.kv40} kv100={qc.heel.kv100} onCommit={(patch) => setHeel(patch)} />
          <RuleField label="Heel density" unit="kg/L" rule="density15" value={qc.heel.density15} hint={`blank = ${fmt(HEEL_DEFAULT_DENSITY, 2)}`} onCommit={(v) => setHeel({ density15: v })} />
          <RuleField
            label="Heel additive content"
            unit="mass %"
            rule="treatRate"
            percent
            value={qc.heel.additiveFraction}
            hint="blank = this recipe’s treat rate"
            onCommit={(v) => setHeel({ additiveFraction: v })}
          />
          <TextField
            label="What the heel is"
            rule="heelSource"
            size={40}
            value={qc.heel.source}
            placeholder="e.g. previous batch, lot 2291; measured"
            onCommit={(source) => setHeel({ source })}
          />
        </fieldset>
        {props.adjusted && 'error' in props.adjusted && (
          <p className="bs-error" role="alert">
            {props.adjusted.error}
          </p>
        )}
        {props.adjusted && 'result' in props.adjusted && props.adjusted.result.status === 'infeasible' && (
          <p className="bs-error" role="alert" data-testid="adjust-reason">
            {props.adjusted.result.reason} The sheet keeps the saved shares.
          </p>
        )}
        {props.adjusted && 'result' in props.adjusted && props.adjusted.result.status === 'optimal' && (
          <p className="bs-hint" role="status" data-testid="adjust-summary">
            Adjusted recipe: batch ν40 {fmt(props.adjusted.result.batch.kv40, 1)} mm²/s at the aim, ν100 {fmt(props.adjusted.result.batch.kv100, 2)} mm²/s
            {props.adjusted.result.batch.vi === null ? '' : `, VI ${fmt(props.adjusted.result.batch.vi, 1)}`}; shares moved by{' '}
            {fmt(props.adjusted.result.changePct, 2)} points from the saved recipe. The sheet below charges it.
          </p>
        )}
      </details>

      <details className="bs-qc-block" open={qc.correction.kv40 !== null || undefined}>
        <summary>QC result and batch correction</summary>
        <p className="bs-hint">
          Enter the laboratory’s result for the batch in the vessel (ASTM D445). The correction is worked out with the stocks on hand (blank kg = no
          limit), lands within ±{fmt(qc.correction.bandPct ?? DEFAULT_CORRECTION_BAND_PCT, 1)} % of the aim and at least{' '}
          {fmt(CORRECTION_EDGE_MARGIN_PCT, 0)} % of ν40 inside each release limit (common practice: never on the limit itself), and tops the
          additive package up in proportion.
        </p>
        <div className="bs-qc-row">
          <PairFields
            who="The batch"
            labels={['Measured ν40 of the batch', 'Measured ν100 of the batch']}
            kv40={qc.correction.kv40}
            kv100={qc.correction.kv100}
            kv100Hint="blank = estimated at the recipe’s predicted VI"
            onCommit={(patch) => setCorr(patch)}
          />
          <RuleField label="Mass in the vessel" unit="kg" rule="massKg" value={qc.correction.massKg} hint="blank = the batch size" onCommit={(v) => setCorr({ massKg: v })} />
          <RuleField label="Vessel holds at most" unit="kg" rule="massKg" value={qc.correction.vesselLimitKg} hint="blank = no limit" onCommit={(v) => setCorr({ vesselLimitKg: v })} />
          <RuleField
            label="Correct to within ± of the aim"
            unit="%"
            rule="tolerancePct"
            value={qc.correction.bandPct}
            hint={`blank = ${DEFAULT_CORRECTION_BAND_PCT} % (common practice, no source)`}
            onCommit={(v) => setCorr({ bandPct: v })}
          />
        </div>
        <fieldset className="bs-inline">
          <legend>Add</legend>
          <label>
            <input type="radio" name={`${id}-obj`} checked={qc.correction.objective === 'cost'} onChange={() => setCorr({ objective: 'cost' })} /> at least cost
          </label>
          <label>
            <input type="radio" name={`${id}-obj`} checked={qc.correction.objective === 'mass'} onChange={() => setCorr({ objective: 'mass' })} /> the least mass
          </label>
        </fieldset>
        <table className="bs-qc-table">
          <caption>Stocks on hand for the correction</caption>
          <thead>
            <tr>
              <th scope="col">Stock</th>
              <th scope="col">On hand [kg]</th>
              <th scope="col">
                <span className="visually-hidden">Remove</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {corrIds.map((cid) => {
              const c = byId.get(cid);
              if (!c) return null;
              const extra = qc.correction.stockIds.includes(cid);
              return (
                <tr key={cid}>
                  <th scope="row">
                    {c.code} <span className="muted">{c.name}</span>
                  </th>
                  <td>
                    <RuleField
                      label={`kg of ${c.code} on hand`} hideLabel
                      unit="kg"
                      rule="massKg"
                      value={qc.correction.onHandKg[cid] ?? null}
                      onCommit={(v) => setCorr({ onHandKg: { ...qc.correction.onHandKg, [cid]: v } })}
                    />
                  </td>
                  <td>
                    {extra && (
                      <button type="button" className="link" onClick={() => setCorr({ stockIds: qc.correction.stockIds.filter((x) => x !== cid) })}>
                        remove<span className="visually-hidden"> {c.code}</span>
                      </button>
                    )}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
        {addable.length > 0 && (
          <label className="field">
            <span className="field-label">Also allow</span>{' '}
            <select value="" onChange={(e) => e.target.value && setCorr({ stockIds: [...qc.correction.stockIds, e.target.value] })}>
              <option value="">— another stock on hand —</option>
              {addable.map((c) => (
                <option key={c.id} value={c.id}>
                  {c.code} — {c.name}
                  {notEnteredFields(c).length ? ` (values not entered: ${entryFieldsInWords(notEnteredFields(c))})` : ''}
                </option>
              ))}
            </select>
          </label>
        )}
        {corr && 'error' in corr && (
          <p className="bs-error" role="alert">
            {corr.error}
          </p>
        )}
        {corr && 'result' in corr && corr.result.status === 'infeasible' && (
          <p className="bs-error" role="alert" data-testid="correction-reason">
            {corr.result.reason}
          </p>
        )}
        {corr && 'result' in corr && corr.result.status === 'optimal' && (
          <div className="bs-qc-result" role="status" data-testid="correction-summary">
            <p>
              {corr.result.addedKg > 0
                ? `Add ${Object.entries(corr.result.addKg)
                    .filter(([, kg]) => kg > 0)
                    .map(([code, kg]) => `${fmt(kg, 1)} kg of ${code}`)
                    .join(', ')} (${fmt(corr.result.addedKg, 1)} kg in all): the batch becomes ${fmt(corr.result.massKg, 1)} kg at ν40 ${fmt(corr.result.kv40, 1)} mm²/s (predicted).`
                : `The batch is already within ${fmt(corr.band.min, 1)}–${fmt(corr.band.max, 1)} mm²/s: nothing to add.`}
            </p>
            {corr.result.addedKg > 0 && props.correctionHold.length > 0 && (
              <div className="bs-hold-screen" role="alert" id={`${id}-corr-hold`} data-testid="correction-hold-screen">
                <strong>{RELEASE_HOLD_LABEL}.</strong> The correction sheet will print with the hold and its reasons:
                <ul>
                  {props.correctionHold.map((h) => (
                    <li key={h.message}>{h.message}</li>
                  ))}
                </ul>
              </div>
            )}
            <button
              type="button"
              className={props.correctionHold.length > 0 ? 'bs-print-held' : undefined}
              onClick={props.onPrintCorrection}
              disabled={corr.result.addedKg <= 0}
              aria-describedby={corr.result.addedKg > 0 && props.correctionHold.length > 0 ? `${id}-corr-hold` : undefined}
            >
              {props.correctionHold.length > 0 ? `Print correction sheet — ${RELEASE_HOLD_LABEL}` : 'Print correction sheet'}
            </button>
          </div>
        )}
      </details>
    </section>
  );
}

/** Why a heel of `kg` cannot be in a batch of `batchKg` (it is part of the batch), or null. */
function heelOverBatch(kg: number, batchKg: number | null, words: { say: (x: number) => string }): string | null {
  if (batchKg === null || !(kg > 0) || kg < batchKg) return null;
  const say = (x: number) => words.say(Number(x.toFixed(1)));
  return `Heel mass: ${say(kg)} kg is not less than the batch size (${say(batchKg)} kg); the heel is part of the batch. Enter a smaller heel or a larger batch size.`;
}

function safeKv(c: Component): { kv40: number; kv100: number } | null {
  try {
    return blendingViscosities(c);
  } catch {
    return null;
  }
}

const round = (x: number, d: number) => Number(x.toFixed(d));
