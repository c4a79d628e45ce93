// The one-page printable correction sheet: what to add to a batch that missed its QC result, in the
// order to charge it, with the same cautions as the blend sheet. Printed through the blend sheet's own
// print path (the screen chooses which of the two documents the printer gets).
import type { Recipe } from '../../core/formulation/model';
import { limitText } from '../../core/sheet/blend-sheet';
import { SheetFooter } from './SheetFooter';
import { longClass } from './page-header';
import { CORRECTION_EDGE_MARGIN_PCT, type CorrectionProblem, type CorrectionResult } from '../../core/qc/correction';
import { RELEASE_HOLD_LABEL, type HoldReason } from '../../core/release/release-hold';

export interface CorrectionSheetProps {
  companyName: string;
  recipe: Recipe;
  lot: string;
  vessel: string;
  date: string;
  problem: CorrectionProblem;
  result: Extract<CorrectionResult, { status: 'optimal' }>;
  band: { min: number; max: number };
  /** The release band the correction's band lies in (at least CORRECTION_EDGE_MARGIN_PCT inside each limit). */
  releaseBand: { min: number; max: number };
  kv100Estimated: boolean;
  /** Stock name by code. */
  names: ReadonlyMap<string, string>;
  /** The code of the additive package (charged last), if any. */
  additiveCode: string | null;
  paper: 'a4' | 'letter';
  /** The mixing rule of the prediction, named (e.g. "Refutas (mass fractions)"). */
  methodLabel: string;
  fmt: (x: number, d: number) => string;
  /**
   * Why the corrected batch is not for release (the blend sheet's hold, and any addition of a
   * withdrawn stock); empty → no hold (the laboratory's release is still required).
   */
  hold: readonly HoldReason[];
}

