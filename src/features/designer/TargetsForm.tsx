import { memo, useId } from 'react';
import type { BlendTargets, Component, Objective, Recipe } from '../../core/formulation/model';
import { CATEGORY_LABEL, DEFAULT_MAX_POLYMER_FRACTION } from '../../core/formulation/model';
import { ISO_GRADES, gradeBand } from '../../core/viscosity/iso-grades';
import { NumberField, ruleVerdict, type Verdict } from '../../components/fields';
import { useFormat } from '../../components/format';
import { checkNumber, type NumberRuleKey, type SayNumbers } from '../../state/field-rules';

export const OBJECTIVE_LABEL: Record<Objective, string> = {
  cost: 'Least cost per litre (at 15 °C)',
  'cost-kg': 'Least cost per kg',
  solvency: 'Best solvency (lowest aniline point)',
  oxidation: 'Highest oxidation-stability class',
  closest: 'Closest to a reference recipe',
};

export interface TargetsFormProps {
  targets: BlendTargets;
  components: readonly Component[];
  recipes: readonly Recipe[];
  onChange: (patch: Partial<BlendTargets>) => void;
  onBound: (componentId: string, bound: { min?: number; max?: number } | null) => void;
  onSolve: () => void;
  solving: boolean;
}

const pct = (f: number | null | undefined) => (f === null || f === undefined ? null : f * 100);
const frac = (p: number | null) => (p === null ? null : p / 100);
const pctToFrac = (p: number) => p / 100;

