// Effective blending viscosity of a non-ideal stock, calibrated from a measured trial blend:
// the stored calibration's provenance, and the form that solves a new one with the core.
import { useId, useMemo, useState } from 'react';
import { userMessage } from '../../state/messages';
import { checkText } from '../../state/field-rules';
import type { StockUpdateOutcome } from './ImpactConfirm';
import type { Calibration, Component, Recipe } from '../../core/formulation/model';
import { entryFieldsInWords, notEnteredFields } from '../../core/formulation/entered-values';
import { calibrateComponent, MIN_CALIBRATION_FRACTION } from '../../core/formulation/calibration';
import { blendingViscosities, predictBlend } from '../../core/formulation/blend-properties';
import { kv40kv100FromPoints } from '../../core/viscosity/viscosity-temperature';
import type { Formatter } from '../../components/format';

export type BlendRule = Calibration['method'];
export const RULE_LABEL: Record<BlendRule, string> = {
  refutas: 'Refutas (mass basis)',
  'astm-d7152': 'D7152 ASTM Blending Method (constant temperature, volume basis)',
  'd7152-wright': 'D7152 Wright method (volume basis)',
};

interface TrialLine {
  key: number;
  componentId: string;
  pct: string;
}

export interface CalibrationPanelProps {
  c: Component;
  components: readonly Component[];
  recipes: readonly Recipe[];
  /** Blending rule offered first (from the settings). */
  defaultMethod: BlendRule;
  /** Today's ISO date (YYYY-MM-DD), the date a new calibration is stored with. */
  today: string;
  fmt: Formatter;
  /** Stores (or asks to confirm, when it moves saved recipes) a calibration; null removes it. */
  onStore: (calibration: Calibration | null) => StockUpdateOutcome | void;
}

function ownKv(c: Component): { kv40: number; kv100: number } | null {
  try {
    return kv40kv100FromPoints(c.viscosityPoints);
  } catch {
    return null;
  }
}

const codeOf = (components: readonly Component[], id: string) => components.find((x) => x.id === id)?.code ?? `(deleted stock ${id})`;

/** The stored calibration, with everything needed to trace it back to the laboratory. */
export function CalibrationProvenance({ cal, components, fmt }: { cal: Calibration; components: readonly Component[]; fmt: Formatter }) {
  const trial = Object.entries(cal.trial.massFractions).filter(([, w]) => w > 0);
  return (
    <dl className="cal-provenance small">
      <dt>Effective blending viscosities</dt>
      <dd>
        ν40 {fmt.sig(cal.effectiveKv40, 4)} mm²/s, ν100 {fmt.sig(cal.effectiveKv100, 4)} mm²/s — valid with the {RULE_LABEL[cal.method]} rule
      </dd>
      <dt>Trial blend</dt>
      <dd>{trial.map(([id, w]) => `${codeOf(components, id)} ${fmt.num(w * 100, 2)} %`).join(' + ')} (by mass)</dd>
      <dt>Measured (ASTM D445)</dt>
      <dd>
        ν40 {fmt.sig(cal.trial.measuredKv40, 4)} mm²/s, ν100 {fmt.sig(cal.trial.measuredKv100, 4)} mm²/s
      </dd>
      <dt>Lab reference</dt>
      <dd>{cal.trial.labReference || '(none given)'}</dd>
      <dt>Calibrated on</dt>
      <dd>{cal.calibratedOn}</dd>
    </dl>
  );
}

