import { memo, useCallback, useMemo, useState } from 'react';
import type { BlendTargets } from '../../core/formulation/model';
import { DEFAULT_MAX_POLYMER_FRACTION } from '../../core/formulation/model';
import type { PropertyExplain } from '../../core/formulation/blend-properties';
import { gradeBand } from '../../core/viscosity/iso-grades';
import { SHEAR_ASSUMPTION } from '../../core/formulation/shear-blend';
import { OXIDATION_CLASS_LABEL, oxidationClass } from '../../core/scoring/oxidation';
import { SOLVENCY_BAND_LABEL } from '../../core/scoring/solvency';
import { explainDeposit } from '../../core/scoring/deposit';
import { formatWorkingInput, gradeLabel, probabilityText, useFormat, type Formatter } from '../../components/format';
import { MethodNote } from '../../components/notices';
import type { Prediction } from './predict';
import { RelayText, useRelay, useRelayed, type Relay } from '../../components/relay';
import type { BlendMethod } from '../../core/blending/blend-viscosity';
import { D341_TRUSTED_BAND_C, type D341Form } from '../../core/viscosity/viscosity-temperature';
import { verdictDigits } from '../../core/words/verdict-digits';

type Status = 'ok' | 'warn' | 'fail' | 'info';

interface Row {
  key: string;
  label: string;
  value: string;
  status: Status;
  statusText: string;
  explain: PropertyExplain | null;
}

/** The solve band [mm²/s]: target ± tolerance, clipped to the ISO band. */
export function solveBand(targets: BlendTargets): { lo: number; hi: number; isoMin: number; isoMax: number } | null {
  try {
    const g = gradeBand(targets.grade);
    const t = targets.targetKv40 ?? g.mid;
    return {
      lo: Math.max(g.min, t * (1 - targets.tolerancePct / 100)),
      hi: Math.min(g.max, t * (1 + targets.tolerancePct / 100)),
      isoMin: g.min,
      isoMax: g.max,
    };
  } catch {
    return null;
  }
}

/** Decimals (at most 3) that write a limit exactly: 96 → 0, 95.5 → 1. */
function limitDigits(limit: number, least: number): number {
  let d = least;
  while (d < 3 && Math.abs(Math.round(limit * 10 ** d) / 10 ** d - limit) > 1e-9) d++;
  return d;
}

/** The side a miss lies on: 'below' a minimum or 'above' a maximum. */
type FailSide = 'below' | 'above';

/**
 * A value beside its limit (both in the unit shown), from `least` decimals, at most 3, with the digits
 * that put it on the side of its verdict (the core's {@link verdictDigits}): a miss beyond the limit
 * ("95.96 ✗ minimum 96", not "96.0"), a pass — within the checks' 0.01 tolerance — not beyond it
 * ("94.65 ✓ minimum 94.65", not "94.6"). A value met only by the tolerance (94.641 against 94.65) still
 * reads beyond at 3 decimals, and its `note` says so.
 */
function besideLimit(value: number, limit: number, least: number, fails: FailSide, met: boolean): { digits: number; note: string } {
  const v = verdictDigits(value, fails === 'below' ? { min: limit, max: null } : { min: null, max: limit }, met ? 'met' : 'missed', least, 3);
  return { digits: v.digits, note: met && !v.onItsSide ? ' (met within the check tolerance)' : '' };
}

/** Decimals (from `least`, at most 3) at which a value that meets its limit is written on the limit's side: {@link besideLimit}. */
export function passingDigits(value: number, limit: number, least: number, fails: FailSide): number {
  return besideLimit(value, limit, least, fails, true).digits;
}

