/**
 * Live marks: the parts of a chart that follow every keystroke (the blend being edited), drawn by
 * small components INSIDE the recharts chart with recharts' own scales (`useXAxisScale`,
 * `useYAxisScale`, `usePlotArea`). The chart itself (axes, grid, static series) keeps the same props
 * while a fraction is typed, so it does not re-render; only these layers do, which keeps an edit
 * within one frame. The values come from {@link LiveMarksProvider}, placed by the screen around its
 * charts: a relay (`components/relay.tsx`) the live layers subscribe to, so a new blend re-renders only
 * them (a changed React context value would make React search every chart's whole tree for its readers).
 */
import { createContext, memo, useContext, useId, type ReactNode } from 'react';
import { usePlotArea, useXAxisScale, useYAxisScale } from 'recharts';
import { D341_SEGMENT_STYLE, d341LineFromPoints, d341Segments, d341TempC, d341X } from './d341-scale';
import { CHART_COLOURS } from './palette';
import { useFormat } from '../format';
import { createRelay, useRelay, useRelayed, type Relay } from '../relay';
import type { D341Form } from '../../core/viscosity/viscosity-temperature';

export interface LiveBar {
  id: string;
  label: string;
  massPct: number;
  volumePct: number;
  costPerLitre: number;
}

/** One point of a density curve or of the histogram's outline. */
export interface DensityPoint {
  /** ν40 [mm²/s]. */
  kv: number;
  /** Probability density [per mm²/s]. */
  y: number;
}

/** The blend's batch-ν40 distribution under lot spread, as the batch-distribution chart draws it. */
export interface LiveDistribution {
  /** The model's density (line). */
  curve: readonly DensityPoint[];
  /** The seeded Monte Carlo's histogram as a step outline (left edge of each bin, then the last right edge). */
  histogram: readonly DensityPoint[];
  /** The model's probability of a batch in the plant band and in the ISO band (0–1). */
  plantProbability: number;
  isoProbability: number;
  /** The simulation in words, e.g. "4,000 simulated batches (seed 1) …: 98.9 % in the solve band". */
  simulation: string;
}

export interface LiveMarks {
  /** The blend's ASTM D341 line (ν40, ν100 in mm²/s) and its pour point estimate [°C] (null: unknown). */
  vt?: { label: string; kv40: number; kv100: number; pourPointC?: number | null } | null;
  /** The blend's point on the solvency–stability map (x, y in the map's units). */
  point?: { label: string; x: number; y: number } | null;
  /** The blend's composition and cost bars, one per stock (same order as the chart's categories). */
  bars?: readonly LiveBar[] | null;
  /** The blend's batch-ν40 distribution (null: none to show). */
  distribution?: LiveDistribution | null;
}

const LiveMarksSourceContext = createContext<Relay<LiveMarks>>(createRelay({}));

/**
 * Gives the live layers below the blend to draw: either `marks`, handed to the context's relay after
 * each render (only the live layers, its readers, render again, before the browser paints), or a
 * relay of the caller's (`source`), which the caller sets as the blend changes (then the live layers
 * update in the same React commit as whatever else the change renders, without a render of the
 * caller or the charts).
 */
export function LiveMarksProvider({ marks, source, children }: { marks?: LiveMarks; source?: Relay<LiveMarks>; children?: ReactNode }) {
  const own = useRelayed(marks ?? NO_MARKS);
  return <LiveMarksSourceContext.Provider value={source ?? own}>{children}</LiveMarksSourceContext.Provider>;
}
const NO_MARKS: LiveMarks = {};

/** One part of the blend from the nearest {@link LiveMarksProvider}; the caller re-renders when it changes. */
export function useLiveMarks<T>(select: (marks: LiveMarks) => T): T {
  return useRelay(useContext(LiveMarksSourceContext), select);
}

/** Pixel position of a value on a linear axis, extrapolated beyond the domain from its two ends. */
function linear(scale: (v: unknown) => number | undefined, domain: readonly [number, number]): ((v: number) => number) | null {
  const p0 = scale(domain[0]);
  const p1 = scale(domain[1]);
  if (p0 === undefined || p1 === undefined || domain[1] === domain[0]) return null;
  return (v) => p0 + ((v - domain[0]) / (domain[1] - domain[0])) * (p1 - p0);
}

/** The plot area as a clip path (kept when only the blend changes: it reads the chart's store). */
const ClipToPlot = memo(function ClipToPlot({ id }: { id: string }) {
  const plot = usePlotArea();
  if (!plot) return null;
  return (
    <clipPath id={id}>
      <rect x={plot.x} y={plot.y} width={plot.width} height={plot.height} />
    </clipPath>
  );
});

