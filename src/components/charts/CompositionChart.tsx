import { memo } from 'react';
import { Bar, BarChart, CartesianGrid, Legend, Tooltip, XAxis, YAxis } from 'recharts';
import { CHART_COLOURS } from './palette';
import { niceStep, niceTicks, tickDecimals } from './nice';

export interface CompositionRow {
  id: string;
  /** Short label (stock code). */
  label: string;
  /** Mass share [%]. */
  massPct: number;
  /** Volume share [%]. */
  volumePct: number;
  /** Contribution to the blend's cost [currency per litre of blend]. */
  costPerLitre: number;
}

export interface CompositionChartProps {
  rows: readonly CompositionRow[];
  /** Currency label for the cost axis, e.g. "EUR". */
  currency: string;
  width: number;
  height: number;
}

/** Composition (mass % and volume %) and cost contribution per component, side by side. */
export const CompositionChart = memo(function CompositionChart({ rows, currency, width, height }: CompositionChartProps) {
  const half = Math.floor((width - 16) / 2);
  const up = (v: number) => {
    const step = niceStep(v, 4);
    return Math.ceil(v / step - 1e-9) * step;
  };
  const pctDomain: [number, number] = [0, up(Math.max(1, ...rows.map((r) => Math.max(r.massPct, r.volumePct))))];
  const costDomain: [number, number] = [0, up(Math.max(1e-3, ...rows.map((r) => r.costPerLitre)))];
  const fullCostTicks = niceTicks(costDomain, 4);
  const data = rows.map((r) => ({ ...r, cost: r.costPerLitre }));
  const describe = rows
    .map((r) => `${r.label}: ${r.massPct.toFixed(1)} % by mass, ${r.volumePct.toFixed(1)} % by volume, ${r.costPerLitre.toFixed(3)} ${currency}/L`)
    .join('; ');
  const labelWidth = Math.min(110, 14 + 7 * Math.max(4, ...rows.map((r) => r.label.length)));
  return (
    <figure className="chart" data-chart="composition" style={{ width }}>
      <figcaption className="chart-title">Composition and cost contribution</figcaption>
      <div role="img" aria-label={`Composition and cost contribution. ${describe}`} className="chart-pair">
        <BarChart width={half} height={height} data={data} layout="vertical" margin={{ top: 4, right: 12, bottom: 4, left: 4 }}>
          <CartesianGrid stroke={CHART_COLOURS.grid} horizontal={false} />
          <XAxis type="number" unit=" %" domain={pctDomain} ticks={niceTicks(pctDomain, 4)} />
          <YAxis type="category" dataKey="label" width={labelWidth} interval={0} tick={{ fontSize: 11 }} />
          <Tooltip isAnimationActive={false} formatter={(v) => `${Number(v).toFixed(2)} %`} />
          <Legend verticalAlign="top" height={22} />
          <Bar dataKey="massPct" name="mass %" fill={CHART_COLOURS.mass} isAnimationActive={false} />
          <Bar dataKey="volumePct" name="volume %" fill={CHART_COLOURS.volume} isAnimationActive={false} />
        </BarChart>
        <BarChart width={half} height={height} data={data} layout="vertical" margin={{ top: 4, right: 12, bottom: 4, left: 4 }}>
          <CartesianGrid stroke={CHART_COLOURS.grid} horizontal={false} />
          <XAxis type="number" domain={costDomain} ticks={fullCostTicks} tickFormatter={(v: number) => v.toFixed(tickDecimals(costDomain, 4))} />
          <YAxis type="category" dataKey="label" width={labelWidth} interval={0} tick={{ fontSize: 11 }} />
          <Tooltip isAnimationActive={false} formatter={(v) => `${Number(v).toFixed(3)} ${currency}/L`} />
          <Legend verticalAlign="top" height={22} />
          <Bar dataKey="cost" name={`cost, ${currency} per litre of blend`} fill={CHART_COLOURS.cost} isAnimationActive={false} />
        </BarChart>
      </div>
    </figure>
  );
});