/** Target grade, band, constraints and objective; the Solve button. */
export const TargetsForm = memo(function TargetsForm({
  targets,
  components,
  recipes,
  onChange,
  onBound,
  onSolve,
  solving,
}: TargetsFormProps) {
  const gradeId = useId();
  const addId = useId();
  const refId = useId();
  const band = safeBand(targets.grade);
  const mid = band?.mid ?? targets.grade;
  const target = targets.targetKv40 ?? mid;
  const lo = Math.max(band?.min ?? 0, target * (1 - targets.tolerancePct / 100));
  const hi = Math.min(band?.max ?? Infinity, target * (1 + targets.tolerancePct / 100));
  const fmt = useFormat();
  const toDisp = (c: number | null) => (c === null ? null : fmt.tempValue(c));
  const fromDisp = (d: number | null) => (d === null ? null : fmt.tempToC(d));
  const tUnit = fmt.tempUnit;
  const additives = components.filter((c) => c.category === 'additive-package' && c.availability !== 'withdrawn');
  const chosenAdditive = additives.find((c) => c.id === targets.additive?.componentId);
  const references = recipes.filter((r) => r.lines.length > 0);
  const usable = components.filter((c) => c.availability !== 'withdrawn' && c.id !== targets.additive?.componentId);
  const withdrawn = components.filter((c) => c.availability === 'withdrawn');
  const boundCount = Object.keys(targets.bounds).length;

  return (
    <form
      className="targets-form"
      aria-label="Targets and constraints"
      onSubmit={(e) => {
        e.preventDefault();
        onSolve();
      }}
    >
      <fieldset>
        <legend>Target</legend>
        <div className="field">
          <label htmlFor={gradeId}>ISO viscosity grade</label>
          <select
            id={gradeId}
            value={targets.grade}
            onChange={(e) => onChange({ grade: Number(e.target.value), targetKv40: null })}
          >
            {ISO_GRADES.filter((g) => g.grade >= 10).map((g) => (
              <option key={g.grade} value={g.grade}>
                VG {g.grade} ({fmt.say(g.min)}–{fmt.say(g.max)} mm²/s)
              </option>
            ))}
          </select>
        </div>
        <Opt
          label="Target ν40"
          rule="targetKv40"
          unit="mm²/s"
          value={targets.targetKv40}
          min={band?.min}
          max={band?.max}
          hint={`empty = grade mid-point ${fmt.say(mid)}`}
          onChange={(v) => onChange({ targetKv40: v })}
        />
        <Opt
          label="Tolerance ±"
          rule="tolerancePct"
          unit="% of target"
          value={targets.tolerancePct}
          required
          min={0}
          max={10}
          onChange={(v) => onChange({ tolerancePct: v ?? 5 })}
        />
        <Opt
          label="Probability in the solve band, at least"
          rule="minInBandProbability"
          toStored={pctToFrac}
          unit="%"
          value={pct(targets.minInBandProbability)}
          min={0}
          max={99.99}
          hint="blank = least cost, on the band's edge (about half the batches outside); uses each stock's lot spread of ν40 (Stocks)"
          onChange={(v) => onChange({ minInBandProbability: v === null || v === 0 ? null : frac(v) })}
        />
        <p className="band-note" data-testid="solve-band">
          Solve band: {fmt.num(lo, 1)}–{fmt.num(hi, 1)} mm²/s at {fmt.temp(40)} (always inside the ISO band).
        </p>
      </fieldset>

      <fieldset>
        <legend>Constraints</legend>
        <Opt label="Minimum VI" rule="minVi" value={targets.minVi} decimals={1} onChange={(v) => onChange({ minVi: v })} />
        <Opt
          label="Maximum aniline point"
          rule="maxAnilinePoint"
          toStored={fmt.tempToC}
          unit={tUnit}
          value={toDisp(targets.maxAnilinePoint)}
          decimals={1}
          hint="lower = more solvent"
          onChange={(v) => onChange({ maxAnilinePoint: fromDisp(v) })}
        />
        <Opt
          label="Maximum polymer"
          rule="maxPolymerFraction"
          toStored={pctToFrac}
          unit="mass %"
          value={pct(targets.maxPolymerFraction)}
          min={0}
          max={100}
          hint={`new recipes start at ${DEFAULT_MAX_POLYMER_FRACTION * 100} % (common practice, no source); blank = no cap`}
          onChange={(v) => onChange({ maxPolymerFraction: frac(v) })}
        />
        <Opt
          label="Maximum pour point (estimate)"
          rule="maxPourPoint"
          toStored={fmt.tempToC}
          unit={tUnit}
          value={toDisp(targets.maxPourPoint)}
          decimals={1}
          onChange={(v) => onChange({ maxPourPoint: fromDisp(v) })}
        />
        <Opt
          label="Minimum flash point (estimate)"
          rule="minFlashPoint"
          toStored={fmt.tempToC}
          unit={tUnit}
          value={toDisp(targets.minFlashPoint)}
          decimals={1}
          onChange={(v) => onChange({ minFlashPoint: fromDisp(v) })}
        />
        <div className="field">
          <label htmlFor={addId}>Additive package</label>
          <select
            id={addId}
            value={targets.additive?.componentId ?? ''}
            onChange={(e) =>
              onChange({
                additive: e.target.value ? { componentId: e.target.value, massFraction: targets.additive?.massFraction ?? 0.02 } : null,
              })
            }
          >
            <option value="">none</option>
            {additives.map((c) => (
              <option key={c.id} value={c.id}>
                {c.code} — {c.name}
              </option>
            ))}
          </select>
          {/* A long name is cut in the closed list on a narrow window: the chosen package's name in full. */}
          {chosenAdditive && chosenAdditive.name && <span className="field-hint" data-testid="additive-name">{chosenAdditive.name}</span>}
        </div>
        {targets.additive && (
          <Opt
            label="Treat rate"
            rule="treatRate"
            toStored={pctToFrac}
            unit="mass %"
            value={pct(targets.additive.massFraction)}
            required
            min={0}
            max={30}
            onChange={(v) => targets.additive && onChange({ additive: { ...targets.additive, massFraction: frac(v) ?? 0 } })}
          />
        )}
        <details className="bounds">
          <summary>
            Per-stock limits and exclusions{boundCount ? ` (${boundCount} set)` : ''}
          </summary>
          <table className="bounds-table">
            <caption className="visually-hidden">Per-stock limits</caption>
            <thead>
              <tr>
                <th scope="col">Use</th>
                <th scope="col">Stock</th>
                <th scope="col">Min %</th>
                <th scope="col">Max %</th>
              </tr>
            </thead>
            <tbody>
              {usable.map((c) => {
                const b = targets.bounds[c.id];
                const excluded = b?.max === 0;
                return (
                  <tr key={c.id}>
                    <td>
                      <input
                        type="checkbox"
                        aria-label={`Use ${c.code}`}
                        checked={!excluded}
                        onChange={(e) => onBound(c.id, e.target.checked ? null : { max: 0 })}
                      />
                    </td>
                    <th scope="row" title={`${c.name} (${CATEGORY_LABEL[c.category]})`}>
                      {c.code}
                    </th>
                    <td>
                      <NumberField
                        label={`Minimum % of ${c.code}`}
                        hideLabel
                        size={5}
                        allowEmpty
                        className="bound-field"
                        value={pct(b?.min)}
                        disabled={excluded}
                        validate={(v) => ({ error: boundProblem(c.code, 'min', v, pct(b?.max), fmt) })}
                        onCommit={(v) => onBound(c.id, { ...b, min: frac(v) ?? undefined })}
                      />
                    </td>
                    <td>
                      <NumberField
                        label={`Maximum % of ${c.code}`}
                        hideLabel
                        size={5}
                        allowEmpty
                        className="bound-field"
                        value={pct(b?.max)}
                        disabled={excluded}
                        validate={(v) => ({ error: boundProblem(c.code, 'max', v, pct(b?.min), fmt) })}
                        onCommit={(v) => onBound(c.id, { ...b, max: frac(v) ?? undefined })}
                      />
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
          {withdrawn.length > 0 && (
            <p className="field-hint">Withdrawn, never used: {withdrawn.map((c) => c.code).join(', ')}.</p>
          )}
        </details>
      </fieldset>

      <fieldset>
        <legend>Objective</legend>
        {(Object.keys(OBJECTIVE_LABEL) as Objective[]).map((o) => (
          <label key={o} className="radio">
            <input type="radio" name="objective" value={o} checked={targets.objective === o} onChange={() => onChange({ objective: o })} />{' '}
            {OBJECTIVE_LABEL[o]}
          </label>
        ))}
        <div className="field">
          <label htmlFor={refId}>Reference recipe</label>
          <select
            id={refId}
            value={targets.referenceRecipeId ?? ''}
            onChange={(e) => onChange({ referenceRecipeId: e.target.value || null })}
          >
            <option value="">none</option>
            {references.map((r) => (
              <option key={r.id} value={r.id}>
                {r.name}
              </option>
            ))}
          </select>
        </div>
      </fieldset>
      <button type="submit" className="primary" disabled={solving}>
        {solving ? 'Solving…' : 'Solve'}
      </button>
    </form>
  );
});

/**
 * A per-stock limit as typed [% by mass]: within the stored rule for a limit (0–100 %,
 * field-rules.ts) and not past the other limit of the same stock. Names the stock:
 * "BW-280: minimum 40 % is above its maximum 30 %".
 */
export function boundProblem(code: string, which: 'min' | 'max', v: number | null, other: number | null, words: SayNumbers): string | undefined {
  if (v === null) return undefined;
  const word = which === 'min' ? 'minimum' : 'maximum';
  const refused = checkNumber('bound', v / 100, code, words);
  if (refused) return refused.replace(/the limit/, `the ${word}`);
  if (other !== null && which === 'min' && v > other + 1e-9) return `${code}: minimum ${words.say(v)} % is above its maximum ${words.say(other)} %`;
  if (other !== null && which === 'max' && v < other - 1e-9) return `${code}: maximum ${words.say(v)} % is below its minimum ${words.say(other)} %`;
  return undefined;
}

function safeBand(grade: number) {
  try {
    return gradeBand(grade);
  } catch {
    return null;
  }
}

interface OptProps {
  label: string;
  unit?: string;
  value: number | null;
  onChange: (v: number | null) => void;
  placeholder?: string;
  min?: number | undefined;
  max?: number | undefined;
  hint?: string | undefined;
  decimals?: number;
  required?: boolean;
  /** The stored field's rule (field-rules.ts), checked after min/max: what entry takes, storage takes. */
  rule?: NumberRuleKey;
  /** The typed value as stored (% → fraction, °F → °C); default as typed. */
  toStored?: (typed: number) => number;
}

/** A constraint field: empty means "no limit"; range checked before it is written. */
function Opt({ label, unit, value, onChange, min, max, hint, decimals = 2, required = false, rule, toStored }: OptProps) {
  const fmt = useFormat();
  const validate = (v: number | null): Verdict => {
    if (v === null) return required ? { error: `${label}: a value is required` } : {};
    if (min !== undefined && v < min) return { error: `${label}: at least ${fmt.say(min)}${unit ? ` ${unit}` : ''}` };
    if (max !== undefined && v > max) return { error: `${label}: at most ${fmt.say(max)}${unit ? ` ${unit}` : ''}` };
    return rule ? ruleVerdict(rule, v, fmt, toStored) : {};
  };
  return (
    <NumberField
      className="stacked"
      label={label}
      unit={unit}
      value={value === null ? null : Number(value.toFixed(decimals))}
      allowEmpty={!required}
      validate={validate}
      hint={hint ? <span className="field-hint">{hint}</span> : undefined}
      onCommit={onChange}
    />
  );
}