/** The chart's x and y scales (value → pixel), as recharts gives them. */
type XScale = NonNullable<ReturnType<typeof useXAxisScale>>;
type YScale = NonNullable<ReturnType<typeof useYAxisScale>>;
interface Scales {
  xs: XScale;
  ys: YScale;
}

/**
 * Reads the chart's scales once per chart render and hands them to `Marks`, which alone subscribes
 * to the blend: an edit re-renders only `Marks`, without asking recharts' store for the scales again.
 */
function withScales<P extends object>(Marks: (props: P & Scales) => ReactNode, name: string) {
  const Kept = memo(Marks);
  Kept.displayName = name;
  function WithScales(props: P) {
    const xs = useXAxisScale();
    const ys = useYAxisScale();
    if (!xs || !ys) return null;
    return <Kept {...props} xs={xs} ys={ys} />;
  }
  WithScales.displayName = `${name}Scales`;
  return WithScales;
}

/**
 * The blend's straight line on the D341 chart (x = log10 T, y = log10 log10 Z in the chart's form), drawn like the
 * static lines: solid between 40 and 100 °C, faded where extrapolated, dotted below the pour point.
 */
export const LiveD341Line = withScales(function LiveD341LineMarks({
  xDomain,
  yDomain,
  form = 'd341-20',
  xs,
  ys,
}: {
  xDomain: readonly [number, number];
  yDomain: readonly [number, number];
  /** The host chart's D341 form (its axes use the same Z). */
  form?: D341Form;
} & Scales) {
  const live = useLiveMarks((m) => m.vt);
  const f = useFormat();
  const clip = useId().replace(/:/g, '');
  if (!live || !(live.kv40 > live.kv100 && live.kv100 > 0)) return null;
  const px = linear(xs, xDomain);
  const py = linear(ys, yDomain);
  if (!px || !py) return null;
  let line: { a: number; b: number };
  try {
    line = d341LineFromPoints({ tempC: 40, kv: live.kv40 }, { tempC: 100, kv: live.kv100 }, form);
  } catch {
    return null; // values the core refuses are not drawn
  }
  const { a, b } = line;
  const segments = d341Segments(d341TempC(xDomain[0]), d341TempC(xDomain[1]), undefined, live.pourPointC ?? null);
  const title = `${live.label}: ${f.num(live.kv40, 1)} mm²/s at 40 °C, ${f.num(live.kv100, 2)} at 100 °C`;
  return (
    <g className="vt-line vt-candidate live-line">
      <defs>
        <ClipToPlot id={clip} />
      </defs>
      {segments.map((sg, i) => {
        const x0 = d341X(sg.fromC);
        const x1 = d341X(sg.toC);
        const d = `M${px(x0).toFixed(2)},${py(a - b * x0).toFixed(2)}L${px(x1).toFixed(2)},${py(a - b * x1).toFixed(2)}`;
        return (
          <path
            key={i}
            d={d}
            className={`vt-${sg.kind}`}
            stroke={CHART_COLOURS.candidate}
            strokeWidth={2.5}
            strokeOpacity={D341_SEGMENT_STYLE[sg.kind].opacity}
            strokeDasharray={D341_SEGMENT_STYLE[sg.kind].dash}
            fill="none"
            clipPath={`url(#${clip})`}
          >
            <title>{sg.kind === 'measured' ? title : `${title} (${sg.kind === 'extrapolated' ? 'extrapolated' : 'below its pour point'})`}</title>
          </path>
        );
      })}
    </g>
  );
}, 'LiveD341Line');

/** The blend's point on the solvency–stability map; `toX` maps the context's x to the axis (e.g. °C → °F). */
export const LiveMapPoint = withScales(function LiveMapPointMarks({
  xDomain,
  yDomain,
  toX = (v) => v,
  describe,
  xs,
  ys,
}: {
  xDomain: readonly [number, number];
  yDomain: readonly [number, number];
  toX?: (v: number) => number;
  /** The point's title text from its (axis) values. */
  describe?: (x: number, y: number) => string;
} & Scales) {
  const live = useLiveMarks((m) => m.point);
  const f = useFormat();
  if (!live) return null;
  const px = linear(xs, xDomain);
  const py = linear(ys, yDomain);
  if (!px || !py) return null;
  return (
    <circle className="live-point" cx={px(toX(live.x))} cy={py(live.y)} r={5} fill={CHART_COLOURS.candidate} stroke="#1d2a2f">
      <title>{`${live.label}: ${describe ? describe(toX(live.x), live.y) : `${f.num(toX(live.x), 1)}, ${f.num(live.y, 1)}`}`}</title>
    </circle>
  );
}, 'LiveMapPoint');

