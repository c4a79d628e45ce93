/**
 * The designer's charts (lazy chunk: recharts loads only when the designer shows them).
 *
 * The charts keep the same props while a fraction is typed: their axes and static series depend
 * only on the set of stocks and the reference recipe (and the distribution chart's on sticky axis
 * ranges). The blend itself — its D341 line, its point on the solvency–stability map, its composition
 * bars and its batch distribution — is passed through `LiveMarksProvider` and drawn by live layers
 * inside each chart, so an edit re-renders only those layers.
 */
import { useCallback, useLayoutEffect, useMemo, useRef, useState } from 'react';
import type { Component, Recipe } from '../../core/formulation/model';
import { componentsById, type Settings } from '../../state';
import { createRelay, useRelay, type Relay } from '../../components/relay';
import {
  BatchDistributionChart,
  batchDistributionFromCounts,
  distributionEdges,
  distributionDomain,
  distributionPeak,
  CompositionChart,
  LiveMarksProvider,
  SolvencyOxidationMap,
  ViscosityTemperatureChart,
  fittedRangeOf,
  roundUp,
  useWidth,
  type LiveMarks,
  type MapPoint,
  type ViscosityLineInput,
} from '../../components/charts';
import { makeFormatter, moneySymbol } from '../../components/format';
import { kv40kv100FromPoints } from '../../core/viscosity/viscosity-temperature';
import type { DraftView } from './derive';
import { predictRecipe, type Prediction } from './predict';
import { oxidationClass } from '../../core/scoring/oxidation';
import { recipeSpreadParts } from '../../core/qc/recipe-spread';
import { countBlendedLots, monteCarloLots, type MonteCarloLots } from '../../core/qc/monte-carlo';
import { fmtProbability } from './PropertiesPanel';

/** Batches simulated for the distribution chart, and the seed (the same picture every time). */
export const SIMULATED_BATCHES = 4000;
export const SIMULATION_SEED = 1;

export interface DesignerChartsProps {
  /** The draft's derived numbers (see draft-relays.ts); the prediction is always handed over with its view. */
  view: Relay<DraftView>;
  prediction: Relay<Prediction>;
  components: readonly Component[];
  referenceRecipe: Recipe | null;
  settings: Settings;
}

/** Oxidation rating axis, padded so that points at 1 and 5 are drawn whole. */
const OX_DOMAIN: readonly [number, number] = [0.75, 5.25];
const MAP_LEGEND = { selected: 'this blend', candidate: null } as const;
const formatOx = (v: number) => (Number.isInteger(v) ? `${v} ${oxidationClass(v)}` : '');

/** An axis maximum that changes only when the value outgrows it or falls well below it. */
function stickyMax(current: number, value: number): number {
  return value > current || value < current * 0.45 ? roundUp(Math.max(value * 1.05, 1e-3)) : current;
}

/**
 * An axis range that changes only when the range wanted leaves it or is well inside it (less than
 * 60 % of its span): while a fraction is typed, the axes keep still and only the marks move.
 */
function stickyDomain(cur: readonly [number, number] | null, wanted: readonly [number, number] | null): readonly [number, number] | null {
  if (wanted && (!cur || wanted[0] < cur[0] || wanted[1] > cur[1] || wanted[1] - wanted[0] < 0.6 * (cur[1] - cur[0]))) return wanted;
  return cur;
}

/** The charts' axes and bands: they change now and then while a fraction is typed, not at every edit. */
interface Axes {
  pctMax: number;
  costMax: number;
  /** The distribution chart's ν40 axis; null when there is no distribution to show. */
  distX: readonly [number, number] | null;
  distYMax: number;
  plantMin: number;
  plantMax: number;
  isoMin: number;
  isoMax: number;
}

const sameAxes = (a: Axes, b: Axes) =>
  a.pctMax === b.pctMax &&
  a.costMax === b.costMax &&
  a.distX === b.distX &&
  a.distYMax === b.distYMax &&
  Object.is(a.plantMin, b.plantMin) &&
  Object.is(a.plantMax, b.plantMax) &&
  Object.is(a.isoMin, b.isoMin) &&
  Object.is(a.isoMax, b.isoMax);

