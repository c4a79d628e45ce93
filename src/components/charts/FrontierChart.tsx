import { memo } from 'react';
import { CartesianGrid, Cell, Line, ComposedChart, Scatter, Tooltip, XAxis, YAxis, ZAxis } from 'recharts';
import { CHART_COLOURS } from './palette';
import { niceDomain, niceTicks, tickDecimals } from './nice';
import { useFormat } from '../format';

export interface FrontierPoint {
  id: string;
  label: string;
  /** Cost [currency per litre at 15 °C]. */
  costPerLitre: number;
  /** Blend aniline point [°C]; lower = more solvent. */
  anilinePoint: number;
  role: 'candidate' | 'frontier' | 'reference' | 'selected';
}

export interface FrontierChartProps {
  points: readonly FrontierPoint[];
  currency: string;
  width: number;
  height: number;
  onSelect?: (id: string) => void;
}

const FILL: Record<FrontierPoint['role'], string> = {
  candidate: CHART_COLOURS.component,
  frontier: CHART_COLOURS.frontier,
  reference: CHART_COLOURS.reference,
  selected: CHART_COLOURS.candidate,
};

/**
 * Cost per litre against blend aniline point for every candidate; the cost–solvency frontier
 * (no candidate both cheaper and more solvent) is joined by a line.
 */
export const FrontierChart = memo(function FrontierChart({ points, currency, width, height, onSelect }: FrontierChartProps) {
  const f = useFormat();
  // `kind`, not `role`: recharts copies point fields onto the SVG shape, and role="frontier" is no ARIA role.
  // The aniline point (°C) is drawn in the user's temperature unit.
  const data = points.map(({ role, ...p }) => ({ ...p, kind: role, x: p.costPerLitre, y: f.tempValue(p.anilinePoint) }));
  const frontier = data.filter((p) => p.kind === 'frontier' || (p.kind === 'selected' && isOnFrontier(p, data))).sort((a, b) => a.x - b.x);
  const xs = data.map((p) => p.x);
  const ys = data.map((p) => p.y);
  const xDomain = xs.length ? niceDomain(Math.min(...xs), Math.max(...xs)) : ([0, 1] as [number, number]);
  const yDomain = ys.length ? niceDomain(Math.min(...ys), Math.max(...ys)) : ([0, 1] as [number, number]);
  const xTicks = niceTicks(xDomain);
  const yTicks = niceTicks(yDomain);
  // The litre is the volume tables' litre at 15 °C, named so in every unit (as on the designer and the blend sheet).
  const at = '15 °C';
  const title = `Cost–solvency frontier (cost per litre at ${at} against blend aniline point; lower aniline point = more solvent)`;
  return (
    <figure className="chart" data-chart="frontier" style={{ width }}>
      <figcaption className="chart-title">{title}</figcaption>
      <div role="img" aria-label={`${title}. ${points.length} candidates, ${frontier.length} on the frontier.`}>
        <ComposedChart accessibilityLayer={false} width={width} height={height} margin={{ top: 12, right: 20, bottom: 28, left: 12 }}>
          <CartesianGrid stroke={CHART_COLOURS.grid} />
          <XAxis
            type="number"
            dataKey="x"
            domain={xDomain}
            ticks={xTicks}
            tickFormatter={(v: number) => f.num(v, tickDecimals(xDomain))}
            label={{ value: `cost, ${currency} per litre at ${at}`, position: 'insideBottom', offset: -18 }}
          />
          <YAxis
            type="number"
            dataKey="y"
            domain={yDomain}
            ticks={yTicks}
            width={64}
            tickFormatter={(v: number) => f.num(v, tickDecimals(yDomain))}
            label={{ value: `aniline point, ${f.tempUnit}`, angle: -90, position: 'insideLeft', offset: 6, style: { textAnchor: 'middle' } }}
          />
          <ZAxis range={[50, 50]} />
          <Tooltip isAnimationActive={false} cursor={false} formatter={(v, n) => [f.num(Number(v), 2), String(n)]} />
          <Line data={frontier} dataKey="y" stroke={CHART_COLOURS.frontier} strokeWidth={2} dot={false} activeDot={false} isAnimationActive={false} name="frontier" />
          <Scatter
            data={data}
            name="candidates"
            isAnimationActive={false}
            onClick={(d: unknown) => {
              const id = (d as { id?: unknown; payload?: { id?: unknown } })?.payload?.id ?? (d as { id?: unknown })?.id;
              if (onSelect && typeof id === 'string') onSelect(id);
            }}
          >
            {data.map((p) => (
              <Cell key={p.id} fill={FILL[p.kind]} stroke={p.kind === 'selected' || p.kind === 'reference' ? '#1d2a2f' : 'none'} data-role={p.kind} />
            ))}
          </Scatter>
        </ComposedChart>
      </div>
      <ul className="chart-legend" aria-hidden="true">
        <li><span className="swatch swatch-frontier" /> frontier</li>
        <li><span className="dot dot-reference" /> reference</li>
        <li><span className="dot dot-selected" /> selected</li>
        <li><span className="dot dot-other" /> other candidates</li>
      </ul>
    </figure>
  );
});

function isOnFrontier(p: { x: number; y: number }, all: readonly { x: number; y: number; kind: string }[]): boolean {
  return !all.some((q) => q.kind !== 'reference' && q !== p && q.x <= p.x && q.y <= p.y && (q.x < p.x || q.y < p.y));
}

