import type { Component, PriceBasis, Recipe } from '../../core/formulation/model';
import { CATEGORY_LABEL } from '../../core/formulation/model';
import { DEFAULT_KV40_LOT_SPREAD_PCT } from '../../core/qc/lot-spread';
import { oxidationRating } from '../../core/scoring/oxidation';
import type { StockUpdateOutcome } from './ImpactConfirm';
import { PRICE_BASIS_LABEL } from '../../core/formulation/model';
import { pricePerKg } from '../../core/formulation/cost';
import { NumberField, SelectField, TextField } from '../../components/fields';
import { useFormat } from '../../components/format';
import { checkValue } from '../../state/checks';
import { enteredKvPatch, enteredPatch } from '../../state/stock-defaults';
import { entryFieldsInWords, notEnteredFields } from '../../core/formulation/entered-values';
import { CalibrationPanel, type BlendRule } from './CalibrationPanel';

const BASIS_OPTIONS = (Object.keys(PRICE_BASIS_LABEL) as PriceBasis[]).map((b) => ({ value: b, label: PRICE_BASIS_LABEL[b] }));

export interface DetailsProps {
  c: Component;
  usedIn: string[];
  /** The whole library and the recipes (for the calibration trial blend). */
  components: readonly Component[];
  recipes: readonly Recipe[];
  /** Blending rule from the settings (the calibration form's default). */
  defaultMethod: BlendRule;
  /** Today's ISO date (YYYY-MM-DD), passed in by the screen. */
  today: string;
  /** Stores a change (or asks to confirm one that moves saved recipes; see ImpactConfirm). */
  onUpdate: (id: string, patch: Partial<Omit<Component, 'id'>>) => StockUpdateOutcome | void;
}

function safePerKg(c: Component): number | null {
  try {
    return pricePerKg(c.price, c.density15);
  } catch {
    return null;
  }
}

