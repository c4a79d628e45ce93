import { memo, useId, useMemo } from 'react';
import { Bar, BarChart, CartesianGrid, Tooltip, XAxis, YAxis } from 'recharts';
import { CHART_COLOURS } from './palette';
import { plotBox } from './plot-box';
import { niceStep, niceTicks, tickDecimals } from './nice';
import { LiveBars, useLiveMarksRelay, type LiveMarks } from './live';
import { RelayText } from '../relay';
import { useFormat, type Formatter } from '../format';

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
  /** One row per stock (in live mode only `id` and `label` are used: the values come from the context). */
  rows: readonly CompositionRow[];
  /** Currency label for the cost axis, e.g. "EUR". */
  currency: string;
  width: number;
  height: number;
  /**
   * Draw the bars from {@link LiveMarksProvider} (`bars`) as a live layer; the axes are then set by
   * `pctMax` and `costMax` so that the chart keeps its props while the recipe is edited.
   */
  live?: boolean;
  /** Upper end of the % axis in live mode. */
  pctMax?: number;
  /** Upper end of the cost axis in live mode [currency/L]. */
  costMax?: number;
}

/** Height of a legend line above each bar chart [px] (for the plot's placeholder size while it is off screen). */
const LEGEND_HEIGHT = 22;

/** Rounds up to a 1–2–5 step. */
export function roundUp(v: number): number {
  const step = niceStep(v, 10);
  return Math.ceil(v / step - 1e-9) * step;
}

/** Composition (mass % and volume %) and cost contribution per component, side by side. */
export const CompositionChart = memo(function CompositionChart({ rows, currency, width, height, live = false, pctMax, costMax }: CompositionChartProps) {
  const descId = useId();
  const f = useFormat();
  const half = Math.floor((width - 16) / 2);
  const pctDomain: [number, number] = [0, live && pctMax ? pctMax : roundUp(Math.max(1, ...rows.map((r) => Math.max(r.massPct, r.volumePct))))];
  const costDomain: [number, number] = [0, live && costMax ? costMax : roundUp(Math.max(1e-3, ...rows.map((r) => r.costPerLitre)))];
  const costTicks = niceTicks(costDomain, 4);
  const data = rows.map((r) => ({ id: r.id, label: r.label, massPct: r.massPct, volumePct: r.volumePct, cost: r.costPerLitre }));
  const labelWidth = Math.min(110, 14 + 7 * Math.max(4, ...rows.map((r) => r.label.length)));
  const margin = { top: 4, right: 12, bottom: 4, left: 4 };
  return (
    <figure className="chart" data-chart="composition" style={{ width }}>
      <figcaption className="chart-title">Composition and cost contribution</figcaption>
      <div role="img" aria-label="Composition and cost contribution" aria-describedby={descId} className="chart-pair chart-plot" style={plotBox(height + LEGEND_HEIGHT)}>
        <div>
          <ul className="chart-legend" aria-hidden="true">
            <li><span className="block block-mass" /> mass %</li>
            <li><span className="block block-volume" /> volume %</li>
          </ul>
          <BarChart accessibilityLayer={false} width={half} height={height} data={data} layout="vertical" margin={margin}>
            <CartesianGrid stroke={CHART_COLOURS.grid} horizontal={false} />
            <XAxis
              type="number"
              domain={pctDomain}
              ticks={niceTicks(pctDomain, 4)}
              tickFormatter={(v: number) => `${f.num(v, tickDecimals(pctDomain, 4))} %`}
              allowDataOverflow
            />
            <YAxis type="category" dataKey="label" width={labelWidth} interval={0} tick={{ fontSize: 11 }} />
            {!live && <Tooltip isAnimationActive={false} formatter={(v) => `${f.num(Number(v), 2)} %`} />}
            {!live && <Bar dataKey="massPct" name="mass %" fill={CHART_COLOURS.mass} isAnimationActive={false} />}
            {!live && <Bar dataKey="volumePct" name="volume %" fill={CHART_COLOURS.volume} isAnimationActive={false} />}
            {live && <LiveBars which="composition" domain={pctDomain} unit="%" />}
          </BarChart>
        </div>
        <div>
          <ul className="chart-legend" aria-hidden="true">
            <li><span className="block block-cost" /> cost, {currency} per litre of blend at 15 °C</li>
          </ul>
          <BarChart accessibilityLayer={false} width={half} height={height} data={data} layout="vertical" margin={margin}>
            <CartesianGrid stroke={CHART_COLOURS.grid} horizontal={false} />
            <XAxis type="number" domain={costDomain} ticks={costTicks} allowDataOverflow tickFormatter={(v: number) => f.num(v, tickDecimals(costDomain, 4))} />
            <YAxis type="category" dataKey="label" width={labelWidth} interval={0} tick={{ fontSize: 11 }} />
            {!live && <Tooltip isAnimationActive={false} formatter={(v) => `${f.num(Number(v), 3)} ${currency}/L at 15 °C`} />}
            {!live && <Bar dataKey="cost" name={`cost, ${currency} per litre of blend at 15 °C`} fill={CHART_COLOURS.cost} isAnimationActive={false} />}
            {live && <LiveBars which="cost" domain={costDomain} unit={`${currency}/L at 15 °C`} />}
          </BarChart>
        </div>
      </div>
      {live ? <LiveDescription id={descId} currency={currency} /> : <Description id={descId} rows={rows} currency={currency} />}
    </figure>
  );
});

function describe(rows: readonly Pick<CompositionRow, 'label' | 'massPct' | 'volumePct' | 'costPerLitre'>[], currency: string, f: Formatter): string {
  return rows
    .map((r) => `${r.label}: ${f.num(r.massPct, 1)} % by mass, ${f.num(r.volumePct, 1)} % by volume, ${f.num(r.costPerLitre, 3)} ${currency}/L at 15 °C`)
    .join('; ');
}

function Description({ id, rows, currency }: { id: string; rows: readonly CompositionRow[]; currency: string }) {
  const f = useFormat();
  return (
    <p id={id} className="visually-hidden">
      {describe(rows, currency, f)}
    </p>
  );
}

/** The description in live mode: its text follows the blend by itself (no React render per edit). */
function LiveDescription({ id, currency }: { id: string; currency: string }) {
  const relay = useLiveMarksRelay();
  const f = useFormat();
  const select = useMemo(() => (m: LiveMarks) => describe(m.bars ?? [], currency, f), [currency, f]);
  return (
    <p id={id} className="visually-hidden">
      <RelayText relay={relay} select={select} />
    </p>
  );
}
