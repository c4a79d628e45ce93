import { memo, useState } from 'react';
import type { Availability, Component, ComponentCategory } from '../../core/formulation/model';
import { CATEGORY_LABEL, COMPONENT_CATEGORIES } from '../../core/formulation/model';
import { roundHalfEven } from '../../core/viscosity/viscosity-index';
import { NumberField, SelectField, TextField, type Verdict } from '../../components/fields';
import { gradeLabel, useFormat } from '../../components/format';
import { normaliseCurrency } from '../../core/currency/exchange-rates';
import { ROW_KEY_ATTR } from '../../components/row-window';
import { checkLabelText, checkValue, checkViscosityPair, kv40kv100, viOrReason } from '../../state/checks';
import { enteredKvPatch, enteredPatch } from '../../state/stock-defaults';
import { entryFieldsInWords, notEnteredFields } from '../../core/formulation/entered-values';

export const CATEGORY_OPTIONS = COMPONENT_CATEGORIES.map((c) => ({ value: c, label: CATEGORY_LABEL[c] }));
export const AVAILABILITY_OPTIONS: ReadonlyArray<{ value: Availability; label: string }> = [
  { value: 'available', label: 'Available' },
  { value: 'limited', label: 'Limited' },
  { value: 'withdrawn', label: 'Withdrawn' },
];
// A per-litre price is for litres at 15 °C (converted to per kg with the stock's ρ15).
const BASIS_SHORT = { 'per-kg': '/kg', 'per-litre': '/L at 15 °C', 'per-tonne': '/t' } as const;
// Beside the price cell the basis is short (a litre basis names its 15 °C under the price: the
// header reads only "Price" and the base currency), and the field's label (read by screen readers)
// carries the full basis.
const BASIS_HINT = { 'per-kg': '/kg', 'per-litre': '/L', 'per-tonne': '/t' } as const;

/** The mark beside a measured field whose value was not yet entered (its input is empty). */
function NotEnteredMark() {
  return (
    <span className="not-entered" title="Not yet entered: the stock is left out of solving and release until it is">
      not entered
    </span>
  );
}

/** Set the viscosity at one temperature (replacing a point there, or adding one). */
export function withKvAt(c: Component, tempC: number, kv: number): Component['viscosityPoints'] {
  const has = c.viscosityPoints.some((p) => p.tempC === tempC);
  const pts = has ? c.viscosityPoints.map((p) => (p.tempC === tempC ? { ...p, kv } : p)) : [...c.viscosityPoints, { tempC, kv }];
  return [...pts].sort((a, b) => a.tempC - b.tempC);
}

const toVerdict = (r: { error?: string; warning?: string }): Verdict => ({ error: r.error, warning: r.warning });
const merge = (a: Verdict, b: Verdict): Verdict => ({ error: a.error ?? b.error, warning: a.warning ?? b.warning });

export interface RowProps {
  c: Component;
  codeError: (code: string, id: string) => string | undefined;
  expanded: boolean;
  onUpdate: (id: string, patch: Partial<Omit<Component, 'id'>>) => void;
  onToggleDetails: (id: string) => void;
  onClone: (id: string) => void;
  onDelete: (id: string) => void;
  detailsId: string;
  /** The row's place in the whole table (header = 1), when only part of the table is drawn. */
  rowIndex?: number;
}

/**
 * One stock in the library table: key fields editable in place, VI and grade computed beside. The
 * fields are drawn as text until edited (fields.tsx `textUntilEdited`): the opening screen draws about
 * twenty rows, and their inputs and selects cost a multiple of text to draw.
 */
