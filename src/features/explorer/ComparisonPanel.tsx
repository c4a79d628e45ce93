import { signedText } from '../../core/words/signed';
import { unenteredStocks } from '../../core/formulation/entered-values';
import { memo, useMemo, useState, type ReactNode } from 'react';
import type { BlendTargets, Component, Recipe, RecipeLine } from '../../core/formulation/model';
import type { SubstituteCandidate } from '../../core/search/substitutes';
import { OXIDATION_CLASS_LABEL, oxidationClass } from '../../core/scoring/oxidation';
import { SOLVENCY_BAND_LABEL } from '../../core/scoring/solvency';
import { DEPOSIT_PROPENSITY_LABEL } from '../../core/scoring/deposit';
import { probabilityText, useFormat, type Formatter } from '../../components/format';
import type { InBandOf } from './in-band';
import { MethodNote } from '../../components/notices';
import type { Settings } from '../../state';
import { compareRecipes } from '../../core/formulation/comparison';
import { explainDeposit } from '../../core/scoring/deposit';
import { describeRate, rateDecimals, unpricedMessage, type ExchangeRate, type UnpricedStock } from '../../core/currency/exchange-rates';
import { assess, type Assessed } from './compare';
import { combinationTradeOff, type TradeOff } from './tradeoff';
import { D341_TRUSTED_BAND_C } from '../../core/viscosity/viscosity-temperature';

interface Row {
  label: string;
  ref: ReactNode;
  cand: ReactNode;
  change: ReactNode;
  /** 'better' / 'worse' colour the change; undefined = neutral. */
  tone?: 'better' | 'worse' | undefined;
}

function delta(a: number | null | undefined, b: number | null | undefined, fmt: Formatter, digits: number, unit = ''): string {
  if (a === null || a === undefined || b === null || b === undefined) return '—';
  return `${signedText(b - a, digits, fmt.num)}${unit}`;
}

function tone(d: number | null, lowerIsBetter: boolean): 'better' | 'worse' | undefined {
  if (d === null || Math.abs(d) < 1e-9) return undefined;
  return (d < 0) === lowerIsBetter ? 'better' : 'worse';
}

/** A recipe's stocks by share, largest first, each flagged when withdrawn or limited (as in the candidate table). */
export function lineList(lines: readonly RecipeLine[], byId: ReadonlyMap<string, Component>, fmt: Formatter): ReactNode {
  return (
    <ul className="mini-recipe">
      {lines
        .filter((l) => l.massFraction > 0)
        .sort((a, b) => b.massFraction - a.massFraction)
        .map((l) => {
          const c = byId.get(l.componentId);
          return (
            <li key={l.componentId}>
              <span className="code">{c?.code ?? l.componentId}</span> {fmt.num(l.massFraction * 100, 1)} %
              {c?.availability === 'withdrawn' ? <span className="tag tag-bad"> withdrawn</span> : null}
              {c?.availability === 'limited' ? <span className="tag tag-limited">limited</span> : null}
            </li>
          );
        })}
    </ul>
  );
}

/**
 * The comparison's rows. `polymerCap` (mass fraction) is the cap the polymer share is held against:
 * the search's, or the common-practice default when the search had none.
 */