export function buildRows(pred: Extract<Prediction, { ok: true }>, targets: BlendTargets, fmt: Formatter): Row[] {
  const p = pred.props;
  const ex = p.explain;
  const rows: Row[] = [];
  const band = solveBand(targets);
  let kvStatus: Status = 'info';
  let kvText = '';
  if (band) {
    // Same acceptance as the solver: the band ends to 1e-4 relative.
    const eps = 1e-4;
    if (p.kv40 >= band.lo * (1 - eps) && p.kv40 <= band.hi * (1 + eps)) {
      kvStatus = 'ok';
      kvText = `inside the solve band ${fmt.num(band.lo, 1)}–${fmt.num(band.hi, 1)}`;
    } else if (p.kv40 >= band.isoMin && p.kv40 <= band.isoMax) {
      kvStatus = 'warn';
      kvText = `in VG ${targets.grade} but outside the solve band ${fmt.num(band.lo, 1)}–${fmt.num(band.hi, 1)}`;
    } else {
      kvStatus = 'fail';
      kvText = `outside VG ${targets.grade} (${band.isoMin}–${band.isoMax})`;
    }
  }
  rows.push({ key: 'kv40', label: 'Viscosity at 40 °C', value: `${fmt.num(p.kv40, 1)} mm²/s`, status: kvStatus, statusText: kvText, explain: ex.kv40 ?? null });
  rows.push({
    key: 'grade',
    label: 'ISO viscosity grade',
    value: gradeLabel(p.kv40),
    status: p.grade === targets.grade ? 'ok' : 'fail',
    statusText: p.grade === null ? '' : `${p.deviationFromMidPct! >= 0 ? '+' : ''}${fmt.num(p.deviationFromMidPct, 1)} % from mid-point`,
    explain: ex.grade ?? null,
  });
  rows.push(...inBandRows(pred, targets, fmt));
  rows.push(shearRow(pred, targets, fmt));
  rows.push({ key: 'kv100', label: 'Viscosity at 100 °C', value: `${fmt.num(p.kv100, 2)} mm²/s`, status: 'info', statusText: '', explain: ex.kv100 ?? null });
  const viOk = targets.minVi === null || (p.vi !== null && p.vi >= targets.minVi - 0.01);
  const viShown = p.vi === null || targets.minVi === null ? { digits: 1, note: '' } : besideLimit(p.vi, targets.minVi, 1, 'below', viOk);
  rows.push({
    key: 'vi',
    label: 'Viscosity index',
    value: p.vi === null || p.reportedVi === null ? 'not defined' : `${fmt.num(p.reportedVi, 0)} (${fmt.num(p.vi, viShown.digits)})`,
    status: targets.minVi === null ? 'info' : viOk ? 'ok' : 'fail',
    statusText:
      targets.minVi === null
        ? ''
        : `minimum ${fmt.num(targets.minVi, limitDigits(targets.minVi, 0))}${viShown.note}`,
    explain: ex.vi ?? null,
  });
  rows.push({ key: 'density15', label: 'Density at 15 °C', value: `${fmt.num(p.density15, 4)} kg/L`, status: 'info', statusText: '', explain: ex.density15 ?? null });
  const ap = p.anilinePoint?.value ?? null;
  const apOk = targets.maxAnilinePoint === null || (ap !== null && ap <= targets.maxAnilinePoint + 0.01);
  const apLimitDigits = targets.maxAnilinePoint === null ? 1 : limitDigits(fmt.tempValue(targets.maxAnilinePoint), 1);
  const apLimitShown = targets.maxAnilinePoint === null ? null : Number(fmt.tempValue(targets.maxAnilinePoint).toFixed(apLimitDigits));
  const apShown = ap === null || apLimitShown === null ? { digits: 1, note: '' } : besideLimit(fmt.tempValue(ap), apLimitShown, 1, 'above', apOk);
  rows.push({
    key: 'anilinePoint',
    label: 'Aniline point (solvency)',
    value: ap === null ? 'unknown' : fmt.temp(ap, apShown.digits),
    status: targets.maxAnilinePoint === null ? 'info' : apOk ? 'ok' : 'fail',
    statusText: [
      pred.deposit ? SOLVENCY_BAND_LABEL[pred.deposit.solvency.band].toLowerCase() : '',
      targets.maxAnilinePoint === null
        ? ''
        : `maximum ${fmt.temp(targets.maxAnilinePoint, apLimitDigits)}${apShown.note}`,
    ]
      .filter(Boolean)
      .join('; '),
    explain: ex.anilinePoint ?? null,
  });
  const ox = p.oxidationRating;
  rows.push({
    key: 'oxidationRating',
    label: 'Oxidation stability',
    value: ox === null ? 'no base fluid' : `${fmt.num(ox, 1)} of 5`,
    status: 'info',
    statusText: ox === null ? '' : OXIDATION_CLASS_LABEL[oxidationClass(ox)].toLowerCase(),
    explain: ex.oxidationRating
      ? {
          ...ex.oxidationRating,
          inputs: pred.deposit
            ? Object.fromEntries(
                pred.deposit.oxidation.contributions.map((c) => [`${pred.codes.get(c.componentId) ?? c.componentId} share of base fluid / rating`, `${fmt.num(c.baseFluidFraction, 3)} / ${c.rating}`]),
              )
            : ex.oxidationRating.inputs,
        }
      : null,
  });
  if (pred.deposit) {
    rows.push({
      key: 'deposit',
      label: 'Deposit propensity',
      value: pred.deposit.propensity,
      status: pred.deposit.propensity === 'elevated' ? 'warn' : 'info',
      statusText: pred.deposit.pattern.replace('-', ' '),
      explain: {
        equation: 'look-up: oxidation-stability class × solvency band (matrix in the README)',
        standard: 'Blendbench’s own assessment (common practice, no source); not a measurement',
        inputs: { 'oxidation rating [1–5]': Number(pred.deposit.oxidation.rating.toFixed(2)), 'solvency score [1–5]': pred.deposit.solvency.score },
        note: explainDeposit(pred.deposit, fmt.settings),
      },
    });
  }
  // Outside the band the D341 line is not to be trusted (core assessTemperature); the band in the user's unit.
  const notTrusted = `outside ${fmt.temp(D341_TRUSTED_BAND_C.min)}…${fmt.temp(D341_TRUSTED_BAND_C.max)}: not to be trusted`;
  if (p.kvAtOperating) {
    rows.push({
      key: 'kvOperating',
      label: `Viscosity at ${fmt.temp(p.kvAtOperating.tempC)} (operating)`,
      value: `${fmt.sig(p.kvAtOperating.kv, 3)} mm²/s`,
      status: p.kvAtOperating.outsideBand ? 'warn' : 'info',
      statusText: p.kvAtOperating.outsideBand ? notTrusted : p.kvAtOperating.extrapolated ? 'extrapolated' : '',
      explain: ex.kvAtTemperature ?? null,
    });
  }
  if (p.kvAtCold) {
    rows.push({
      key: 'kvCold',
      label: `Viscosity at ${fmt.temp(p.kvAtCold.tempC)} (cold start)`,
      value: `${fmt.sig(p.kvAtCold.kv, 3)} mm²/s`,
      status: p.kvAtCold.outsideBand ? 'warn' : 'info',
      statusText: p.kvAtCold.outsideBand ? notTrusted : p.kvAtCold.extrapolated ? 'extrapolated' : '',
      explain: ex.kvAtTemperature ?? null,
    });
  }
  const polyOk = targets.maxPolymerFraction === null || p.polymerFraction <= targets.maxPolymerFraction + 1e-6;
  // Without a cap of its own, a share beyond the common-practice default still earns a warning.
  const beyondDefault = targets.maxPolymerFraction === null && p.polymerFraction > DEFAULT_MAX_POLYMER_FRACTION + 1e-6;
  rows.push({
    key: 'polymer',
    label: 'Polymer share',
    value: fmt.pct(p.polymerFraction, 1),
    status: targets.maxPolymerFraction === null ? (beyondDefault ? 'warn' : 'info') : polyOk ? 'ok' : 'fail',
    statusText:
      targets.maxPolymerFraction === null
        ? beyondDefault
          ? `no cap set; beyond the usual ${fmt.pct(DEFAULT_MAX_POLYMER_FRACTION, 0)} (common practice)`
          : ''
        : `maximum ${fmt.pct(targets.maxPolymerFraction, 1)}`,
    explain: { equation: 'Σ wᵢ over polymer components (mass fractions)', standard: 'definition', inputs: {} },
  });
  // A limit in the unit shown, with its own digits; a value beside it with the digits that put it on the
  // side its verdict says (a miss beyond the limit, a pass not beyond it).
  const tempLimit = (
    v: number | null,
    limit: number | null,
    fails: 'below' | 'above',
  ): { value: string; limit: string; fail: boolean } => {
    const ld = limit === null ? 0 : limitDigits(fmt.tempValue(limit), 0);
    const fail = v !== null && limit !== null && (fails === 'below' ? v < limit - 0.01 : v > limit + 0.01);
    const shownLimit = limit === null ? null : Number(fmt.tempValue(limit).toFixed(ld));
    const shown = v === null || shownLimit === null ? { digits: 0, note: '' } : besideLimit(fmt.tempValue(v), shownLimit, 0, fails, !fail);
    return { value: v === null ? 'unknown' : fmt.temp(v, shown.digits), limit: limit === null ? '' : `${fmt.temp(limit, ld)}${shown.note}`, fail };
  };
  const flash = tempLimit(p.flashPoint, targets.minFlashPoint, 'below');
  rows.push({
    key: 'flash',
    label: 'Flash point (estimate)',
    value: flash.value,
    status: targets.minFlashPoint === null || p.flashPoint === null ? 'info' : flash.fail ? 'fail' : 'ok',
    statusText: withExtrapolation(targets.minFlashPoint === null ? '' : `minimum ${flash.limit}`, p.flashPointExtrapolated),
    explain: ex.flashPoint ?? null,
  });
  const pour = tempLimit(p.pourPoint, targets.maxPourPoint, 'above');
  rows.push({
    key: 'pour',
    label: 'Pour point (estimate)',
    value: pour.value,
    status: targets.maxPourPoint === null || p.pourPoint === null ? 'info' : pour.fail ? 'fail' : 'ok',
    statusText: withExtrapolation(targets.maxPourPoint === null ? '' : `maximum ${pour.limit}`, p.pourPointExtrapolated),
    explain: ex.pourPoint ?? null,
  });
  const cur = p.currency ? ` (${p.currency})` : '';
  rows.push({
    key: 'costPerKg',
    label: `Cost per kg${cur}`,
    value: fmt.money(p.costPerKg, 3),
    status: 'info',
    statusText: targets.objective === 'cost-kg' ? 'objective' : '',
    explain: ex.costPerKg ?? null,
  });
  rows.push({
    key: 'costPerLitre',
    label: `Cost per litre at 15 °C${cur}`,
    value: fmt.money(p.costPerLitre, 3),
    status: 'info',
    statusText: targets.objective === 'cost' ? 'objective' : '',
    explain: ex.costPerLitre ?? null,
  });
  if (p.costPerDeliveredLitre && p.costPerDeliveredLitre.tempC !== 15) {
    rows.push({
      key: 'costPerDeliveredLitre',
      label: `Cost per delivered litre at ${fmt.temp(p.costPerDeliveredLitre.tempC)}${cur}`,
      value: fmt.money(p.costPerDeliveredLitre.cost, 3),
      status: 'info',
      statusText: '',
      explain: ex.costPerDeliveredLitre ?? null,
    });
  }
  return rows;
}