/** The fields that do not fit in the table row, for one stock. */
export function ComponentDetails({ c, usedIn, components, recipes, defaultMethod, today, onUpdate }: DetailsProps) {
  const fmt = useFormat();
  const who = c.code || 'new stock';
  const pending = notEnteredFields(c);
  // A per-kg price needs no density; any other basis is converted with ρ15, not known until entered.
  const perKg = c.price.basis !== 'per-kg' && pending.includes('density15') ? null : safePerKg(c);
  /** The field a point stands for while its value is not yet entered (the 40 and 100 °C points only). */
  const pendingAt = (tempC: number) => (tempC === 40 && pending.includes('kv40') ? 'kv40' : tempC === 100 && pending.includes('kv100') ? 'kv100' : null);
  const setPoint = (i: number, patch: Partial<{ tempC: number; kv: number }>) => {
    const p = c.viscosityPoints[i]!;
    const field = patch.kv !== undefined && patch.tempC === undefined ? pendingAt(p.tempC) : null;
    if (field) return onUpdate(c.id, enteredKvPatch(c, field, patch.kv!));
    return onUpdate(c.id, { viscosityPoints: c.viscosityPoints.map((q, j) => (j === i ? { ...q, ...patch } : q)) });
  };
  const pointError = (i: number, tempC: number, kv: number): string | undefined => {
    // Placeholders (values not yet entered) are not checked against.
    const pts = c.viscosityPoints.map((p, j) => (j === i ? { tempC, kv } : p)).filter((p, j) => j === i || !pendingAt(p.tempC));
    if (pts.filter((p) => p.tempC === tempC).length > 1) return `there is already a point at ${fmt.sayTemp(tempC)}`;
    const sorted = [...pts].sort((a, b) => a.tempC - b.tempC);
    for (let k = 1; k < sorted.length; k++) {
      if (sorted[k]!.kv >= sorted[k - 1]!.kv) {
        return `viscosity must fall as temperature rises (${fmt.sayTemp(sorted[k]!.tempC)}: ${fmt.say(sorted[k]!.kv)} ≥ ${fmt.sayTemp(sorted[k - 1]!.tempC)}: ${fmt.say(sorted[k - 1]!.kv)} mm²/s)`;
      }
    }
    return undefined;
  };
  return (
    <div className="details-grid">
      <fieldset>
        <legend>Price</legend>
        <SelectField<PriceBasis>
          label="Quoted"
          value={c.price.basis}
          options={BASIS_OPTIONS}
          onChange={(basis) => onUpdate(c.id, { price: { ...c.price, basis } })}
        />
        <TextField
          label="Currency"
          size={5}
          rule="currency"
          trimForRule
          value={c.price.currency}
          validate={(v) => ({ error: v.trim() ? undefined : 'name the currency (e.g. EUR)' })}
          onCommit={(currency) => onUpdate(c.id, { price: { ...c.price, currency: currency.trim() } })}
        />
        <p className="muted small">
          {perKg === null
            ? `Price per kg: —${c.price.basis !== 'per-kg' && pending.includes('density15') ? ' (density not yet entered)' : ''}`
            : c.price.basis === 'per-kg'
              ? `= ${fmt.num(perKg, 3)} ${c.price.currency} per kg`
              : `= ${fmt.num(perKg, 3)} ${c.price.currency} per kg (at ρ15 ${fmt.num(c.density15, 3)} kg/L)`}
        </p>
      </fieldset>
      <fieldset>
        <legend>Pour and flash point</legend>
        <NumberField
          label="Pour point (ASTM D97)"
          unit={fmt.tempUnit}
          allowEmpty
          size={5}
          digits={fmt.settings.temperatureUnit === 'F' ? 1 : undefined}
          value={c.pourPoint === null ? null : fmt.tempValue(c.pourPoint)}
          validate={(v) => (v === null ? {} : checkValue('pourPoint', fmt.tempToC(v), fmt))}
          onCommit={(v) => onUpdate(c.id, { pourPoint: v === null ? null : fmt.tempToC(v) })}
        />
        <NumberField
          label="Flash point (ASTM D92, open cup)"
          unit={fmt.tempUnit}
          allowEmpty
          size={5}
          digits={fmt.settings.temperatureUnit === 'F' ? 1 : undefined}
          value={c.flashPoint === null ? null : fmt.tempValue(c.flashPoint)}
          validate={(v) => (v === null ? {} : checkValue('flashPoint', fmt.tempToC(v), fmt))}
          onCommit={(v) => onUpdate(c.id, { flashPoint: v === null ? null : fmt.tempToC(v) })}
        />
      </fieldset>
      <fieldset>
        <legend>Composition and scoring</legend>
        <NumberField label="Sulfur" unit="mass %" allowEmpty value={c.sulfurPct} validate={(v) => checkValue('sulfurPct', v, fmt)} onCommit={(v) => onUpdate(c.id, { sulfurPct: v })} />
        <NumberField
          label="Saturates"
          unit="mass %"
          allowEmpty
          value={c.saturatesPct}
          validate={(v) => checkValue('saturatesPct', v, fmt)}
          onCommit={(v) => onUpdate(c.id, { saturatesPct: v })}
        />
        <NumberField
          label="Oxidation rating (1–5)"
          allowEmpty
          size={4}
          value={c.oxidationRating}
          validate={(v) => checkValue('oxidationRating', v, fmt)}
          onCommit={(v) => onUpdate(c.id, { oxidationRating: v })}
          hint={<span className="muted small"> empty = category default ({oxidationRating({ category: c.category, oxidationRating: null })})</span>}
        />
        <NumberField
          label="Permanent shear loss of ν100"
          unit="%"
          allowEmpty
          size={4}
          value={c.shearLossPct}
          validate={(v) => checkValue('shearLossPct', v, fmt)}
          onCommit={(v) => onUpdate(c.id, { shearLossPct: v })}
        />
        <NumberField
          label="Permanent shear loss of ν40"
          unit="%"
          allowEmpty
          size={4}
          value={c.shearLoss40Pct ?? null}
          validate={(v) => checkValue('shearLoss40Pct', v, fmt)}
          onCommit={(v) => onUpdate(c.id, { shearLoss40Pct: v })}
          hint={<span className="muted small"> measured at 40 °C (ISO 26422); empty = the ν100 loss carried over</span>}
        />
        <NumberField
          label="Lot-to-lot spread of ν40"
          unit="% (relative std. dev.)"
          allowEmpty
          size={4}
          value={c.kv40LotSpreadPct}
          validate={(v) => checkValue('kv40LotSpreadPct', v, fmt)}
          onCommit={(v) => onUpdate(c.id, { kv40LotSpreadPct: v })}
          hint={
            <span className="muted small">
              {' '}
              empty = default for {CATEGORY_LABEL[c.category]}: {fmt.num(DEFAULT_KV40_LOT_SPREAD_PCT[c.category], 1)} % (common practice, no source; enter
              the plant&rsquo;s lot records)
            </span>
          }
        />
      </fieldset>
      <fieldset>
        <legend>Measured viscosities (ASTM D445)</legend>
        {pending.length > 0 ? (
          <p className="field-msg field-warning" data-testid="details-pending">
            Not yet entered: {entryFieldsInWords(pending)}. {c.code || 'This stock'} is left out of solving, the explorer, the line plan and
            release until {pending.length === 1 ? 'it is' : 'they are'} entered.
          </p>
        ) : null}
        <table className="mini">
          <thead>
            <tr>
              <th scope="col">Temperature [{fmt.tempUnit}]</th>
              <th scope="col">ν [mm²/s]</th>
              <th scope="col">
                <span className="visually-hidden">Remove</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {c.viscosityPoints.map((p, i) => (
              <tr key={i}>
                <td>
                  <NumberField
                    label={`Temperature of point ${i + 1} of ${who} [${fmt.tempUnit}]`}
                    hideLabel
                    size={5}
                    value={fmt.tempValue(p.tempC)}
                    validate={(v) => ({ error: v === null ? 'required' : pointError(i, fmt.tempToC(v), p.kv) })}
                    onCommit={(v) => v !== null && setPoint(i, { tempC: fmt.tempToC(v) })}
                  />
                </td>
                <td>
                  <NumberField
                    label={`Viscosity of point ${i + 1} of ${who} [mm²/s]`}
                    hideLabel
                    size={6}
                    value={pendingAt(p.tempC) ? null : p.kv}
                    validate={(v) =>
                      v === null && pendingAt(p.tempC) ? {} : { error: v === null ? 'required' : v <= 0 ? 'must be above zero' : pointError(i, p.tempC, v) }
                    }
                    onCommit={(v) => v !== null && setPoint(i, { kv: v })}
                    hint={pendingAt(p.tempC) ? <span className="not-entered">not entered</span> : undefined}
                  />
                </td>
                <td>
                  {c.viscosityPoints.length > 2 ? (
                    <button type="button" onClick={() => onUpdate(c.id, { viscosityPoints: c.viscosityPoints.filter((_, j) => j !== i) })}>
                      Remove<span className="visually-hidden"> point {i + 1}</span>
                    </button>
                  ) : null}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
        <button
          type="button"
          onClick={() => {
            const hottest = c.viscosityPoints.reduce((a, b) => (a.tempC > b.tempC ? a : b));
            // A placeholder beyond the hottest point and thinner than it, so the set stays consistent.
            onUpdate(c.id, {
              viscosityPoints: [...c.viscosityPoints, { tempC: hottest.tempC + 20, kv: Number((hottest.kv * 0.6).toPrecision(3)) }],
            });
          }}
        >
          Add a measured point
        </button>
      </fieldset>
      <CalibrationPanel
        key={c.id}
        c={c}
        components={components}
        recipes={recipes}
        defaultMethod={defaultMethod}
        today={today}
        fmt={fmt}
        onStore={(calibration) => onUpdate(c.id, { calibration })}
      />
      <fieldset className="wide">
        <legend>Provenance</legend>
        <TextField label="Source" size={36} rule="source" value={c.source} onCommit={(v) => onUpdate(c.id, { source: v })} />
        <TextField
          label="Date of data (YYYY-MM-DD)"
          size={11}
          maxLength={10}
          value={c.sourceDate}
          validate={(v) => ({ error: v === '' || /^\d{4}-\d{2}-\d{2}$/.test(v) ? undefined : 'use the form 2025-03-01' })}
          onCommit={(v) => onUpdate(c.id, { sourceDate: v })}
        />
        <TextField label="Notes" multiline rule="stockNotes" value={c.notes} onCommit={(v) => onUpdate(c.id, { notes: v })} />
        <p className="muted small">{usedIn.length ? `Used in: ${usedIn.join('; ')}.` : 'Not used in any recipe.'}</p>
      </fieldset>
    </div>
  );
}