export function comparisonRows(ref: Assessed | null, cand: Assessed | null, fmt: Formatter, polymerCap: number, base: string | null = null): Row[] {
  const r = ref?.props;
  const c = cand?.props;
  const rows: Row[] = [];
  // A cost is shown (and compared) only in the base currency: a recipe holding a stock without an
  // exchange rate is "not costed", never printed with the base currency's symbol.
  const inBase = (p: Assessed['props'] | undefined): number | null =>
    p?.costPerLitre != null && (base === null || p.currency === base) ? p.costPerLitre : null;
  const costText = (p: Assessed['props'] | undefined): string =>
    inBase(p) !== null ? fmt.money(inBase(p), 3) : p?.costPerLitre != null && base !== null ? `not costed in ${base}` : fmt.money(null, 3);
  const rCost = inBase(r);
  const cCost = inBase(c);
  const costD = rCost !== null && cCost !== null ? cCost - rCost : null;
  rows.push({
    label: `Cost per litre at 15 °C`,
    ref: costText(r),
    cand: costText(c),
    change: costD === null || !rCost ? '—' : `${delta(rCost, cCost, fmt, 3)} (${costD > 0 ? '+' : ''}${fmt.num((100 * costD) / rCost, 1)} %)`,
    tone: tone(costD, true),
  });
  // Per delivered litre, at the delivery temperature of the settings (the core's figure, as on the
  // designer and the blend sheet's costing copy).
  const delivered = (p: Assessed['props'] | undefined): number | null =>
    p?.costPerDeliveredLitre && (base === null || p.currency === base) ? p.costPerDeliveredLitre.cost : null;
  const deliveredText = (p: Assessed['props'] | undefined): string =>
    delivered(p) !== null ? fmt.money(delivered(p), 3) : p?.costPerDeliveredLitre && base !== null ? `not costed in ${base}` : fmt.money(null, 3);
  const rDel = delivered(r);
  const cDel = delivered(c);
  const delD = rDel !== null && cDel !== null ? cDel - rDel : null;
  const deliveryTempC = r?.costPerDeliveredLitre?.tempC ?? c?.costPerDeliveredLitre?.tempC ?? null;
  if (deliveryTempC !== null) {
    rows.push({
      label: `Cost per delivered litre at ${fmt.temp(deliveryTempC)}`,
      ref: deliveredText(r),
      cand: deliveredText(c),
      change: delD === null || !rDel ? '—' : `${delta(rDel, cDel, fmt, 3)} (${delD > 0 ? '+' : ''}${fmt.num((100 * delD) / rDel, 1)} %)`,
      tone: tone(delD, true),
    });
  }
  rows.push({ label: 'ν40, mm²/s', ref: fmt.num(r?.kv40, 1), cand: fmt.num(c?.kv40, 1), change: delta(r?.kv40, c?.kv40, fmt, 1) });
  rows.push({ label: 'ν100, mm²/s', ref: fmt.num(r?.kv100, 2), cand: fmt.num(c?.kv100, 2), change: delta(r?.kv100, c?.kv100, fmt, 2) });
  const viD = r?.vi != null && c?.vi != null ? c.vi - r.vi : null;
  rows.push({ label: 'Viscosity index', ref: fmt.num(r?.reportedVi, 0), cand: fmt.num(c?.reportedVi, 0), change: delta(r?.vi, c?.vi, fmt, 1), tone: tone(viD, false) });
  const rAp = r?.anilinePoint?.value ?? null;
  const cAp = c?.anilinePoint?.value ?? null;
  rows.push({
    label: 'Aniline point',
    ref: fmt.temp(rAp, 1),
    cand: fmt.temp(cAp, 1),
    change: rAp === null || cAp === null ? '—' : `${delta(fmt.tempValue(rAp), fmt.tempValue(cAp), fmt, 1)} ${fmt.tempUnit}`,
    tone: tone(rAp === null || cAp === null ? null : cAp - rAp, true),
  });
  rows.push({
    label: 'Solvency',
    ref: ref?.deposit ? SOLVENCY_BAND_LABEL[ref.deposit.solvency.band] : '—',
    cand: cand?.deposit ? SOLVENCY_BAND_LABEL[cand.deposit.solvency.band] : '—',
    change: ref?.deposit && cand?.deposit ? scoreChange(ref.deposit.solvency.score, cand.deposit.solvency.score) : '—',
    tone: ref?.deposit && cand?.deposit ? tone(cand.deposit.solvency.score - ref.deposit.solvency.score, false) : undefined,
  });
  const rOx = r?.oxidationRating ?? null;
  const cOx = c?.oxidationRating ?? null;
  rows.push({
    label: 'Oxidation stability',
    ref: rOx === null ? '—' : `${OXIDATION_CLASS_LABEL[oxidationClass(rOx)]} (${fmt.num(rOx, 1)})`,
    cand: cOx === null ? '—' : `${OXIDATION_CLASS_LABEL[oxidationClass(cOx)]} (${fmt.num(cOx, 1)})`,
    change: delta(rOx, cOx, fmt, 1),
    tone: tone(rOx === null || cOx === null ? null : cOx - rOx, false),
  });
  const rank = { low: 0, moderate: 1, elevated: 2 } as const;
  rows.push({
    label: 'Deposit propensity',
    ref: ref?.deposit ? DEPOSIT_PROPENSITY_LABEL[ref.deposit.propensity] : '—',
    cand: cand?.deposit ? DEPOSIT_PROPENSITY_LABEL[cand.deposit.propensity] : '—',
    change: ref?.deposit && cand?.deposit ? (ref.deposit.propensity === cand.deposit.propensity ? 'same' : `${ref.deposit.propensity} → ${cand.deposit.propensity}`) : '—',
    tone: ref?.deposit && cand?.deposit ? tone(rank[cand.deposit.propensity] - rank[ref.deposit.propensity], true) : undefined,
  });
  // A temperature outside the measured 40–100 °C is an extrapolation along the D341 line; outside −20…150 °C
  // it is not to be trusted (core assessTemperature) — the label says so.
  const flag = (a: { extrapolated: boolean; outsideBand: boolean }) =>
    a.outsideBand
      ? `; outside ${fmt.temp(D341_TRUSTED_BAND_C.min)}…${fmt.temp(D341_TRUSTED_BAND_C.max)}, not to be trusted`
      : a.extrapolated
        ? '; extrapolated'
        : '';
  if (r?.kvAtOperating || c?.kvAtOperating) {
    const at = (r?.kvAtOperating ?? c?.kvAtOperating)!;
    rows.push({
      label: `ν at ${fmt.temp(at.tempC)} (operating${flag(at)}), mm²/s`,
      ref: fmt.sig(r?.kvAtOperating?.kv, 3),
      cand: fmt.sig(c?.kvAtOperating?.kv, 3),
      change: pctChange(r?.kvAtOperating?.kv, c?.kvAtOperating?.kv, fmt),
    });
  }
  if (r?.kvAtCold || c?.kvAtCold) {
    const cd = r?.kvAtCold && c?.kvAtCold ? c.kvAtCold.kv - r.kvAtCold.kv : null;
    const at = (r?.kvAtCold ?? c?.kvAtCold)!;
    rows.push({
      label: `ν at ${fmt.temp(at.tempC)} (cold start${flag(at)}), mm²/s`,
      ref: fmt.sig(r?.kvAtCold?.kv, 3),
      cand: fmt.sig(c?.kvAtCold?.kv, 3),
      change: pctChange(r?.kvAtCold?.kv, c?.kvAtCold?.kv, fmt),
      tone: tone(cd, true),
    });
  }
  const shearText = (a: Assessed | null) =>
    !a?.shear ? '—' : a.shear.unchanged ? 'yes (no polymer loss)' : `${a.shear.inGradeAfter ? 'yes' : 'NO'} (ν40 ${fmt.num(a.shear.kv40After, 1)})`;
  rows.push({ label: 'In grade after shear', ref: shearText(ref), cand: shearText(cand), change: '' });
  const poly = (w: number | undefined): ReactNode =>
    w === undefined ? (
      '—'
    ) : (
      <>
        {fmt.num(w * 100, 1)}
        {w > polymerCap + 1e-6 && <span className="tag tag-bad"> above the {fmt.num(polymerCap * 100, 0)} % cap</span>}
      </>
    );
  rows.push({
    label: 'Polymer thickener, mass %',
    ref: poly(r?.polymerFraction),
    cand: poly(c?.polymerFraction),
    change: r && c ? delta(r.polymerFraction * 100, c.polymerFraction * 100, fmt, 1) : '—',
    tone: r && c ? tone(c.polymerFraction - r.polymerFraction, true) : undefined,
  });
  rows.push({ label: `Density at 15 °C, kg/L`, ref: fmt.num(r?.density15, 4), cand: fmt.num(c?.density15, 4), change: delta(r?.density15, c?.density15, fmt, 4) });
  return rows;
}