/** A probability for a property row: one decimal, two near 100 %, never rounded to a certainty it is not. */
export function fmtProbability(p: number, fmt: Formatter): string {
  return probabilityText(p, (x, d) => fmt.num(x, d));
}

/**
 * "Lands in the solve band" and "lands in the ISO band": the probability that a batch does, under the
 * stocks' lot-to-lot spread of ν40 (core/qc/lot-spread.ts).
 */
export function inBandRows(pred: Extract<Prediction, { ok: true }>, targets: BlendTargets, fmt: Formatter): Row[] {
  const ib = pred.inBand;
  if (!ib) return [];
  const d = ib.distribution;
  const pMin = targets.minInBandProbability;
  const working = (band: { min: number; max: number }): PropertyExplain => ({
    equation: 'P = Φ((b − μ)/σ) − Φ((a − μ)/σ); μ = Σ cᵢwᵢXᵢ / Σ cᵢwᵢ, σ = √Σ (cᵢwᵢ·X′(ν40ᵢ)·ν40ᵢ·sᵢ)² / Σ cᵢwᵢ',
    standard:
      'Blendbench’s lot-spread model: each lot’s ν40 varies by its stock’s relative standard deviation sᵢ (normal, independent), X linearised per stock (the mixing rule’s blending coordinate); spreads are the stocks’ own or common-practice defaults (no source)',
    inputs: {
      'band ends a–b [mm²/s]': `${fmt.num(band.min, 1)}–${fmt.num(band.max, 1)}`,
      'μ (blending coordinate of the median batch)': Number(d.meanX.toFixed(5)),
      'σ (its standard deviation)': Number(d.sdX.toFixed(5)),
      'median batch ν40 [mm²/s]': Number(d.medianKv40.toFixed(1)),
    },
    note: 'An estimate: enter each stock’s measured lot-to-lot spread on the Stocks screen for a figure the plant can rely on.',
  });
  const plantOk = pMin === null || ib.plant.probability >= pMin;
  return [
    {
      key: 'inBandPlant',
      label: 'Lands in the solve band (lot spread)',
      value: fmtProbability(ib.plant.probability, fmt),
      status: pMin === null ? 'info' : plantOk ? 'ok' : 'fail',
      statusText: `${fmt.num(ib.plant.min, 1)}–${fmt.num(ib.plant.max, 1)} mm²/s${pMin === null ? '' : `; at least ${fmtProbability(pMin, fmt)}`}`,
      explain: working(ib.plant),
    },
    {
      key: 'inBandIso',
      label: 'Lands in the ISO band (lot spread)',
      value: fmtProbability(ib.iso.probability, fmt),
      status: 'info',
      statusText: `VG ${targets.grade}: ${fmt.num(ib.iso.min, 1)}–${fmt.num(ib.iso.max, 1)} mm²/s`,
      explain: working(ib.iso),
    },
  ];
}