/** What is wrong with a trial, in words; null when the form can be solved. */
export function checkTrial(
  unknown: Component,
  lines: readonly { componentId: string; pct: number | null }[],
  measured: { kv40: number | null; kv100: number | null },
  components: readonly Component[],
  say: (v: number) => string = (v) => String(Number(v.toPrecision(6))),
): string[] {
  const errors: string[] = [];
  const seen = new Set<string>();
  for (const l of lines) {
    const code = codeOf(components, l.componentId);
    if (!l.componentId) errors.push('Choose a stock for every line of the trial blend (or remove the empty line).');
    else if (seen.has(l.componentId)) errors.push(`${code} appears twice in the trial blend; enter it once with its total mass %.`);
    seen.add(l.componentId);
    if (l.pct === null || Number.isNaN(l.pct)) errors.push(`Enter the mass % of ${l.componentId ? code : 'every line'} as a number.`);
    else if (l.pct < 0 || l.pct > 100) errors.push(`The mass % of ${code} must be between 0 and 100 (got ${say(l.pct)}).`);
  }
  const unknownLine = lines.find((l) => l.componentId === unknown.id);
  if (!unknownLine || !(unknownLine.pct !== null && unknownLine.pct > 0)) {
    errors.push(`${unknown.code} is not in the trial blend: the blend must contain the stock being calibrated.`);
  } else if (unknownLine.pct < 100 * MIN_CALIBRATION_FRACTION) {
    errors.push(`${unknown.code} is only ${say(unknownLine.pct)} % of the trial; calibrate from a blend with at least ${say(100 * MIN_CALIBRATION_FRACTION)} % of it.`);
  } else if (unknownLine.pct >= 100) {
    errors.push(`The trial must contain at least one other stock besides ${unknown.code}; for ${unknown.code} alone, enter its measured viscosities instead.`);
  }
  const sum = lines.reduce((s, l) => s + (l.pct !== null && Number.isFinite(l.pct) ? l.pct : 0), 0);
  if (lines.every((l) => l.pct !== null && Number.isFinite(l.pct)) && Math.abs(sum - 100) > 0.01) {
    errors.push(`The mass % of the trial blend add up to ${say(Number(sum.toFixed(4)))} %, not 100 %.`);
  }
  const { kv40, kv100 } = measured;
  if (kv40 === null || Number.isNaN(kv40)) errors.push('Enter the measured ν40 of the trial blend (mm²/s) as a number.');
  else if (!(kv40 > 0)) errors.push(`The measured ν40 must be above zero (got ${say(kv40)} mm²/s).`);
  if (kv100 === null || Number.isNaN(kv100)) errors.push('Enter the measured ν100 of the trial blend (mm²/s) as a number.');
  else if (!(kv100 > 0)) errors.push(`The measured ν100 must be above zero (got ${say(kv100)} mm²/s).`);
  if (kv40 !== null && kv100 !== null && kv40 > 0 && kv100 > 0 && kv100 >= kv40) {
    errors.push(`The measured ν100 (${say(kv100)} mm²/s) must be below the measured ν40 (${say(kv40)} mm²/s): viscosity falls as temperature rises.`);
  }
  return errors;
}