/** The probability rows: in the plant band (the search's band) and in the ISO band, reference and candidate. */
export function inBandRows(
  inBand: { reference: { plant: number; iso: number } | null; candidate: { plant: number; iso: number } | null } | null,
  fmt: Formatter,
): Row[] {
  if (!inBand) return [];
  const p = (x: number | undefined) => (x === undefined ? '—' : probabilityText(x, (v, d) => fmt.num(v, d)));
  // A change below 0.05 points does not show at the one decimal printed: 'same', without a tone.
  const same = (a: number, b: number) => Math.abs(b - a) < 0.0005;
  const pts = (a: number | undefined, b: number | undefined) =>
    a === undefined || b === undefined ? '—' : same(a, b) ? 'same' : `${b - a >= 0 ? '+' : '−'}${fmt.num(Math.abs(b - a) * 100, 1)} points`;
  const toneOf = (a: number | undefined, b: number | undefined) => (a === undefined || b === undefined || same(a, b) ? undefined : tone(b - a, false));
  const r = inBand.reference ?? undefined;
  const c = inBand.candidate ?? undefined;
  return [
    { label: 'Batches in the plant band (lot spread)', ref: p(r?.plant), cand: p(c?.plant), change: pts(r?.plant, c?.plant), tone: toneOf(r?.plant, c?.plant) },
    { label: 'Batches in the ISO band (lot spread)', ref: p(r?.iso), cand: p(c?.iso), change: pts(r?.iso, c?.iso), tone: toneOf(r?.iso, c?.iso) },
  ];
}