/**
 * Horizontal bars for each stock on a category y axis: mass % and volume %, or cost. Each series is
 * one path (a closed rectangle per stock; a zero-width bar draws nothing) with one title listing its
 * values, so an edit changes three attributes instead of a rect and a title per bar.
 */
export const LiveBars = withScales(function LiveBarsMarks({
  which,
  domain,
  unit,
  xs,
  ys,
}: { which: 'composition' | 'cost'; domain: readonly [number, number]; unit: string } & Scales) {
  const bars = useLiveMarks((m) => m.bars);
  const f = useFormat();
  if (!bars) return null;
  const px = linear(xs, domain);
  if (!px) return null;
  const x0 = px(0);
  const r2 = (v: number) => Math.round(v * 100) / 100;
  const series =
    which === 'cost'
      ? [{ key: 'cost', colour: CHART_COLOURS.cost, value: (r: LiveBar) => r.costPerLitre, slot: 0, slots: 1, say: (r: LiveBar) => `${r.label} ${f.num(r.costPerLitre, 3)}`, title: `Cost, ${unit}` }]
      : [
          { key: 'mass', colour: CHART_COLOURS.mass, value: (r: LiveBar) => r.massPct, slot: 0, slots: 2, say: (r: LiveBar) => `${r.label} ${f.num(r.massPct, 2)} %`, title: 'By mass' },
          { key: 'volume', colour: CHART_COLOURS.volume, value: (r: LiveBar) => r.volumePct, slot: 1, slots: 2, say: (r: LiveBar) => `${r.label} ${f.num(r.volumePct, 2)} %`, title: 'By volume' },
        ];
  return (
    <g className={`live-bars live-bars-${which}`}>
      {series.map((s) => {
        let d = '';
        for (const r of bars) {
          const top = ys(r.label, { position: 'start' });
          const bottom = ys(r.label, { position: 'end' });
          if (top === undefined || bottom === undefined) continue;
          const band = bottom - top;
          const pad = band * 0.15;
          const h = (band - 2 * pad) / s.slots;
          const w = Math.max(0, px(s.value(r)) - x0);
          d += `M${r2(x0)},${r2(top + pad + s.slot * h)}h${r2(w)}v${r2(h)}h${r2(-w)}Z`;
        }
        return (
          <path key={s.key} className={`live-bar live-bar-${s.key}`} d={d} fill={s.colour}>
            <title>{`${s.title}: ${bars.map(s.say).join(', ')}`}</title>
          </path>
        );
      })}
    </g>
  );
}, 'LiveBars');

/**
 * The blend's batch distribution: the simulated histogram (shaded steps with their outline) and the
 * model's density (line), drawn like the chart's static series were, clipped to the plot area.
 */
export const LiveDistributionMarks = withScales(function LiveDistributionLayer({
  xDomain,
  yDomain,
  colours,
  xs,
  ys,
}: {
  xDomain: readonly [number, number];
  yDomain: readonly [number, number];
  colours: { histogram: string; curve: string };
} & Scales) {
  const live = useLiveMarks((m) => m.distribution);
  const clip = useId().replace(/:/g, '');
  if (!live) return null;
  const px = linear(xs, xDomain);
  const py = linear(ys, yDomain);
  if (!px || !py) return null;
  const h = live.histogram;
  let steps = '';
  for (let k = 0; k < h.length; k++) {
    const x = px(h[k]!.kv).toFixed(2);
    const y = py(h[k]!.y).toFixed(2);
    // Step after: across to this point's x at the previous height, then up or down to its own.
    steps += k === 0 ? `M${x},${y}` : `H${x}V${y}`;
  }
  const base = py(0).toFixed(2);
  const area = h.length > 0 ? `M${px(h[0]!.kv).toFixed(2)},${base}${steps.replace(/^M/, 'L')}V${base}Z` : '';
  const curve = live.curve.map((p, k) => `${k === 0 ? 'M' : 'L'}${px(p.kv).toFixed(2)},${py(p.y).toFixed(2)}`).join('');
  return (
    <g className="live-distribution">
      <defs>
        <ClipToPlot id={clip} />
      </defs>
      <g clipPath={`url(#${clip})`}>
        <path className="live-histogram" d={area} fill={colours.histogram} fillOpacity={0.35} stroke="none" />
        <path className="live-histogram-outline" d={steps} fill="none" stroke={colours.histogram}>
          <title>simulated batches</title>
        </path>
        <path className="live-curve" d={curve} fill="none" stroke={colours.curve} strokeWidth={2}>
          <title>model</title>
        </path>
      </g>
    </g>
  );
}, 'LiveDistributionMarks');
