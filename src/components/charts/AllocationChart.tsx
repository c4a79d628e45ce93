import { memo, useId } from 'react';
import { Bar, BarChart, CartesianGrid, Tooltip, XAxis, YAxis } from 'recharts';
import { CHART_COLOURS, SERIES_FILLS } from './palette';
import { niceTicks, tickDecimals } from './nice';
import { roundUp } from './CompositionChart';
import { useFormat } from '../format';

export interface AllocationRow {
  /** The stock's code. */
  label: string;
  /** Amount going to each series (grade), aligned with `series` [unit]. */
  amounts: number[];
  /** Supply left over [unit]; 0 when all is used or there is no supply. */
  unused: number;
}

export interface AllocationChartProps {
  rows: readonly AllocationRow[];
  /** Series names (grades), in stacking order. */
  series: readonly string[];
  /** Unit of the amounts, e.g. "t". */
  unit: string;
  /** Decimals of an amount in the tooltip and the text description (default 1; 0 for kg). */
  digits?: number;
  width: number;
  /** Title above the chart. */
  title: string;
}

const UNUSED_FILL = '#e4e0d6';

/** Where each limited stock goes: one horizontal bar per stock, stacked by grade, with the supply left over. */
export const AllocationChart = memo(function AllocationChart({ rows, series, unit, digits = 1, width, title }: AllocationChartProps) {
  const descId = useId();
  const f = useFormat();
  const data = rows.map((r) => {
    const d: Record<string, number | string> = { label: r.label, unused: r.unused };
    r.amounts.forEach((a, k) => (d[`s${k}`] = a));
    return d;
  });
  const max = roundUp(Math.max(1e-9, ...rows.map((r) => r.amounts.reduce((s, a) => s + a, 0) + r.unused)));
  const domain: [number, number] = [0, max];
  const ticks = niceTicks(domain, 5);
  const labelWidth = Math.min(110, 14 + 7 * Math.max(4, ...rows.map((r) => r.label.length)));
  const height = 40 + 34 * rows.length;
  const fill = (k: number) => SERIES_FILLS[k % SERIES_FILLS.length]!;
  const hasUnused = rows.some((r) => r.unused > 0);
  return (
    <figure className="chart" data-chart="allocation" style={{ width }}>
      <figcaption className="chart-title">{title}</figcaption>
      <ul className="chart-legend" aria-hidden="true">
        {series.map((s, k) => (
          <li key={s}>
            <span className="block" style={{ background: fill(k) }} /> {s}
          </li>
        ))}
        {hasUnused && (
          <li>
            <span className="block" style={{ background: UNUSED_FILL, boxShadow: 'inset 0 0 0 1px #9a9486' }} /> not needed
          </li>
        )}
      </ul>
      <div role="img" aria-label={title} aria-describedby={descId}>
        <BarChart accessibilityLayer={false} width={width} height={height} data={data} layout="vertical" margin={{ top: 4, right: 16, bottom: 4, left: 4 }}>
          <CartesianGrid stroke={CHART_COLOURS.grid} horizontal={false} />
          <XAxis
            type="number"
            domain={domain}
            ticks={ticks}
            allowDataOverflow
            unit={` ${unit}`}
            tickFormatter={(v: number) => f.num(v, tickDecimals(domain, 5))}
          />
          <YAxis type="category" dataKey="label" width={labelWidth} interval={0} tick={{ fontSize: 11 }} />
          <Tooltip isAnimationActive={false} formatter={(v) => `${f.num(Number(v), digits)} ${unit}`} />
          {series.map((s, k) => (
            <Bar key={s} dataKey={`s${k}`} name={s} stackId="use" fill={fill(k)} isAnimationActive={false} />
          ))}
          {hasUnused && <Bar dataKey="unused" name="not needed" stackId="use" fill={UNUSED_FILL} stroke="#9a9486" isAnimationActive={false} />}
        </BarChart>
      </div>
      <p id={descId} className="visually-hidden">
        {rows
          .map(
            (r) =>
              `${r.label}: ${r.amounts.map((a, k) => `${f.num(a, digits)} ${unit} to ${series[k]}`).join(', ')}` +
              (r.unused > 0 ? `, ${f.num(r.unused, digits)} ${unit} not needed` : ''),
          )
          .join('; ')}
      </p>
    </figure>
  );
});
