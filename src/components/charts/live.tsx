/**
 * Live marks: the parts of a chart that follow every keystroke (the blend being edited), drawn by
 * small components INSIDE the recharts chart with recharts' own scales (`useXAxisScale`,
 * `useYAxisScale`, `usePlotArea`). The chart itself (axes, grid, static series) keeps the same props
 * while a fraction is typed, so it does not re-render. The values come from {@link LiveMarksProvider},
 * placed by the screen around its charts: a relay (`components/relay.tsx`). Each live layer renders
 * an empty group once per chart render and then draws its marks into it itself, in the same task as
 * a new blend is handed over (`drawMarks`: the SVG elements are kept and only the attributes and
 * titles that changed are written), so an edit renders and commits nothing in React for the charts.
 */
import { createContext, memo, useContext, useId, useLayoutEffect, useMemo, useRef, type ReactNode } from 'react';
import { usePlotArea, useXAxisScale, useYAxisScale } from 'recharts';
import { D341_SEGMENT_STYLE, d341LineFromPoints, d341Segments, d341TempC, d341X } from './d341-scale';
import { CHART_COLOURS } from './palette';
import { useFormat } from '../format';
import { createRelay, useRelay, useRelayed, type Relay } from '../relay';
import type { Formatter } from '../format';
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

/** The relay of the nearest {@link LiveMarksProvider} (for readers that write the page themselves, e.g. `RelayText`). */
export function useLiveMarksRelay(): Pick<Relay<LiveMarks>, 'get' | 'subscribe'> {
  return useContext(LiveMarksSourceContext);
}

const SVG_NS = 'http://www.w3.org/2000/svg';

/** One SVG element a live layer draws: its tag, attributes (null: absent) and `<title>` text (null: none). */
export interface MarkSpec {
  tag: 'path' | 'circle';
  attrs: Readonly<Record<string, string | null>>;
  title: string | null;
}

/**
 * Makes the children of `group` the elements `specs` describe, in order: an element of the right tag
 * already there is kept and only its changed attributes and title are written; missing ones are
 * created, extra ones removed. An element's title is its only child.
 */
export function drawMarks(group: Element, specs: readonly MarkSpec[]): void {
  const doc = group.ownerDocument;
  let el = group.firstElementChild;
  for (const spec of specs) {
    if (!el || el.localName !== spec.tag) {
      const made = doc.createElementNS(SVG_NS, spec.tag);
      group.insertBefore(made, el);
      el = made;
    }
    for (const name in spec.attrs) {
      const v = spec.attrs[name]!;
      if (v === null) {
        if (el.hasAttribute(name)) el.removeAttribute(name);
      } else if (el.getAttribute(name) !== v) el.setAttribute(name, v);
    }
    const title = el.firstChild;
    if (spec.title === null) title?.remove();
    else if (!title) el.appendChild(doc.createElementNS(SVG_NS, 'title')).textContent = spec.title;
    else if (title.textContent !== spec.title) title.textContent = spec.title;
    el = el.nextElementSibling;
  }
  while (el) {
    const next = el.nextElementSibling;
    el.remove();
    el = next;
  }
}

/**
 * A group whose children follow the live marks without a React render: `specsOf` turns the current
 * marks into the elements to draw, at mount, whenever `specsOf` changes (a new function: new scales
 * or props) and at each new value of the relay, in the same task as it is handed over.
 */
function LiveGroup({ specsOf, className, clipPath }: { specsOf: (marks: LiveMarks) => readonly MarkSpec[]; className: string; clipPath?: string }) {
  const relay = useContext(LiveMarksSourceContext);
  const ref = useRef<SVGGElement>(null);
  useLayoutEffect(() => {
    const g = ref.current;
    if (!g) return;
    let last: LiveMarks | null = null;
    const draw = () => {
      const marks = relay.get();
      if (marks === last) return;
      last = marks;
      drawMarks(g, specsOf(marks));
    };
    draw();
    return relay.subscribe(draw);
  }, [relay, specsOf]);
  return <g ref={ref} className={className} clipPath={clipPath} />;
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
  const f = useFormat();
  const clip = useId().replace(/:/g, '');
  const specsOf = useMemo(() => {
    const px = linear(xs, xDomain);
    const py = linear(ys, yDomain);
    return (m: LiveMarks): MarkSpec[] => {
      const live = m.vt;
      if (!live || !(live.kv40 > live.kv100 && live.kv100 > 0) || !px || !py) return [];
      let line: { a: number; b: number };
      try {
        line = d341LineFromPoints({ tempC: 40, kv: live.kv40 }, { tempC: 100, kv: live.kv100 }, form);
      } catch {
        return []; // values the core refuses are not drawn
      }
      const { a, b } = line;
      const segments = d341Segments(d341TempC(xDomain[0]), d341TempC(xDomain[1]), undefined, live.pourPointC ?? null);
      const title = `${live.label}: ${f.num(live.kv40, 1)} mm²/s at 40 °C, ${f.num(live.kv100, 2)} at 100 °C`;
      return segments.map((sg) => {
        const x0 = d341X(sg.fromC);
        const x1 = d341X(sg.toC);
        const style = D341_SEGMENT_STYLE[sg.kind];
        return {
          tag: 'path',
          attrs: {
            d: `M${px(x0).toFixed(2)},${py(a - b * x0).toFixed(2)}L${px(x1).toFixed(2)},${py(a - b * x1).toFixed(2)}`,
            class: `vt-${sg.kind}`,
            stroke: CHART_COLOURS.candidate,
            'stroke-width': '2.5',
            'stroke-opacity': style.opacity === undefined ? null : String(style.opacity),
            'stroke-dasharray': style.dash === undefined ? null : String(style.dash),
            fill: 'none',
            'clip-path': `url(#${clip})`,
          },
          title: sg.kind === 'measured' ? title : `${title} (${sg.kind === 'extrapolated' ? 'extrapolated' : 'below its pour point'})`,
        };
      });
    };
  }, [xs, ys, xDomain, yDomain, form, f, clip]);
  return (
    <g className="vt-line vt-candidate live-line">
      <defs>
        <ClipToPlot id={clip} />
      </defs>
      <LiveGroup specsOf={specsOf} className="live-marks" />
    </g>
  );
}, 'LiveD341Line');

