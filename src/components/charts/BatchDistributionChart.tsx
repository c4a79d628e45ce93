import { memo, useId } from 'react';
import { Area, CartesianGrid, ComposedChart, Line, ReferenceArea, Tooltip, XAxis, YAxis } from 'recharts';
import { CHART_COLOURS } from './palette';
import { useFormat } from '../format';
import { niceDomain, niceTicks, tickDecimals } from './nice';

/** One point of a density curve or of the histogram's outline. */
export interface DensityPoint {
  /** ν40 [mm²/s]. */
  kv: number;
  /** Probability density [per mm²/s]. */
  y: number;
}

export interface BatchDistributionChartProps {
  /** The model's density of batch ν40 (normal in the blending coordinate). */
  curve: readonly DensityPoint[];
  /** The seeded Monte Carlo's histogram as a step outline (left edge of each bin, then the last right edge). */
  histogram: readonly DensityPoint[];
  /** The plant band and the ISO band [mm²/s] and the probability the model gives for each (0–1). */
  plantBand: { min: number; max: number; probability: number; label: string };
  isoBand: { min: number; max: number; probability: number; label: string };
  /** The simulation in words, e.g. "4,000 simulated batches, seed 1: 98.9 % in the solve band". */
  simulation: string;
  /** Formats a probability for the captions (e.g. "99.0 %"). */
  formatPct: (p: number) => string;
  width: number;
  height: number;
}

/**
 * Distribution of batch ν40 under lot-to-lot spread: the model's density (line), a seeded Monte Carlo
 * of the exact mixing rule drawn over it (shaded steps), the ISO band and the plant band shaded.
 */
export const BatchDistributionChart = memo(function BatchDistributionChart({
  curve,
  histogram,
  plantBand,
  isoBand,
  simulation,
  formatPct,
  width,
  height,
}: BatchDistributionChartProps) {
  const descId = useId();
  const f = useFormat();
  const xs = [...curve.map((p) => p.kv), ...histogram.map((p) => p.kv), isoBand.min, isoBand.max];
  const xDomain = niceDomain(Math.min(...xs), Math.max(...xs));
  const xTicks = niceTicks(xDomain);
  const yMax = Math.max(1e-9, ...curve.map((p) => p.y), ...histogram.map((p) => p.y));
  const yDomain: [number, number] = [0, yMax * 1.08];
  const title = 'Batch ν40 under lot-to-lot spread of the stocks (model and simulation)';
  return (
    <figure className="chart" data-chart="batch-distribution" style={{ width }}>
      <figcaption className="chart-title">{title}</figcaption>
      <div role="img" aria-label={title} aria-describedby={descId}>
        <ComposedChart width={width} height={height} margin={{ top: 8, right: 20, bottom: 28, left: 12 }}>
          <CartesianGrid stroke={CHART_COLOURS.grid} />
          <ReferenceArea x1={isoBand.min} x2={isoBand.max} fill={CHART_COLOURS.cold} fillOpacity={0.08} ifOverflow="extendDomain" />
          <ReferenceArea x1={plantBand.min} x2={plantBand.max} fill={CHART_COLOURS.candidate} fillOpacity={0.14} ifOverflow="extendDomain" />
          <XAxis
            type="number"
            dataKey="kv"
            domain={xDomain}
            ticks={xTicks}
            allowDataOverflow
            tickFormatter={(v: number) => f.num(v, tickDecimals(xDomain))}
            label={{ value: 'batch ν40, mm²/s', position: 'insideBottom', offset: -18 }}
          />
          <YAxis type="number" dataKey="y" domain={yDomain} tick={false} width={28} label={{ value: 'share of batches', angle: -90, position: 'insideLeft', offset: 8, style: { textAnchor: 'middle' } }} />
          <Tooltip isAnimationActive={false} cursor={false} formatter={(v) => [f.sig(Number(v), 3), 'density']} labelFormatter={(v) => `ν40 ${f.num(Number(v), 1)} mm²/s`} />
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
          <Line data={curve as DensityPoint[]} dataKey="y" stroke={CHART_COLOURS.frontier} strokeWidth={2} dot={false} activeDot={false} isAnimationActive={false} name="model" />
        </ComposedChart>
      </div>
      <ul className="chart-legend" aria-hidden="true">
        <li><span className="swatch swatch-frontier" /> model</li>
        <li><span className="block block-sim" /> simulated batches</li>
        <li><span className="block block-plant" /> {plantBand.label}</li>
        <li><span className="block block-iso" /> {isoBand.label}</li>
      </ul>
      <p id={descId} className="chart-note" data-testid="distribution-note">
        Model: {formatPct(plantBand.probability)} of batches in the {plantBand.label} ({f.num(plantBand.min, 1)}–{f.num(plantBand.max, 1)} mm²/s),{' '}
        {formatPct(isoBand.probability)} in the {isoBand.label} ({f.num(isoBand.min, 1)}–{f.num(isoBand.max, 1)} mm²/s). Simulation: {simulation}.
      </p>
    </figure>
  );
});