/** "In grade after shear": ν40 after permanent (KRL) shear of the polymers, against the target grade's band. */
export function shearRow(pred: Extract<Prediction, { ok: true }>, targets: BlendTargets, fmt: Formatter): Row {
  const sh = pred.shear;
  const base = { key: 'shear', label: 'In grade after shear' };
  if ('error' in sh) {
    return {
      ...base,
      value: 'cannot assess',
      status: 'warn',
      statusText: sh.error,
      explain: { equation: 'see the note', standard: 'KRL loss of ν100, ISO 26422 / CEC L-45; carry-over to 40 °C assumed', inputs: {}, note: SHEAR_ASSUMPTION },
    };
  }
  const band = (() => {
    try {
      const g = gradeBand(targets.grade);
      return `VG ${targets.grade} band ${fmt.num(g.min, 1)}–${fmt.num(g.max, 1)} mm²/s`;
    } catch {
      return `VG ${targets.grade}`;
    }
  })();
  const yes = sh.inGradeAfter === true;
  const inputs: Record<string, string | number> = {
    'ν40 before shear [mm²/s]': Number(sh.kv40Before.toFixed(2)),
    'ν100 before → after shear [mm²/s]': `${fmt.num(sh.kv100Before, 2)} → ${fmt.num(sh.kv100After, 2)}`,
    'losses measured at': sh.statedAt === 'both' ? '40 and 100 °C' : `${sh.statedAt} °C`,
    'blend loss of ν100 [%]': Number(sh.lossKv100Pct.toFixed(2)),
    'blend loss of ν40 [%]': Number(sh.lossKv40Pct.toFixed(2)),
    'VI after shear (indicative only)': sh.viAfter === null ? 'not defined' : Number(sh.viAfter.toFixed(0)),
  };
  if (sh.kv40AfterSameRelativeLoss !== null) {
    inputs['ν40 if it lost the same % as ν100 (simpler assumption) [mm²/s]'] = Number(sh.kv40AfterSameRelativeLoss.toFixed(1));
  }
  for (const p of sh.polymers) {
    const stated = p.shearLoss40Pct === null ? `ν100 ${fmt.num(p.shearLossPct, 1)}` : p.shearLossPct > 0 ? `ν100 ${fmt.num(p.shearLossPct, 1)}, ν40 ${fmt.num(p.shearLoss40Pct, 1)}` : `ν40 ${fmt.num(p.shearLoss40Pct, 1)}`;
    inputs[`${pred.codes.get(p.componentId) ?? p.componentId} stated loss [%] / share of thickening sₚ`] = `${stated} / ${fmt.num(p.share, 3)}`;
  }
  return {
    ...base,
    value: `${yes ? 'yes' : 'no'}, ν40 ${fmt.num(sh.kv40After, 1)} mm²/s`,
    status: sh.inGradeAfter === null ? 'info' : yes ? 'ok' : 'fail',
    statusText: sh.unchanged ? `no polymer with a stated shear loss; ${band}` : `${band}; ν40 −${fmt.num(sh.lossKv40Pct, 1)} %`,
    explain: {
      equation: sh.unchanged
        ? 'no polymer with a stated shear loss: ν40 after = ν40 before'
        : 'ν100′ = ν100·(1 − L/100), L = Σ sₚLₚ; each polymer keeps the same fraction of its thickening at 40 °C as at 100 °C; ν40′ by the mixing rule',
      standard: 'KRL loss of ν100, ISO 26422 / CEC L-45; its carry-over to 40 °C is Blendbench’s stated assumption; ISO 3448 band',
      inputs,
      note: SHEAR_ASSUMPTION,
    },
  };
}