/** "+0.006 EUR/L at 15 °C buys 99.0 % instead of 50.2 % in the plant band (the same stocks without it: 1.146 EUR/L at 15 °C)" — in the user's temperature unit. */
export function premiumSentence(b: InBandOf, costPerLitre: number, fmt: Formatter): string {
  const n = b.nominal!;
  const d = costPerLitre - n.costPerLitre;
  const p = (x: number) => probabilityText(x, (v, k) => fmt.num(v, k));
  const cur = fmt.settings.currencySymbol;
  const at = '15 °C'; // the volume tables' reference, named so in every unit
  return (
    `${d >= 0 ? '+' : '−'}${fmt.num(Math.abs(d), 3)} ${cur}/L at ${at} buys ${p(b.plant)} instead of ${p(n.probability)} of batches in the plant band ` +
    `(the same stocks without that condition: ${fmt.num(n.costPerLitre, 3)} ${cur}/L at ${at}).`
  );
}

function scoreChange(a: number, b: number): string {
  if (a === b) return 'same band';
  return `${b > a ? '+' : '−'}${Math.abs(b - a)} band${Math.abs(b - a) > 1 ? 's' : ''}`;
}

function pctChange(a: number | undefined, b: number | undefined, fmt: Formatter): string {
  if (a === undefined || b === undefined || a === 0) return '—';
  return `${signedText((100 * (b - a)) / a, 1, fmt.num)} %`;
}