export function CorrectionSheet(p: CorrectionSheetProps) {
  const { problem, result, fmt } = p;
  // Charging order: base stocks heaviest first (as on the blend sheet), the additive package last.
  const adds = Object.entries(result.addKg)
    .filter(([, kg]) => kg > 0)
    .map(([code, kg]) => ({ code, kg, kv40: problem.components.find((c) => c.id === code)?.kv40 ?? 0 }))
    .sort((a, b) => (a.code === p.additiveCode ? 1 : b.code === p.additiveCode ? -1 : b.kv40 - a.kv40));
  let running = problem.vessel.massKg;
  // The specification's ν100 limits, as on the blend sheet (the correction itself aims at ν40 only).
  const spec = p.recipe.specification;
  const kv100Outside = correctedKv100Outside(result.kv100, spec);
  return (
    <article className={`blend-sheet bs-correction print-page bs-paper-${p.paper}`} aria-label="Printable correction sheet" data-testid="correction-sheet">
      <header className={`bs-head${longClass(p.companyName, 60) ? ' bs-long-head' : ''}`}>
        <div className="bs-title">Batch correction sheet</div>
        <div className={`bs-company ${longClass(p.companyName, 60) ?? ''}`}>{p.companyName || 'Company name (set it in the settings)'}</div>
      </header>
      {p.hold.length > 0 && (
        <section className="bs-hold" aria-label={`Correction sheet: ${RELEASE_HOLD_LABEL}`} data-testid="correction-hold">
          <div className="bs-hold-title">{RELEASE_HOLD_LABEL}</div>
          <ul>
            {p.hold.map((h) => (
              <li key={h.message}>{h.message}</li>
            ))}
          </ul>
          <div className="bs-hold-foot">Do not release the corrected batch until every reason is resolved.</div>
        </section>
      )}
      <dl className="bs-fields">
        <div className="bs-span3">
          <dt>Product</dt>
          <dd className={longClass(p.recipe.name, 90)}>{p.recipe.name}</dd>
        </div>
        <div className="bs-span1">
          <dt>Grade</dt>
          <dd>ISO VG {p.recipe.grade}</dd>
        </div>
        <div className="bs-span1">
          <dt>Recipe revision</dt>
          <dd>{p.recipe.revision}</dd>
        </div>
        <div className="bs-span1">
          <dt>Date</dt>
          <dd>{p.date || '____________'}</dd>
        </div>
        <div className="bs-span3">
          <dt>Batch / lot no.</dt>
          <dd className={longClass(p.lot, 72)}>{p.lot || '____________'}</dd>
        </div>
        <div className="bs-span3">
          <dt>Vessel</dt>
          <dd className={longClass(p.vessel, 72)}>{p.vessel || '____________'}</dd>
        </div>
      </dl>
      <h3>1. QC result of the batch</h3>
      <p className="bs-corr-result">
        In the vessel: {fmt(problem.vessel.massKg, 1)} kg. Measured ν40 {fmt(problem.vessel.kv40, 1)} mm²/s (ASTM D445), ν100{' '}
        {fmt(problem.vessel.kv100, 2)} mm²/s{p.kv100Estimated ? ' (not measured: estimated at the recipe’s predicted VI)' : ''}. Correct into{' '}
        {fmt(p.band.min, 1)}–{fmt(p.band.max, 1)} mm²/s{problem.maxFinalMassKg === undefined ? '' : `; the vessel holds at most ${fmt(problem.maxFinalMassKg, 0)} kg`}.
      </p>
      <p className="bs-corr-result" data-testid="correction-margin">
        Aimed inside the release band {fmt(p.releaseBand.min, 1)}–{fmt(p.releaseBand.max, 1)} mm²/s with a margin of at least{' '}
        {fmt(CORRECTION_EDGE_MARGIN_PCT, 0)} % of ν40 inside each limit (common practice), so that the corrected batch is not predicted on the limit itself.
      </p>
      <table className="bs-table bs-components">
        <caption>2. Additions, in charging order</caption>
        <thead>
          <tr>
            <th scope="col" className="bs-num">Step</th>
            <th scope="col">Code</th>
            <th scope="col">Name</th>
            <th scope="col" className="bs-num">kg to add</th>
            <th scope="col" className="bs-num">Vessel kg after</th>
            <th scope="col" className="bs-initials">Initials</th>
          </tr>
        </thead>
        <tbody>
          {adds.map((a, i) => {
            running += a.kg;
            return (
              <tr key={a.code}>
                <td className="bs-num">{i + 1}</td>
                <th scope="row" className="bs-code">{a.code}</th>
                <td className="bs-name">{p.names.get(a.code) ?? ''}</td>
                <td className="bs-num bs-qty">{fmt(a.kg, 1)}</td>
                <td className="bs-num">{fmt(running, 1)}</td>
                <td className="bs-initials" />
              </tr>
            );
          })}
        </tbody>
        <tfoot>
          <tr>
            <td />
            <th scope="row">Total added</th>
            <td />
            <td className="bs-num bs-qty">{fmt(result.addedKg, 1)}</td>
            <td className="bs-num">{fmt(result.massKg, 1)}</td>
            <td className="bs-initials" />
          </tr>
        </tfoot>
      </table>
      <h3>3. Predicted after correction</h3>
      <p className="bs-corr-result" data-testid="correction-predicted">
        Batch {fmt(result.massKg, 1)} kg: ν40 {fmt(result.kv40, 1)} mm²/s, ν100 {fmt(result.kv100, 2)} mm²/s, VI {fmt(result.vi, 1)} (
        {problem.objective === 'cost' ? 'least cost' : 'least added mass'}
        {problem.additive ? `; additive package topped up to ${fmt(problem.additive.massFraction * 100, 2)} %` : ''}). Mix until uniform (30–60 min),
        then re-sample and test ν40 and ν100 (ASTM D445) and the other release tests before release.
      </p>
      <table className="bs-table bs-qc">
        <caption>4. QC after correction</caption>
        <thead>
          <tr>
            <th scope="col">Property</th>
            <th scope="col">Unit</th>
            <th scope="col" className="bs-num">Predicted</th>
            <th scope="col">Target</th>
            <th scope="col">Test method</th>
            <th scope="col" className="bs-measured">Measured</th>
            <th scope="col" className="bs-initials">Initials</th>
          </tr>
        </thead>
        <tbody>
          <tr>
            <th scope="row">Kinematic viscosity at 40 °C</th>
            <td>mm²/s</td>
            <td className="bs-num">{fmt(result.kv40, 1)}</td>
            <td>
              {fmt(p.band.min, 1)}–{fmt(p.band.max, 1)}
            </td>
            <td>ASTM D445</td>
            <td className="bs-measured" />
            <td className="bs-initials" />
          </tr>
          <tr className={kv100Outside ? 'bs-outside' : undefined}>
            <th scope="row">Kinematic viscosity at 100 °C</th>
            <td>mm²/s</td>
            <td className="bs-num">
              {kv100Outside ? <span className="bs-flag">outside </span> : null}
              {fmt(result.kv100, 2)}
            </td>
            <td>{limitText(spec.kv100Min, spec.kv100Max, 2, fmt)}</td>
            <td>ASTM D445</td>
            <td className="bs-measured" />
            <td className="bs-initials" />
          </tr>
          <tr>
            <th scope="row">Viscosity index</th>
            <td>—</td>
            <td className="bs-num">{fmt(result.vi, 0)}</td>
            <td>{limitText(p.recipe.specification.viMin, null, 0, fmt)}</td>
            <td>ASTM D2270</td>
            <td className="bs-measured" />
            <td className="bs-initials" />
          </tr>
        </tbody>
      </table>
      <p className="bs-note">
        Predicted values are estimates ({p.methodLabel}, the batch as measured blended with the stocks on hand); the corrected batch is released
        only on its measured results.
      </p>
      <SheetFooter roles={['Corrected by', 'QC tested by', 'Released by']} />
    </article>
  );
}

/** Whether a corrected batch's predicted ν100 [mm²/s] lies outside the specification's ν100 limits. */
export function correctedKv100Outside(kv100: number, spec: { kv100Min: number | null; kv100Max: number | null }): boolean {
  return (spec.kv100Min !== null && kv100 < spec.kv100Min) || (spec.kv100Max !== null && kv100 > spec.kv100Max);
}
