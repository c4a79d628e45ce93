import { memo, useId, useMemo } from 'react';
import { Area, CartesianGrid, ComposedChart, Line, ReferenceArea, Tooltip, XAxis, YAxis } from 'recharts';
import { CHART_COLOURS } from './palette';
import { plotBox } from './plot-box';
import { useFormat, type Formatter } from '../format';
import { niceDomain, niceTicks, tickDecimals } from './nice';
import { LiveDistributionMarks, useLiveMarksRelay, type DensityPoint, type LiveMarks } from './live';
import { RelayText } from '../relay';

export type { DensityPoint } from './live';

/** A band shaded on the chart [mm²/s] and the model's probability of a batch in it (0–1; from the context in live mode). */
export interface DistributionBand {
  min: number;
  max: number;
  probability?: number;
  label: string;
}

export interface BatchDistributionChartProps {
  /** The model's density of batch ν40 (normal in the blending coordinate); not used in live mode. */
  curve?: readonly DensityPoint[];
  /** The seeded Monte Carlo's histogram as a step outline (left edge of each bin, then the last right edge); not used in live mode. */
  histogram?: readonly DensityPoint[];
  /** The plant band and the ISO band [mm²/s] and the probability the model gives for each (0–1). */
  plantBand: DistributionBand;
  isoBand: DistributionBand;
  /** The simulation in words, e.g. "4,000 simulated batches, seed 1: 98.9 % in the solve band"; not used in live mode. */
  simulation?: string;
  /** Formats a probability for the captions (e.g. "99.0 %"). */
  formatPct: (p: number) => string;
  width: number;
  height: number;
  /**
   * Draw the curve, the histogram and the caption's numbers from {@link LiveMarksProvider}
   * (`distribution`) as live layers; the axes are then set by `xDomain` and `yMax`, so that the chart
   * keeps its props while the recipe is edited.
   */
  live?: boolean;
  /** ν40 axis range in live mode [mm²/s]. */
  xDomain?: readonly [number, number];
  /** Upper end of the density axis in live mode [per mm²/s]. */
  yMax?: number;
}

const CHART_TITLE = 'Batch ν40 under lot-to-lot spread of the stocks (model and simulation)';

/** The ν40 range the chart shows for a curve and histogram: theirs and the ISO band's, rounded out. */
export function distributionDomain(curve: readonly DensityPoint[], histogram: readonly DensityPoint[], isoBand: { min: number; max: number }): [number, number] {
  const xs = [...curve.map((p) => p.kv), ...histogram.map((p) => p.kv), isoBand.min, isoBand.max];
  return niceDomain(Math.min(...xs), Math.max(...xs));
}

/** The highest density of a curve and histogram [per mm²/s]. */
export function distributionPeak(curve: readonly DensityPoint[], histogram: readonly DensityPoint[]): number {
  return Math.max(1e-9, ...curve.map((p) => p.y), ...histogram.map((p) => p.y));
}

/**
 * Distribution of batch ν40 under lot-to-lot spread: the model's density (line), a seeded Monte Carlo
 * of the exact mixing rule drawn over it (shaded steps), the ISO band and the plant band shaded.
 */