/** A flash or pour estimate beyond its index's fitted range says so beside its status (issue 13). */
function withExtrapolation(text: string, extrapolated: boolean): string {
  if (!extrapolated) return text;
  return text ? `${text}; extrapolated beyond the index's fitted range` : "extrapolated beyond the index's fitted range";
}

const STATUS_MARK: Record<Status, string> = { ok: '✓', warn: '!', fail: '✗', info: '' };

/** Predicted properties, each with its working (equation, standard, inputs) on demand. */
export function PropertiesPanel({ prediction, targets }: { prediction: Prediction; targets: BlendTargets }) {
  return <PropertiesView prediction={useRelayed(prediction)} targets={targets} />;
}

/** The rows of the latest prediction, built once per prediction (every cell's selector shares them). */
type RowsOf = (p: Prediction) => Row[] | null;

/**
 * The predicted properties from a relay: the table is laid out per set of rows (which properties,
 * whether each has working); an edit re-renders only the values and statuses it changes.
 */
export const PropertiesView = memo(function PropertiesView({ prediction, targets }: { prediction: Relay<Prediction>; targets: BlendTargets }) {
  const fmt = useFormat();
  const [open, setOpen] = useState<ReadonlySet<string>>(new Set());
  const toggle = useCallback(
    (k: string) =>
      setOpen((s) => {
        const n = new Set(s);
        if (n.has(k)) n.delete(k);
        else n.add(k);
        return n;
      }),
    [],
  );
  const rowsOf = useMemo<RowsOf>(() => {
    let last: Prediction | null = null;
    let rows: Row[] | null = null;
    return (p) => {
      if (p !== last) {
        last = p;
        rows = p.ok ? buildRows(p, targets, fmt) : null;
      }
      return rows;
    };
  }, [targets, fmt]);
  // What the table is made of: the rows (with or without working) and the method note.
  const layout = useRelay(prediction, (p) =>
    p.ok ? `ok\u0001${p.props.method}\u0001${p.props.d341Form}\u0001${rowsOf(p)!.map((r) => `${r.key}${r.explain ? '+' : ''}`).join(',')}` : `no\u0001${p.message}`,
  );
  const [kind, a, b, keys] = layout.split('\u0001') as [string, string, string, string | undefined];
  return (
    <section className="props" aria-labelledby="props-h" data-testid="predicted">
      <h3 id="props-h">Predicted properties</h3>
      {kind === 'no' ? (
        <p className="muted" role="status">
          {a}
        </p>
      ) : (
        <>
          <MethodNote method={a as BlendMethod} d341Form={b as D341Form} />
          <table className="props-table">
            <thead className="visually-hidden">
              <tr>
                <th scope="col">Property</th>
                <th scope="col">Predicted value</th>
                <th scope="col">Against the targets</th>
                <th scope="col">Working</th>
              </tr>
            </thead>
            <tbody>
              {(keys ?? '').split(',').map((kx) => {
                const k = kx.replace(/\+$/, '');
                return <PropRow key={k} k={k} hasWorking={kx.endsWith('+')} isOpen={open.has(k)} onToggle={toggle} prediction={prediction} rowsOf={rowsOf} />;
              })}
            </tbody>
          </table>
          <PropWarnings prediction={prediction} />
        </>
      )}
    </section>
  );
});

