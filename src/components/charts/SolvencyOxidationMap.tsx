import { memo } from 'react';
import { CartesianGrid, Cell, ReferenceArea, Scatter, ScatterChart, Tooltip, XAxis, YAxis, ZAxis } from 'recharts';
import { CHART_COLOURS } from './palette';
import { plotBox } from './plot-box';
import { niceDomain, niceTicks, tickDecimals } from './nice';
import { useFormat } from '../format';
import { LiveMapPoint } from './live';

export interface MapPoint {
  id: string;
  label: string;
  role: 'reference' | 'candidate' | 'selected';
  /** Solvency measure for the x axis (a score, or the aniline point with `xReversed`). */
  solvency: number;
  /** Oxidation-stability measure for the y axis (higher = more stable), on the app's own scale. */
  oxidation: number;
}

export interface SolvencyOxidationMapProps {
  points: readonly MapPoint[];
  width: number;
  height: number;
  xLabel?: string;
  yLabel?: string;
  xDomain?: readonly [number, number];
  yDomain?: readonly [number, number];
  /** Label for a y value (e.g. class names); default the number. */
  formatY?: (v: number) => string;
  /** Optional shaded region where varnish risk is high (low solvency, high stability). */
  riskRegion?: { x: readonly [number, number]; y: readonly [number, number]; label: string } | null;
  /** Draw the x axis high-to-low (e.g. aniline point, where lower means more solvent). */
  xReversed?: boolean;
  /** Label for an x value; default the number in the user's format. */
  formatX?: (v: number) => string;
  /**
   * The x values (points, domain, live point) are temperatures in °C: the axis shows them in the
   * user's unit, at round values of that unit.
   */
  xTemperature?: boolean;
  title?: string;
  /** Also draw the blend from {@link LiveMarksProvider} (`point`) as a live layer. */
  live?: boolean;
  /** Legend wording; `candidate: null` leaves that entry out. */
  legend?: { selected?: string; candidate?: string | null };
}

const FILL: Record<MapPoint['role'], string> = {
  reference: CHART_COLOURS.reference,
  candidate: CHART_COLOURS.component,
  selected: CHART_COLOURS.candidate,
};

/** Solvency against oxidation stability: where each candidate sits relative to the reference. */
export const SolvencyOxidationMap = memo(function SolvencyOxidationMap({
  points,
  width,
  height,
  xLabel = 'solvency score',
  yLabel = 'oxidation-stability score',
  xDomain = [0, 100],
  yDomain = [0, 100],
  formatY,
  riskRegion = null,
  xReversed = false,
  formatX,
  xTemperature = false,
  live = false,
  legend = {},
  title = 'Solvency against oxidation stability (estimated scores, not measurements)',
}: SolvencyOxidationMapProps) {
  const f = useFormat();
  const toX = xTemperature ? f.tempValue : (v: number) => v;
  // In °F the converted ends are rounded out to round values of the user's unit.
  const shownX: readonly [number, number] = xTemperature && f.tempUnit !== '°C' ? niceDomain(toX(xDomain[0]), toX(xDomain[1]), 0) : xDomain;
  const xTicks = niceTicks(shownX);
  const xFormat = formatX ?? ((v: number) => f.num(v, tickDecimals(shownX)));
  // `kind`, not `role`: recharts copies point fields onto the SVG shape, and role="reference" is no ARIA role.
  const data = points.map(({ role, ...p }) => ({ ...p, kind: role, x: toX(p.solvency), y: p.oxidation }));
  const describe = points.map((p) => `${p.label}: ${xLabel} ${f.num(toX(p.solvency), 1)}, ${yLabel} ${f.num(p.oxidation, 1)}`).join('; ');
  return (
    <figure className="chart" data-chart="solvency-oxidation" style={{ width }}>
      <figcaption className="chart-title">{title}</figcaption>
      <div role="img" aria-label={`${title}. ${describe}`} className="chart-plot" style={plotBox(height)}>
        <ScatterChart accessibilityLayer={false} width={width} height={height} margin={{ top: 12, right: 20, bottom: 28, left: formatY ? 84 : 36 }}>
          <CartesianGrid stroke={CHART_COLOURS.grid} />
          {riskRegion && (
            <ReferenceArea
              x1={toX(riskRegion.x[0])}
              x2={toX(riskRegion.x[1])}
              y1={riskRegion.y[0]}
              y2={riskRegion.y[1]}
              fill={CHART_COLOURS.hot}
              fillOpacity={0.08}
              label={{ value: riskRegion.label, position: 'insideTopLeft', fontSize: 11, fill: CHART_COLOURS.hot }}
            />
          )}
          <XAxis
            type="number"
            dataKey="x"
            domain={[...shownX]}
            reversed={xReversed}
            allowDataOverflow
            ticks={xTicks}
            name={xLabel}
            tickFormatter={xFormat}
            label={{ value: xLabel, position: 'insideBottom', offset: -18 }}
          />
          <YAxis
            type="number"
            dataKey="y"
            domain={[...yDomain]}
            allowDataOverflow
            name={yLabel}
            width={formatY ? 100 : 60}
            tickFormatter={formatY ?? ((v: number) => f.num(v, tickDecimals(yDomain)))}
            ticks={formatY ? integerTicks(yDomain) : niceTicks(yDomain)}
            label={{ value: yLabel, angle: -90, position: 'left', offset: formatY ? 12 : 0, style: { textAnchor: 'middle' } }}
          />
          <ZAxis range={[60, 60]} />
          <Tooltip isAnimationActive={false} cursor={false} formatter={(v, n) => [f.num(Number(v), 1), String(n)]} />
          <Scatter data={data} name="blends" isAnimationActive={false}>
            {data.map((p) => (
              <Cell
                key={p.id}
                fill={FILL[p.kind]}
                stroke={p.kind === 'candidate' ? 'none' : '#1d2a2f'}
                data-role={p.kind}
              />
            ))}
          </Scatter>
          {live && <LiveMapPoint xDomain={shownX} yDomain={yDomain} toX={toX} />}
        </ScatterChart>
      </div>
      <ul className="chart-legend" aria-hidden="true">
        <li><span className="dot dot-reference" /> reference</li>
        <li><span className="dot dot-selected" /> {legend.selected ?? 'selected'}</li>
        {legend.candidate !== null && (
          <li>
            <span className="dot dot-other" /> {legend.candidate ?? 'other candidates'}
          </li>
        )}
      </ul>
    </figure>
  );
});

function integerTicks([lo, hi]: readonly [number, number]): number[] {
  const out: number[] = [];
  for (let v = Math.ceil(lo); v <= Math.floor(hi); v++) out.push(v);
  return out;
}