export const BatchDistributionChart = memo(function BatchDistributionChart({
  curve = [],
  histogram = [],
  plantBand,
  isoBand,
  simulation = '',
  formatPct,
  width,
  height,
  live = false,
  xDomain: liveXDomain,
  yMax: liveYMax,
}: BatchDistributionChartProps) {
  const descId = useId();
  const f = useFormat();
  const xDomain = live && liveXDomain ? liveXDomain : distributionDomain(curve, histogram, isoBand);
  const xTicks = niceTicks(xDomain);
  const yMax = live && liveYMax ? liveYMax : distributionPeak(curve, histogram) * 1.08;
  const yDomain: [number, number] = [0, yMax];
  return (
    <figure className="chart" data-chart="batch-distribution" style={{ width }}>
      <figcaption className="chart-title">{CHART_TITLE}</figcaption>
      <div role="img" aria-label={CHART_TITLE} aria-describedby={descId} className="chart-plot" style={plotBox(height)}>
        <ComposedChart accessibilityLayer={false} width={width} height={height} margin={{ top: 8, right: 20, bottom: 28, left: 12 }}>
          <CartesianGrid stroke={CHART_COLOURS.grid} />
          <ReferenceArea x1={isoBand.min} x2={isoBand.max} fill={CHART_COLOURS.cold} fillOpacity={0.08} ifOverflow="extendDomain" />
          <ReferenceArea x1={plantBand.min} x2={plantBand.max} fill={CHART_COLOURS.candidate} fillOpacity={0.14} ifOverflow="extendDomain" />
          <XAxis
            type="number"
            dataKey="kv"
            domain={[...xDomain]}
            ticks={xTicks}
            allowDataOverflow
            tickFormatter={(v: number) => f.num(v, tickDecimals(xDomain))}
            label={{ value: 'batch ν40, mm²/s', position: 'insideBottom', offset: -18 }}
          />
          <YAxis type="number" dataKey="y" domain={yDomain} allowDataOverflow={live} tick={false} width={28} label={{ value: 'share of batches', angle: -90, position: 'insideLeft', offset: 8, style: { textAnchor: 'middle' } }} />
          {!live && <Tooltip isAnimationActive={false} cursor={false} formatter={(v) => [f.sig(Number(v), 3), 'density']} labelFormatter={(v) => `ν40 ${f.num(Number(v), 1)} mm²/s`} />}
          {!live && (
            <Area
              data={histogram as DensityPoint[]}
              dataKey="y"
              type="stepAfter"
              stroke={CHART_COLOURS.component}
              fill={CHART_COLOURS.component}
              fillOpacity={0.35}
              isAnimationActive={false}
              name="simulated batches"
            />
          )}
          {!live && <Line data={curve as DensityPoint[]} dataKey="y" stroke={CHART_COLOURS.frontier} strokeWidth={2} dot={false} activeDot={false} isAnimationActive={false} name="model" />}
          {live && <LiveDistributionMarks xDomain={xDomain} yDomain={yDomain} colours={LIVE_COLOURS} />}
        </ComposedChart>
      </div>
      <ul className="chart-legend" aria-hidden="true">
        <li><span className="swatch swatch-frontier" /> model</li>
        <li><span className="block block-sim" /> simulated batches</li>
        <li><span className="block block-plant" /> {plantBand.label}</li>
        <li><span className="block block-iso" /> {isoBand.label}</li>
      </ul>
      {live ? (
        <LiveNote id={descId} plantBand={plantBand} isoBand={isoBand} formatPct={formatPct} />
      ) : (
        <p id={descId} className="chart-note" data-testid="distribution-note">
          {distributionNote(plantBand, isoBand, simulation, formatPct, f)}
        </p>
      )}
    </figure>
  );
});

const LIVE_COLOURS = { histogram: CHART_COLOURS.component, curve: CHART_COLOURS.frontier } as const;

/** The chart's caption: the model's probabilities for both bands, then the simulation. */
function distributionNote(plantBand: DistributionBand, isoBand: DistributionBand, simulation: string, formatPct: (p: number) => string, f: Formatter): string {
  return (
    `Model: ${formatPct(plantBand.probability ?? NaN)} of batches in the ${plantBand.label} (${f.num(plantBand.min, 1)}–${f.num(plantBand.max, 1)} mm²/s), ` +
    `${formatPct(isoBand.probability ?? NaN)} in the ${isoBand.label} (${f.num(isoBand.min, 1)}–${f.num(isoBand.max, 1)} mm²/s). Simulation: ${simulation}.`
  );
}

/** The caption in live mode: its text follows the blend by itself (no React render per edit). */
function LiveNote({ id, plantBand, isoBand, formatPct }: { id: string; plantBand: DistributionBand; isoBand: DistributionBand; formatPct: (p: number) => string }) {
  const relay = useLiveMarksRelay();
  const f = useFormat();
  const select = useMemo(
    () => (m: LiveMarks) => {
      const live = m.distribution;
      return live
        ? distributionNote({ ...plantBand, probability: live.plantProbability }, { ...isoBand, probability: live.isoProbability }, live.simulation, formatPct, f)
        : '';
    },
    [plantBand, isoBand, formatPct, f],
  );
  return (
    <p id={id} className="chart-note" data-testid="distribution-note">
      <RelayText relay={relay} select={select} />
    </p>
  );
}