/** One property: its label and status mark change with the status, its value and status text with each edit. */
const PropRow = memo(function PropRow({
  k,
  hasWorking,
  isOpen,
  onToggle,
  prediction,
  rowsOf,
}: {
  k: string;
  hasWorking: boolean;
  isOpen: boolean;
  onToggle: (k: string) => void;
  prediction: Relay<Prediction>;
  rowsOf: RowsOf;
}) {
  const rowOf = (p: Prediction) => rowsOf(p)?.find((r) => r.key === k);
  const head = useRelay(prediction, (p) => {
    const r = rowOf(p);
    return r ? `${r.label}\u0001${r.status}` : '';
  });
  const [label = '', status = 'info'] = head.split('\u0001') as [string, Status];
  const text = useMemo(
    () => ({
      value: (p: Prediction) => rowsOf(p)?.find((r) => r.key === k)?.value ?? '',
      status: (p: Prediction) => rowsOf(p)?.find((r) => r.key === k)?.statusText ?? '',
    }),
    [rowsOf, k],
  );
  const detailId = `working-${k}`;
  return (
    <>
      <tr data-prop={k}>
        <th scope="row">{label}</th>
        <td className="value" data-testid={`prop-${k}`}>
          <RelayText relay={prediction} select={text.value} />
        </td>
        <td className={`status-${status}`}>
          {STATUS_MARK[status] && <span aria-hidden="true">{STATUS_MARK[status]} </span>}
          {status === 'fail' && <span className="visually-hidden">not met: </span>}
          <RelayText relay={prediction} select={text.status} />
        </td>
        <td>
          {hasWorking && (
            <button
              type="button"
              className="link"
              aria-expanded={isOpen}
              aria-controls={detailId}
              aria-label={`${isOpen ? 'hide' : 'show'} working for ${label}`}
              onClick={() => onToggle(k)}
            >
              {isOpen ? 'hide working' : 'show working'}
            </button>
          )}
        </td>
      </tr>
      {hasWorking && isOpen && <WorkingRow id={detailId} k={k} prediction={prediction} rowsOf={rowsOf} />}
    </>
  );
});