/** Calibration section of a stock's details: provenance + remove, and the trial-blend form. */
export function CalibrationPanel({ c, components, recipes, defaultMethod, today, fmt, onStore }: CalibrationPanelProps) {
  const id = useId();
  const [open, setOpen] = useState(false);
  const [lines, setLines] = useState<TrialLine[]>([]);
  const [nextKey, setNextKey] = useState(1);
  const [kv40, setKv40] = useState('');
  const [kv100, setKv100] = useState('');
  const [labRef, setLabRef] = useState('');
  const [method, setMethod] = useState<BlendRule>(defaultMethod);
  const [errors, setErrors] = useState<string[]>([]);
  const [result, setResult] = useState<Calibration | null>(null);
  const [stored, setStored] = useState<string | null>(null);
  const own = ownKv(c);
  const others = useMemo(() => components.filter((x) => x.id !== c.id), [components, c.id]);

  const start = () => {
    const first = others.find((x) => x.category !== 'polymer' && x.category !== 'additive-package') ?? others[0];
    setLines([
      { key: 0, componentId: c.id, pct: '10' },
      { key: 1, componentId: first?.id ?? '', pct: '90' },
    ]);
    setNextKey(2);
    setKv40('');
    setKv100('');
    setLabRef('');
    setMethod(defaultMethod);
    setErrors([]);
    setResult(null);
    setStored(null);
    setOpen(true);
  };
  const edit = (fn: () => void) => {
    fn();
    setResult(null);
    setErrors([]);
  };
  const fromRecipe = (recipeId: string) => {
    const r = recipes.find((x) => x.id === recipeId);
    if (!r) return;
    edit(() => {
      const ls = r.lines.filter((l) => l.massFraction > 0).map((l, i) => ({ key: nextKey + i, componentId: l.componentId, pct: fmt.plain(Number((l.massFraction * 100).toFixed(4))) }));
      setLines(ls);
      setNextKey(nextKey + ls.length);
    });
  };

  const solve = () => {
    const parsed = lines.map((l) => ({ componentId: l.componentId, pct: fmt.parse(l.pct) }));
    const measured = { kv40: fmt.parse(kv40), kv100: fmt.parse(kv100) };
    const labProblem = checkText('labReference', labRef.trim());
    const problems = [...checkTrial(c, parsed, measured, components, fmt.say), ...(labProblem ? [labProblem] : [])];
    if (problems.length) {
      setErrors(problems);
      setResult(null);
      return;
    }
    const sum = parsed.reduce((s, l) => s + l.pct!, 0);
    const massFractions: Record<string, number> = {};
    // The sum is 100 % within 0.01 %: rescale so the fractions sum to 1 exactly for the core.
    for (const l of parsed) if (l.pct! > 0) massFractions[l.componentId] = l.pct! / sum;
    try {
      const cal = calibrateComponent({
        components,
        unknownId: c.id,
        massFractions,
        measuredKv40: measured.kv40!,
        measuredKv100: measured.kv100!,
        method,
        labReference: labRef.trim(),
        calibratedOn: today,
        display: fmt.settings,
      });
      setErrors([]);
      setResult(cal);
    } catch (e) {
      setErrors([userMessage(e, { components, words: fmt })]);
      setResult(null);
    }
  };

  // The trial predicted with the new effective values: reproduces the measurement (a check shown to the user).
  const check = useMemo(() => {
    if (!result) return null;
    try {
      const lib = components.map((x) => (x.id === c.id ? { ...x, calibration: result } : x));
      const lns = Object.entries(result.trial.massFractions).map(([componentId, massFraction]) => ({ componentId, massFraction }));
      return predictBlend(lib, lns, { method: result.method });
    } catch {
      return null;
    }
  }, [result, components, c.id]);
  const before = useMemo(() => {
    if (!result) return null;
    try {
      const lib = components.map((x) => (x.id === c.id ? { ...x, calibration: null } : x));
      const lns = Object.entries(result.trial.massFractions).map(([componentId, massFraction]) => ({ componentId, massFraction }));
      return predictBlend(lib, lns, { method: result.method });
    } catch {
      return null;
    }
  }, [result, components, c.id]);

  const used = blendingViscosities(c);
  return (
    <fieldset className="wide cal-panel">
      <legend>Blending calibration (non-ideal stocks)</legend>
      {c.calibration ? (
        <>
          <CalibrationProvenance cal={c.calibration} components={components} fmt={fmt} />
          <p className="small">
            Blends with {c.code} use these effective values instead of its measured ν40/ν100 ({own ? `${fmt.sig(own.kv40, 4)} / ${fmt.sig(own.kv100, 4)} mm²/s` : '—'}).
          </p>
          <button type="button" aria-label={`Remove calibration of ${c.code}`} onClick={() => onStore(null)}>
            Remove calibration
          </button>{' '}
        </>
      ) : notEnteredFields(c).some((f) => f !== 'density15') ? (
        // Placeholders are never shown as measured values.
        <p className="muted small">
          None. {c.code}&rsquo;s {entryFieldsInWords(notEnteredFields(c).filter((f) => f !== 'density15'))} {notEnteredFields(c).length > 1 ? 'are' : 'is'} not yet
          entered: enter {c.code}&rsquo;s measured values above first.
        </p>
      ) : (
        <p className="muted small">
          None: blends use {c.code}&rsquo;s measured ν40 {fmt.sig(used.kv40, 4)} / ν100 {fmt.sig(used.kv100, 4)} mm²/s. Polymers, additive
          packages and some Group V fluids blend non-ideally; a calibration from a measured trial blend makes predictions with them closer to the laboratory.
        </p>
      )}
      {stored ? (
        <p className="small cal-stored" role="status">
          {stored}
        </p>
      ) : null}
      {!open ? (
        <button type="button" onClick={start}>
          {c.calibration ? 'Recalibrate from a trial blend…' : 'Calibrate from a trial blend…'}
        </button>
      ) : (
        <div className="cal-form" role="group" aria-labelledby={`${id}-h`}>
          <h4 id={`${id}-h`}>Calibrate {c.code} from a trial blend</h4>
          <p className="small muted">
            Blend {c.code} with other stocks in the laboratory, measure the blend&rsquo;s ν40 and ν100 (ASTM D445) and enter them here. The
            effective values are solved so that the chosen rule reproduces the measurement exactly; they are best near the trial&rsquo;s
            composition.
          </p>
          <label className="inline-field">
            <span>Use a recipe&rsquo;s composition</span>
            <select value="" onChange={(e) => fromRecipe(e.target.value)}>
              <option value="">— choose a recipe —</option>
              {recipes.map((r) => {
                const w = r.lines.find((l) => l.componentId === c.id)?.massFraction ?? 0;
                return (
                  <option key={r.id} value={r.id}>
                    {r.name} ({w > 0 ? `${fmt.num(w * 100, 1)} % ${c.code}` : `no ${c.code}`})
                  </option>
                );
              })}
            </select>
          </label>
          <table className="mini cal-lines">
            <caption className="visually-hidden">Trial blend composition</caption>
            <thead>
              <tr>
                <th scope="col">Stock</th>
                <th scope="col">Mass %</th>
                <th scope="col">
                  <span className="visually-hidden">Remove</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {lines.map((l, i) => (
                <tr key={l.key}>
                  <td>
                    <select
                      aria-label={`Trial stock ${i + 1}`}
                      value={l.componentId}
                      onChange={(e) => edit(() => setLines(lines.map((x) => (x.key === l.key ? { ...x, componentId: e.target.value } : x))))}
                    >
                      <option value="">— choose —</option>
                      {components.map((x) => (
                        <option key={x.id} value={x.id}>
                          {x.code} — {x.name}
                          {x.id === c.id ? ' (being calibrated)' : ''}
                        </option>
                      ))}
                    </select>
                  </td>
                  <td>
                    <input
                      aria-label={`Mass % of trial stock ${i + 1}`}
                      inputMode="decimal"
                      size={7}
                      value={l.pct}
                      onChange={(e) => edit(() => setLines(lines.map((x) => (x.key === l.key ? { ...x, pct: e.target.value } : x))))}
                    />
                  </td>
                  <td>
                    <button
                      type="button"
                      aria-label={`Remove trial stock ${i + 1}`}
                      onClick={() => edit(() => setLines(lines.filter((x) => x.key !== l.key)))}
                    >
                      Remove
                    </button>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          <button
            type="button"
            onClick={() =>
              edit(() => {
                setLines([...lines, { key: nextKey, componentId: '', pct: '' }]);
                setNextKey(nextKey + 1);
              })
            }
          >
            Add a stock to the trial
          </button>
          <div className="cal-measured">
            <label className="field">
              <span className="field-label">
                Measured ν40 of the trial <span className="unit">[mm²/s]</span>
              </span>
              <input inputMode="decimal" size={8} value={kv40} onChange={(e) => edit(() => setKv40(e.target.value))} />
            </label>
            <label className="field">
              <span className="field-label">
                Measured ν100 of the trial <span className="unit">[mm²/s]</span>
              </span>
              <input inputMode="decimal" size={8} value={kv100} onChange={(e) => edit(() => setKv100(e.target.value))} />
            </label>
            <label className="field">
              <span className="field-label">Lab reference (sample or report no.)</span>
              <input size={16} value={labRef} onChange={(e) => edit(() => setLabRef(e.target.value))} />
            </label>
            <label className="field">
              <span className="field-label">Blending rule</span>
              <select value={method} onChange={(e) => edit(() => setMethod(e.target.value as BlendRule))}>
                {(Object.keys(RULE_LABEL) as BlendRule[]).map((m) => (
                  <option key={m} value={m}>
                    {RULE_LABEL[m]}
                    {m === defaultMethod ? ' — as in settings' : ''}
                  </option>
                ))}
              </select>
            </label>
          </div>
          <div className="button-row">
            <button type="button" className="primary" onClick={solve}>
              Solve effective viscosities
            </button>
            <button type="button" onClick={() => setOpen(false)}>
              Cancel
            </button>
          </div>
          {errors.length ? (
            <div className="notice notice-error cal-errors" role="alert">
              <strong className="notice-title">The calibration cannot be solved:</strong>
              <ul>
                {errors.map((e) => (
                  <li key={e}>{e}</li>
                ))}
              </ul>
            </div>
          ) : null}
          {result ? (
            <div className="cal-result">
              <table className="mini cal-compare" aria-label={`Calibration result for ${c.code}`}>
                <thead>
                  <tr>
                    <th scope="col">
                      <span className="visually-hidden">Viscosities</span>
                    </th>
                    <th scope="col">ν40 [mm²/s]</th>
                    <th scope="col">ν100 [mm²/s]</th>
                  </tr>
                </thead>
                <tbody>
                  <tr>
                    <th scope="row">Trial blend, measured</th>
                    <td>{fmt.sig(result.trial.measuredKv40, 4)}</td>
                    <td>{fmt.sig(result.trial.measuredKv100, 4)}</td>
                  </tr>
                  <tr>
                    <th scope="row">Trial blend, predicted without calibration</th>
                    <td>{before ? fmt.sig(before.kv40, 4) : '—'}</td>
                    <td>{before ? fmt.sig(before.kv100, 4) : '—'}</td>
                  </tr>
                  <tr>
                    <th scope="row">Trial blend, predicted with calibration</th>
                    <td>{check ? fmt.sig(check.kv40, 4) : '—'}</td>
                    <td>{check ? fmt.sig(check.kv100, 4) : '—'}</td>
                  </tr>
                  <tr>
                    <th scope="row">{c.code}, own measured values</th>
                    <td>{own ? fmt.sig(own.kv40, 4) : '—'}</td>
                    <td>{own ? fmt.sig(own.kv100, 4) : '—'}</td>
                  </tr>
                  <tr className="cal-effective">
                    <th scope="row">{c.code}, effective for blending</th>
                    <td>{fmt.sig(result.effectiveKv40, 4)}</td>
                    <td>{fmt.sig(result.effectiveKv100, 4)}</td>
                  </tr>
                </tbody>
              </table>
              <p className="small muted">
                Valid with the {RULE_LABEL[result.method]} rule; dated {result.calibratedOn}. Storing replaces {c.code}&rsquo;s blending values
                in every prediction and solve (undo in the toolbar).
              </p>
              <button
                type="button"
                className="primary"
                onClick={() => {
                  const outcome = onStore(result);
                  if (outcome && outcome.kind === 'refused') {
                    setStored(`Not stored: ${outcome.message}`);
                    return;
                  }
                  const storedText = `Calibration stored for ${c.code}: blends now use ν40 ${fmt.sig(result.effectiveKv40, 4)} / ν100 ${fmt.sig(result.effectiveKv100, 4)} mm²/s.`;
                  if (outcome && outcome.kind === 'confirm') {
                    // The note lasts while the window is open: then it says what the answer did. Cancelled,
                    // the solved values stay in the form, to be stored again without solving again.
                    setStored(`The calibration of ${c.code} moves saved recipes: confirm or cancel in the window that opened.`);
                    void outcome.settled.then((applied) => {
                      if (applied) setOpen(false);
                      setStored(applied ? storedText : `Not stored: ${c.code} keeps its stored blending values. The solved values are still below; store them again or cancel.`);
                    });
                    return;
                  }
                  setOpen(false);
                  setStored(storedText);
                }}
              >
                Store calibration for {c.code}
              </button>
            </div>
          ) : null}
        </div>
      )}
    </fieldset>
  );
}