export const ComponentRow = memo(function ComponentRow({ c, codeError, expanded, onUpdate, onToggleDetails, onClone, onDelete, detailsId, rowIndex }: RowProps) {
  const fmt = useFormat();
  const quoted = normaliseCurrency(c.price.currency);
  const foreign = quoted !== normaliseCurrency(fmt.settings.baseCurrency) ? quoted : '';
  const kv = kv40kv100(c);
  // A value not yet entered shows empty (its placeholder is never shown as data).
  const pending = notEnteredFields(c);
  const kv40 = pending.includes('kv40') ? null : (kv?.kv40 ?? null);
  const kv100 = pending.includes('kv100') ? null : (kv?.kv100 ?? null);
  // VI and grade follow the values on screen, also while one is being typed (and not yet saved).
  const [typed40, setTyped40] = useState<number | null | undefined>(undefined);
  const [typed100, setTyped100] = useState<number | null | undefined>(undefined);
  const shown40 = typed40 === undefined ? kv40 : typed40;
  const shown100 = typed100 === undefined ? kv100 : typed100;
  const vi = viOrReason(shown40, shown100);
  const gradeText = gradeLabel(shown40);
  const who = c.code || 'new stock';
  const tempField = (field: 'anilinePoint' | 'pourPoint' | 'flashPoint', label: string) => (
    <td className="num">
      <NumberField
        label={`${label} of ${who} [${fmt.tempUnit}]`}
        hideLabel
        textUntilEdited
        size={4}
        allowEmpty
        digits={fmt.settings.temperatureUnit === 'F' ? 1 : undefined}
        value={c[field] === null ? null : fmt.tempValue(c[field])}
        validate={(v) => (v === null ? {} : toVerdict(checkValue(field, fmt.tempToC(v), fmt)))}
        onCommit={(v) => onUpdate(c.id, { [field]: v === null ? null : fmt.tempToC(v) })}
      />
    </td>
  );
  return (
    <tr className={`avail-${c.availability}${pending.length ? ' values-pending' : ''}`} {...{ [ROW_KEY_ATTR]: c.id }} aria-rowindex={rowIndex}>
      <th scope="row" className="code-cell">
        <TextField
          label={`Stock code of ${c.name || who}`}
          hideLabel
          textUntilEdited
          size={7}
          fullTitle
          value={c.code}
          validate={(v) => ({ error: checkLabelText('stock code', v) ?? codeError(v, c.id) })}
          onCommit={(v) => onUpdate(c.id, { code: v.trim() })}
        />
      </th>
      <td className="name-cell">
        <TextField
          label={`Name of ${who}`}
          hideLabel
          textUntilEdited
          size={16}
          wrap
          value={c.name}
          validate={(v) => ({ error: checkLabelText('name', v) })}
          onCommit={(v) => onUpdate(c.id, { name: v.trim() })}
        />
      </td>
      <td className="category-cell">
        <SelectField<ComponentCategory>
          label={`Category of ${who}`}
          hideLabel
          textUntilEdited
          value={c.category}
          options={CATEGORY_OPTIONS}
          onChange={(v) => onUpdate(c.id, { category: v })}
        />
      </td>
      <td className="num">
        <NumberField
          label={`ν40 of ${who} [mm²/s]`}
          hideLabel
          textUntilEdited
          size={6}
          value={kv40}
          validate={(v) =>
            v === null && pending.includes('kv40') ? {} : merge(toVerdict(checkValue('kv40', v, fmt)), v !== null && kv100 !== null ? toVerdict(checkViscosityPair(v, kv100, fmt)) : {})
          }
          onDraft={setTyped40}
          onCommit={(v) => v !== null && onUpdate(c.id, enteredKvPatch(c, 'kv40', v))}
          hint={pending.includes('kv40') ? <NotEnteredMark /> : undefined}
        />
      </td>
      <td className="num">
        <NumberField
          label={`ν100 of ${who} [mm²/s]`}
          hideLabel
          textUntilEdited
          size={5}
          value={kv100}
          validate={(v) =>
            v === null && pending.includes('kv100') ? {} : merge(toVerdict(checkValue('kv100', v, fmt)), v !== null && kv40 !== null ? toVerdict(checkViscosityPair(kv40, v, fmt)) : {})
          }
          onDraft={setTyped100}
          onCommit={(v) => v !== null && onUpdate(c.id, enteredKvPatch(c, 'kv100', v))}
          hint={pending.includes('kv100') ? <NotEnteredMark /> : undefined}
        />
      </td>
      <td className="num computed" title="Viscosity index, ASTM D2270, computed from ν40 and ν100" data-testid="vi-cell">
        {'vi' in vi ? fmt.num(roundHalfEven(vi.vi), 0) : <span className="no-value" title={vi.why}>{vi.reason}<span className="visually-hidden"> ({vi.why})</span></span>}
      </td>
      <td className="num computed" title="ISO 3448 viscosity grade of ν40" data-testid="grade-cell">
        {gradeText.startsWith('VG ') ? gradeText : <span className="muted">{gradeText}</span>}
      </td>
      <td className="num">
        <NumberField
          label={`Density at 15 °C of ${who} [kg/L]`}
          hideLabel
          textUntilEdited
          size={5}
          value={pending.includes('density15') ? null : c.density15}
          validate={(v) => (v === null && pending.includes('density15') ? {} : toVerdict(checkValue('density15', v, fmt)))}
          onCommit={(v) => v !== null && onUpdate(c.id, enteredPatch(c, ['density15'], { density15: v }))}
          hint={pending.includes('density15') ? <NotEnteredMark /> : undefined}
        />
      </td>
      {tempField('anilinePoint', 'Aniline point')}
      <td className="num price-cell">
        <NumberField
          label={`Price of ${who} [${c.price.currency} ${BASIS_SHORT[c.price.basis]}]`}
          hideLabel
          textUntilEdited
          size={6}
          value={c.price.amount}
          validate={(v) => toVerdict(checkValue('price', v, fmt))}
          onCommit={(v) => v !== null && onUpdate(c.id, { price: { ...c.price, amount: v } })}
          hint={
            // A price quoted in another currency than the base names it: one column never mixes currencies unseen.
            <span className="unit" title={`${foreign ? `${foreign} ` : ''}${BASIS_SHORT[c.price.basis]}`}>
              {foreign}
              {BASIS_HINT[c.price.basis]}
            </span>
          }
        />
        {c.price.basis === 'per-litre' ? (
          <span className="basis-note" aria-hidden="true">
            at 15 °C
          </span>
        ) : null}
      </td>
      <td className="avail-cell">
        <SelectField<Availability>
          label={`Availability of ${who}`}
          hideLabel
          textUntilEdited
          value={c.availability}
          options={AVAILABILITY_OPTIONS}
          onChange={(v) => onUpdate(c.id, { availability: v })}
        />
        {pending.length > 0 ? (
          // The row's state: not used by any solve, search, plan or release until its values are entered.
          <span className="pending-state" data-testid="values-pending" title={`Not yet entered: ${entryFieldsInWords(pending)}`}>
            not in use: values to enter<span className="visually-hidden"> ({entryFieldsInWords(pending)})</span>
          </span>
        ) : null}
      </td>
      <td className="actions">
        <button
          type="button"
          aria-label={`${expanded ? 'Close' : 'More'} fields of ${who}`}
          aria-expanded={expanded}
          aria-controls={detailsId}
          onClick={() => onToggleDetails(c.id)}
        >
          {expanded ? 'Close' : 'More'}
        </button>
        <button type="button" aria-label={`Clone ${who}`} onClick={() => onClone(c.id)}>
          Clone
        </button>
        <button type="button" aria-label={`Delete ${who}`} className="danger" onClick={() => onDelete(c.id)}>
          Delete
        </button>
      </td>
    </tr>
  );
});