/** The blend's point on the solvency–stability map; `toX` maps the context's x to the axis (e.g. °C → °F). */
export const LiveMapPoint = withScales(function LiveMapPointMarks({
  xDomain,
  yDomain,
  toX = identity,
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
  const f = useFormat();
  const specsOf = useMemo(() => {
    const px = linear(xs, xDomain);
    const py = linear(ys, yDomain);
    return (m: LiveMarks): MarkSpec[] => {
      const live = m.point;
      if (!live || !px || !py) return [];
      const x = toX(live.x);
      return [
        {
          tag: 'circle',
          attrs: { class: 'live-point', cx: String(px(x)), cy: String(py(live.y)), r: '5', fill: CHART_COLOURS.candidate, stroke: '#1d2a2f' },
          title: `${live.label}: ${describe ? describe(x, live.y) : `${f.num(x, 1)}, ${f.num(live.y, 1)}`}`,
        },
      ];
    };
  }, [xs, ys, xDomain, yDomain, toX, describe, f]);
  return <LiveGroup specsOf={specsOf} className="live-map-point" />;
}, 'LiveMapPoint');
const identity = (v: number) => v;

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
  const f = useFormat();
  const specsOf = useMemo(() => {
    const px = linear(xs, domain);
    const series = barSeries(which, unit, f);
    // Each stock's band on the category axis, looked up once per chart render.
    const bands = new Map<string, { top: number; band: number } | null>();
    const bandOf = (label: string) => {
      let b = bands.get(label);
      if (b === undefined) {
        const top = ys(label, { position: 'start' });
        const bottom = ys(label, { position: 'end' });
        b = top === undefined || bottom === undefined ? null : { top, band: bottom - top };
        bands.set(label, b);
      }
      return b;
    };
    return (m: LiveMarks): MarkSpec[] => {
      const bars = m.bars;
      if (!bars || !px) return [];
      const x0 = px(0);
      return series.map((s) => {
        let d = '';
        for (const r of bars) {
          const b = bandOf(r.label);
          if (!b) continue;
          const pad = b.band * 0.15;
          const h = (b.band - 2 * pad) / s.slots;
          const w = Math.max(0, px(s.value(r)) - x0);
          d += `M${r2(x0)},${r2(b.top + pad + s.slot * h)}h${r2(w)}v${r2(h)}h${r2(-w)}Z`;
        }
        return { tag: 'path', attrs: { class: `live-bar live-bar-${s.key}`, d, fill: s.colour }, title: `${s.title}: ${bars.map(s.say).join(', ')}` };
      });
    };
  }, [xs, ys, domain, which, unit, f]);
  return <LiveGroup specsOf={specsOf} className={`live-bars live-bars-${which}`} />;
}, 'LiveBars');
const r2 = (v: number) => Math.round(v * 100) / 100;

/** The bar series of a composition or cost chart: which value, where in the band, its colour and words. */
function barSeries(which: 'composition' | 'cost', unit: string, f: Formatter) {
  return which === 'cost'
    ? [{ key: 'cost', colour: CHART_COLOURS.cost, value: (r: LiveBar) => r.costPerLitre, slot: 0, slots: 1, say: (r: LiveBar) => `${r.label} ${f.num(r.costPerLitre, 3)}`, title: `Cost, ${unit}` }]
    : [
        { key: 'mass', colour: CHART_COLOURS.mass, value: (r: LiveBar) => r.massPct, slot: 0, slots: 2, say: (r: LiveBar) => `${r.label} ${f.num(r.massPct, 2)} %`, title: 'By mass' },
        { key: 'volume', colour: CHART_COLOURS.volume, value: (r: LiveBar) => r.volumePct, slot: 1, slots: 2, say: (r: LiveBar) => `${r.label} ${f.num(r.volumePct, 2)} %`, title: 'By volume' },
      ];
}

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
  const clip = useId().replace(/:/g, '');
  const specsOf = useMemo(() => {
    const px = linear(xs, xDomain);
    const py = linear(ys, yDomain);
    return (m: LiveMarks): MarkSpec[] => {
      const live = m.distribution;
      if (!live || !px || !py) return [];
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
      let curve = '';
      for (let k = 0; k < live.curve.length; k++) curve += `${k === 0 ? 'M' : 'L'}${px(live.curve[k]!.kv).toFixed(2)},${py(live.curve[k]!.y).toFixed(2)}`;
      return [
        { tag: 'path', attrs: { class: 'live-histogram', d: area, fill: colours.histogram, 'fill-opacity': '0.35', stroke: 'none' }, title: null },
        { tag: 'path', attrs: { class: 'live-histogram-outline', d: steps, fill: 'none', stroke: colours.histogram }, title: 'simulated batches' },
        { tag: 'path', attrs: { class: 'live-curve', d: curve, fill: 'none', stroke: colours.curve, 'stroke-width': '2' }, title: 'model' },
      ];
    };
  }, [xs, ys, xDomain, yDomain, colours]);
  return (
    <g className="live-distribution">
      <defs>
        <ClipToPlot id={clip} />
      </defs>
      <LiveGroup specsOf={specsOf} className="live-marks" clipPath={`url(#${clip})`} />
    </g>
  );
}, 'LiveDistributionMarks');