/** A property's working, shown on demand (follows each edit while shown). */
function WorkingRow({ id, k, prediction, rowsOf }: { id: string; k: string; prediction: Relay<Prediction>; rowsOf: RowsOf }) {
  const fmt = useFormat();
  const explain = useRelay(prediction, (p) => rowsOf(p)?.find((r) => r.key === k)?.explain ?? null);
  return (
    <tr className="working" id={id}>
      <td colSpan={4}>{explain && <Working explain={explain} fmt={fmt} />}</td>
    </tr>
  );
}

/** The prediction's warnings (re-rendered only when their text changes). */
function PropWarnings({ prediction }: { prediction: Relay<Prediction> }) {
  const text = useRelay(prediction, (p) => (p.ok ? p.props.warnings.join('\n') : ''));
  if (!text) return null;
  return (
    <ul className="prop-warnings">
      {text.split('\n').map((w) => (
        <li key={w}>{w}</li>
      ))}
    </ul>
  );
}

function Working({ explain, fmt }: { explain: PropertyExplain; fmt: Formatter }) {
  const inputs = Object.entries(explain.inputs);
  return (
    <div className="explain">
      <dl>
        <dt>Equation</dt>
        <dd>
          <code>{explain.equation}</code>
        </dd>
        <dt>Method / standard</dt>
        <dd>{explain.standard}</dd>
        {inputs.length > 0 && (
          <>
            <dt>Inputs</dt>
            <dd>
              <ul className="inputs">
                {inputs.map(([k, v]) => {
                  const { label, text } = formatWorkingInput(k, v, fmt);
                  return (
                    <li key={k}>
                      {label}: {text}
                    </li>
                  );
                })}
              </ul>
            </dd>
          </>
        )}
        {explain.note && (
          <>
            <dt>Note</dt>
            <dd>{explain.note}</dd>
          </>
        )}
      </dl>
    </div>
  );
}