export default function DesignerCharts({ view, prediction, components, referenceRecipe, settings }: DesignerChartsProps) {
  const [ref, width] = useWidth<HTMLElement>(900);
  const fmt = useMemo(() => makeFormatter(settings), [settings]);
  const formatTemp = useCallback((c: number) => fmt.temp(c), [fmt]);
  const reference = useMemo(
    () =>
      referenceRecipe
        ? predictRecipe(referenceRecipe.lines, components, settings.blendMethod, {
            display: { decimalSeparator: settings.decimalSeparator, thousandsGrouping: settings.thousandsGrouping, temperatureUnit: settings.temperatureUnit },
          })
        : null,
    [referenceRecipe, components, settings.blendMethod, settings.decimalSeparator, settings.thousandsGrouping, settings.temperatureUnit],
  );

  // Everything static depends on the set of stocks, not on their fractions.
  const stockKey = useRelay(view, (v) => v.lines.map((l) => l.componentId).join('|'));
  const stocks = useMemo(() => {
    const byId = componentsById(components);
    return stockKey === '' ? [] : stockKey.split('|').flatMap((id) => byId.get(id) ?? []);
  }, [stockKey, components]);

  const vtLines = useMemo(() => {
    const out: ViscosityLineInput[] = [];
    for (const c of stocks) {
      if (c.category === 'additive-package') continue;
      try {
        const { kv40, kv100 } = kv40kv100FromPoints(c.viscosityPoints);
        out.push({ id: c.id, label: c.code, kv40, kv100, role: 'component', fittedC: fittedRangeOf(c.viscosityPoints), pourPointC: c.pourPoint });
      } catch {
        /* a stock without usable viscosities is left off the chart */
      }
    }
    if (reference?.ok) {
      out.push({
        id: 'reference',
        label: referenceRecipe?.name ?? 'reference',
        kv40: reference.kv40,
        kv100: reference.kv100,
        role: 'reference',
        pourPointC: reference.props.pourPoint,
      });
    }
    return out;
  }, [stocks, reference, referenceRecipe]);

  const refPoint = useMemo<MapPoint[]>(
    () =>
      reference?.ok && reference.anilinePoint !== null
        ? [{ id: 'reference', label: 'reference', role: 'reference', solvency: reference.anilinePoint, oxidation: reference.oxidationRating }]
        : [],
    [reference],
  );
  // The blend's aniline point lies between its stocks' (a volume-weighted mean), so their range fixes the axis.
  const apDomain = useMemo<readonly [number, number]>(() => {
    const aps = stocks.map((c) => c.anilinePoint).filter((a): a is number => a !== null);
    if (reference?.ok && reference.anilinePoint !== null) aps.push(reference.anilinePoint);
    const lo = Math.floor((Math.min(80, ...aps) - 5) / 10) * 10;
    const hi = Math.ceil((Math.max(140, ...aps) + 5) / 10) * 10;
    return [lo, hi];
  }, [stocks, reference]);

  const rowLabels = useMemo(
    () => stocks.map((c) => ({ id: c.id, label: c.code, massPct: 0, volumePct: 0, costPerLitre: 0 })),
    [stocks],
  );
  const formatPct = useCallback((p: number) => fmtProbability(p, fmt), [fmt]);

  // The blend itself follows each edit outside React's render: when a new prediction is handed over
  // (always with its view), the live marks are worked out here and handed to the live layers, which
  // update in the edit's own commit; the axes are state, set only when they move.
  const [live] = useState(() => createRelay<LiveMarks>({}));
  const kept = useRef<{ axes: Axes; lots: { key: string; components: readonly Component[]; method: string; lots: MonteCarloLots | null } | null }>({
    axes: { pctMax: 0, costMax: 0, distX: null, distYMax: 0, plantMin: NaN, plantMax: NaN, isoMin: NaN, isoMax: NaN },
    lots: null,
  });
  const marksOf = useCallback(
    (v: DraftView, p: Prediction): { marks: LiveMarks; axes: Axes } => {
      const k = kept.current;
      // Batch ν40 under lot spread: the model (from the prediction) and a seeded Monte Carlo of the exact
      // rule. The simulated lots depend only on the stocks in use, so they are drawn once per set of stocks
      // and blended again at each edit's fractions (the same batches as drawing afresh, to the last bit).
      const inBand = p.ok ? p.inBand : null;
      const usedLines = v.lines.filter((l) => l.massFraction > 0).map((l) => ({ componentId: l.componentId, massFraction: l.massFraction }));
      const usedKey = usedLines.map((l) => l.componentId).join('|');
      if (!k.lots || k.lots.key !== usedKey || k.lots.components !== components || k.lots.method !== settings.blendMethod) {
        let lots: MonteCarloLots | null;
        try {
          lots = monteCarloLots(recipeSpreadParts(components, usedLines), { samples: SIMULATED_BATCHES, seed: SIMULATION_SEED, method: settings.blendMethod });
        } catch {
          lots = null;
        }
        k.lots = { key: usedKey, components, method: settings.blendMethod, lots };
      }
      const lots = k.lots.lots;
      let distribution: (ReturnType<typeof batchDistributionFromCounts> & { share: number }) | null = null;
      if (inBand && lots && inBand.distribution.sdX > 0) {
        try {
          // Counted per bin and in the solve band in the blending coordinate (no ν40 per batch).
          const edges = distributionEdges(inBand.distribution, inBand.iso);
          const mc = countBlendedLots(lots, recipeSpreadParts(components, usedLines), edges, inBand.plant);
          distribution = { ...batchDistributionFromCounts(inBand.distribution, edges, mc.counts, mc.samples), share: mc.inBand / mc.samples };
        } catch {
          distribution = null;
        }
      }
      const a = k.axes;
      const wantedX = distribution ? distributionDomain(distribution.curve, distribution.histogram, inBand!.iso) : null;
      const axes: Axes = {
        pctMax: Math.min(100, stickyMax(a.pctMax, Math.max(1, ...v.lines.map((l) => 100 * Math.max(l.massFraction, l.volumeFraction))))),
        costMax: stickyMax(a.costMax, Math.max(1e-3, ...v.lines.map((l) => l.costPerLitre ?? 0))),
        distX: wantedX ? stickyDomain(a.distX, wantedX) : null,
        distYMax: stickyMax(a.distYMax, distribution ? distributionPeak(distribution.curve, distribution.histogram) : 0),
        plantMin: inBand?.plant.min ?? NaN,
        plantMax: inBand?.plant.max ?? NaN,
        isoMin: inBand?.iso.min ?? NaN,
        isoMax: inBand?.iso.max ?? NaN,
      };
      // The sticky ranges remember their last value even while there is no distribution to show.
      k.axes = sameAxes(a, axes) ? a : { ...axes, distX: axes.distX ?? a.distX };
      const marks: LiveMarks = {
        vt: p.ok ? { label: 'this blend', kv40: p.kv40, kv100: p.kv100, pourPointC: p.props.pourPoint } : null,
        point: p.ok && p.anilinePoint !== null ? { label: 'this blend', x: p.anilinePoint, y: p.oxidationRating } : null,
        bars: v.lines.map((l) => ({
          id: l.componentId,
          label: l.component?.code ?? l.componentId,
          massPct: l.massFraction * 100,
          volumePct: l.volumeFraction * 100,
          costPerLitre: l.costPerLitre ?? 0,
        })),
        distribution:
          distribution && inBand
            ? {
                curve: distribution.curve,
                histogram: distribution.histogram,
                plantProbability: inBand.plant.probability,
                isoProbability: inBand.iso.probability,
                simulation: `${fmt.num(SIMULATED_BATCHES, 0)} simulated batches (seed ${SIMULATION_SEED}), each stock's lot drawn and blended by the exact rule: ${formatPct(distribution.share)} in the solve band`,
              }
            : null,
      };
      return { marks, axes };
    },
    [components, settings.blendMethod, fmt, formatPct],
  );
  const [axes, setAxes] = useState<Axes>(() => marksOf(view.get(), prediction.get()).axes);
  useLayoutEffect(() => {
    const follow = () => {
      const { marks, axes: next } = marksOf(view.get(), prediction.get());
      live.set(marks);
      setAxes((cur) => (sameAxes(cur, next) ? cur : next));
    };
    follow();
    return prediction.subscribe(follow);
  }, [view, prediction, marksOf, live]);

  const { pctMax, costMax, distX, distYMax, plantMin, plantMax, isoMin, isoMax } = axes;
  const plantBand = useMemo(() => ({ min: plantMin, max: plantMax, label: 'solve band' }), [plantMin, plantMax]);
  const isoBand = useMemo(() => ({ min: isoMin, max: isoMax, label: 'ISO band' }), [isoMin, isoMax]);

  const full = Math.max(320, width);
  const half = full >= 900 ? Math.floor((full - 48) / 2) : full;

  return (
    <LiveMarksProvider source={live}>
      <section className="designer-charts" aria-label="Charts" ref={ref}>
        <h3>Charts</h3>
        <div className="chart-row">
          <ViscosityTemperatureChart
            lines={vtLines}
            live
            width={half}
            height={380}
            operatingTempC={settings.operatingTempC}
            coldStartTempC={settings.coldStartTempC}
            formatTemp={formatTemp}
            d341Form={settings.d341Form}
          />
          <SolvencyOxidationMap
            points={refPoint}
            live
            width={half}
            height={380}
            xLabel={`aniline point, ${fmt.tempUnit} (right = more solvent)`}
            xTemperature
            yLabel="oxidation-stability rating"
            xDomain={apDomain}
            xReversed
            yDomain={OX_DOMAIN}
            formatY={formatOx}
            legend={MAP_LEGEND}
            title="Solvency against oxidation stability (estimates on Blendbench's own scales)"
          />
        </div>
        <CompositionChart
          rows={rowLabels}
          live
          pctMax={pctMax}
          costMax={costMax}
          currency={moneySymbol(settings)}
          width={full}
          height={Math.max(140, 40 + rowLabels.length * 26)}
        />
        {distX && (
          <BatchDistributionChart
            live
            xDomain={distX}
            yMax={distYMax}
            plantBand={plantBand}
            isoBand={isoBand}
            formatPct={formatPct}
            width={full}
            height={260}
          />
        )}
      </section>
    </LiveMarksProvider>
  );
}