/** The selected candidate beside the reference recipe, and the Adopt action. */
export const ComparisonPanel = memo(function ComparisonPanel({
  reference,
  candidate,
  components,
  targets,
  refAssessed,
  settings,
  inBand = null,
  adoptedName,
  adoptBlocked = null,
  adoptRefused = null,
  onAdopt,
  polymerCap,
  pricing,
}: {
  reference: Recipe;
  candidate: SubstituteCandidate;
  /** Targets of the search, for the trade-off sweep. */
  targets: BlendTargets;
  components: readonly Component[];
  refAssessed: Assessed | null;
  settings: Settings;
  /**
   * Probabilities in the plant and ISO bands of the reference and the candidate (lot spread), the
   * candidate's nominal recipe for the premium, and the minimum the search asked for.
   */
  inBand?: { reference: { plant: number; iso: number } | null; candidate: InBandOf | null; minimum: number | null } | null;
  adoptedName: string | null;
  /** Why the candidate cannot be adopted now (a stale result), or null. */
  adoptBlocked?: string | null;
  /** Why the last Adopt was refused (nothing was saved), or null. */
  adoptRefused?: string | null;
  onAdopt: () => void;
  /** Polymer cap to warn against (mass fraction; the search's cap, or the common-practice default when it has none). */
  polymerCap: number;
  /**
   * The base currency, the exchange rates behind the costs of both recipes and their stocks without
   * a rate (stated under the table, as on a costing copy).
   */
  pricing: { base: string; ratesUsed: readonly ExchangeRate[]; unpriced: readonly UnpricedStock[] };
}) {
  const fmt = useFormat();
  const byId = useMemo(() => new Map(components.map((c) => [c.id, c])), [components]);
  const candAssessed = useMemo(
    () =>
      assess(components, candidate.lines, {
        method: settings.blendMethod,
        grade: reference.grade,
        operatingTempC: settings.operatingTempC,
        coldTempC: settings.coldStartTempC,
        d341Form: settings.d341Form,
        deliveryTempC: settings.deliveryTempC,
      }),
    [components, candidate, settings.blendMethod, settings.d341Form, settings.operatingTempC, settings.coldStartTempC, settings.deliveryTempC, reference.grade],
  );
  const rows = [...comparisonRows(refAssessed, candAssessed, fmt, polymerCap, pricing.base), ...inBandRows(inBand ?? null, fmt)];
  const premium = inBand?.candidate?.nominal && inBand.minimum !== null ? inBand.candidate : null;
  const summary = useMemo(() => {
    // A reference holding a stock whose values are not yet entered is not predicted: nothing to compare.
    if (unenteredStocks(reference.lines, components).length > 0) return [];
    try {
      return compareRecipes({
        components,
        reference: reference.lines.filter((l) => l.massFraction > 0),
        candidate: candidate.lines,
        grade: reference.grade,
        operatingTempC: settings.operatingTempC,
        coldTempC: settings.coldStartTempC,
        method: settings.blendMethod,
        d341Form: settings.d341Form,
        display: { formatNumber: (x, d) => fmt.num(x, d), temperatureUnit: settings.temperatureUnit },
      }).summary;
    } catch {
      return [];
    }
  }, [components, reference, candidate, settings.operatingTempC, settings.coldStartTempC, settings.blendMethod, settings.d341Form, settings.temperatureUnit, fmt]);
  return (
    <section className="comparison" aria-labelledby="cmp-h" data-testid="comparison">
      <h3 id="cmp-h">Candidate {candidate.rank} beside the reference</h3>
      <MethodNote method={settings.blendMethod} d341Form={settings.d341Form} />
      {summary.length > 0 && (
        <ul className="cmp-summary" data-testid="comparison-summary">
          {summary.map((line) => (
            <li key={line}>{line}</li>
          ))}
        </ul>
      )}
      <table className="data-table cmp-table">
        <thead>
          <tr>
            <th scope="col">Property</th>
            <th scope="col">Reference</th>
            <th scope="col">Candidate {candidate.rank}</th>
            <th scope="col">Change</th>
          </tr>
        </thead>
        <tbody>
          <tr>
            <th scope="row">Recipe</th>
            <td>{lineList(reference.lines, byId, fmt)}</td>
            <td>{lineList(candidate.lines, byId, fmt)}</td>
            <td />
          </tr>
          {rows.map((r) => (
            <tr key={r.label}>
              <th scope="row">{r.label}</th>
              <td className="num">{r.ref}</td>
              <td className="num">{r.cand}</td>
              <td className={`num ${r.tone ?? ''}`}>{r.change}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {premium && (
        <p className="premium-note" data-testid="comparison-premium">
          {premiumSentence(premium, candidate.costPerLitre, fmt)}
        </p>
      )}
      {(pricing.ratesUsed.length > 0 || pricing.unpriced.length > 0) && (
        <p className="small" data-testid="comparison-pricing">
          {pricing.ratesUsed.length > 0 &&
            `Prices converted at ${pricing.ratesUsed.map((x) => describeRate(x, pricing.base, (v) => fmt.num(v, rateDecimals(v)))).join('; ')}. `}
          {pricing.unpriced.length > 0 && unpricedMessage(pricing.unpriced, pricing.base)}
        </p>
      )}
      {candAssessed?.deposit && <p className="deposit-note">{explainDeposit(candAssessed.deposit, fmt.settings)}</p>}
      <TradeOffSection key={`${candidate.key}|${settings.blendMethod}`} candidate={candidate} components={components} byId={byId} targets={targets} settings={settings} />
      <div className="adopt-row">
        <button type="button" className="primary" onClick={onAdopt} disabled={adoptedName !== null || adoptBlocked !== null} aria-describedby={adoptBlocked && !adoptedName ? 'adopt-blocked' : undefined}>
          {adoptedName ? 'Adopted' : 'Adopt as a new recipe'}
        </button>
        {adoptBlocked && !adoptedName && (
          <p id="adopt-blocked" className="muted">
            {adoptBlocked}
          </p>
        )}
        {adoptRefused && !adoptedName && (
          <p className="field-msg field-error" role="alert" data-testid="adopt-refused">
            {adoptRefused}
          </p>
        )}
        {adoptedName && (
          <p role="status" data-testid="adopted">
            Saved as “{adoptedName}”. <a href="#/designer">Open it in the recipe designer</a> to fine-tune it, or print its blend sheet.
          </p>
        )}
      </div>
    </section>
  );
});

/** On demand: the cost–aniline trade-off of the candidate's own combination, as a table. */
function TradeOffSection({
  candidate,
  components,
  byId,
  targets,
  settings,
}: {
  candidate: SubstituteCandidate;
  components: readonly Component[];
  byId: ReadonlyMap<string, Component>;
  targets: BlendTargets;
  settings: Settings;
}) {
  const fmt = useFormat();
  const [result, setResult] = useState<TradeOff | null>(null);
  const codes = candidate.componentIds.map((id) => byId.get(id)?.code ?? id).join(' + ');
  return (
    <section className="tradeoff" aria-labelledby="tradeoff-h" data-testid="tradeoff">
      <h4 id="tradeoff-h">Cost–solvency trade-off</h4>
      {result === null ? (
        <button type="button" onClick={() => setResult(combinationTradeOff(components, targets, candidate.componentIds, settings.blendMethod, fmt))}>
          Cost–solvency trade-off of this combination
        </button>
      ) : result.kind === 'error' ? (
        <p role="alert">The trade-off could not be computed: {result.message}</p>
      ) : result.points.length === 0 ? (
        <p role="status">This combination cannot meet the targets, so it has no trade-off to show.</p>
      ) : (
        <>
          <p className="muted" role="status">
            {result.points.length === 1
              ? `For ${codes}, the least-cost blend is also the most solvent one: there is no trade-off, one point.`
              : `Least-cost blend of ${codes} at each aniline-point limit, from its cheapest blend to its most solvent one (${result.points.length} points).`}
          </p>
          <table className="data-table tradeoff-table">
            <caption className="muted">
              Estimates. The aniline point is a volume-basis approximation over the parts that have one, not a measured value.
            </caption>
            <thead>
              <tr>
                <th scope="col">Cost per litre at 15 °C</th>
                <th scope="col">Aniline point</th>
                <th scope="col">ν40, mm²/s</th>
                <th scope="col">Recipe</th>
              </tr>
            </thead>
            <tbody>
              {result.points.map((p, i) => (
                <tr key={i}>
                  <td className="num">{fmt.money(p.costPerLitre, 3)}</td>
                  <td className="num">{fmt.temp(p.anilinePoint, 1)}</td>
                  <td className="num">{fmt.num(p.kv40, 1)}</td>
                  <td>
                    {p.lines
                      .map((l) => `${byId.get(l.componentId)?.code ?? l.componentId} ${fmt.num(l.massFraction * 100, 1)} %`)
                      .join(', ')}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </>
      )}
    </section>
  );
}
