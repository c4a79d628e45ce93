import { memo, useMemo } from 'react';
import { CartesianGrid, Line, LineChart, ReferenceArea, ReferenceLine, Tooltip, XAxis, YAxis } from 'recharts';
import {
  D341_SEGMENT_STYLE,
  TRUSTED_BAND_C,
  d341Kv,
  d341LineFromPoints,
  d341Segments,
  d341TempC,
  d341X,
  d341Y,
  formatKvTick,
  kvAxis,
  temperatureFlag,
  temperatureTicks,
  type D341SegmentKind,
} from './d341-scale';
import { useFormat } from '../format';
import { CHART_COLOURS } from './palette';
import { plotBox } from './plot-box';
import { LiveD341Line } from './live';
import { D341_FORM_SHORT, type D341Form } from '../../core/viscosity/viscosity-temperature';

/** The role of an oil on the chart; decides its stroke. */
export type OilRole = 'component' | 'reference' | 'candidate';

export interface ViscosityLineInput {
  id: string;
  label: string;
  /** ν at 40 °C [mm²/s]. */
  kv40: number;
  /** ν at 100 °C [mm²/s]. */
  kv100: number;
  role: OilRole;
  /** Lowest and highest measured temperature of the oil's line [°C]; default 40 and 100. */
  fittedC?: { minC: number; maxC: number };
  /** Pour point [°C] (measured, or a blend's estimate): the line below it is drawn dotted; null/absent = unknown. */
  pourPointC?: number | null;
}

export interface ViscosityTemperatureChartProps {
  lines: readonly ViscosityLineInput[];
  /** Gearbox operating temperature [°C], marked with a vertical line. */
  operatingTempC?: number | null;
  /** Cold-start temperature [°C], marked with a vertical line. */
  coldStartTempC?: number | null;
  /** Temperature range of the x axis [°C]; default from the marked temperatures, at least −20…120. */
  tempRangeC?: readonly [number, number];
  width: number;
  height: number;
  /** Label for a temperature given in °C; default the user's unit and number format ("40 °C"). */
  formatTemp?: (tempC: number) => string;
  title?: string;
  /**
   * Draw the blend from {@link LiveMarksProvider} (`vt`) as a live layer: the chart keeps its props
   * while the blend changes. The axes are set by `lines` (a blend lies inside its components' envelope).
   */
  live?: boolean;
  /** Form of the D341 Z for the axes and every line (Settings); default 'd341-20'. Named in the caption. */
  d341Form?: D341Form;
}

const KV_MIN = 2;
const KV_MAX = 1e6;

interface LineSeries {
  id: string;
  label: string;
  role: OilRole;
  /** The line's stretches: measured, extrapolated, below the pour point (two points each). */
  segments: { kind: D341SegmentKind; points: { x: number; y: number }[] }[];
}

/**
 * Viscosity against temperature on ASTM D341 axes: x = log10(T / K), y = log10(log10(Z)) with the
 * D341-20 Z (the core's functions), so each oil is a straight line; ticks are labelled back in °C and
 * mm²/s at round values. Each line is solid between its measured temperatures, faded where it is
 * extrapolated and dotted below the oil's pour point; the chart shades what lies outside −20…150 °C.
 */
export const ViscosityTemperatureChart = memo(function ViscosityTemperatureChart({
  lines,
  operatingTempC = null,
  coldStartTempC = null,
  tempRangeC,
  width,
  height,
  formatTemp: formatTempProp,
  title = 'Viscosity against temperature (ASTM D341 axes)',
  live = false,
  d341Form = 'd341-20',
}: ViscosityTemperatureChartProps) {
  const y = (kv: number) => d341Y(kv, d341Form);
  const kvAt = (yv: number) => d341Kv(yv, d341Form);
  const f = useFormat();
  const formatTemp = formatTempProp ?? f.temp;
  const fmtKv = (v: number) => (!Number.isFinite(v) ? '—' : f.num(v, v >= 100 ? 0 : v >= 10 ? 1 : 2));
  const model = useMemo(() => {
    const marks = [operatingTempC, coldStartTempC].filter((t): t is number => t !== null && Number.isFinite(t));
    const lo = tempRangeC?.[0] ?? Math.min(-20, ...marks.map((t) => Math.floor((t - 10) / 10) * 10));
    const hi = tempRangeC?.[1] ?? Math.max(120, ...marks.map((t) => Math.ceil((t + 10) / 10) * 10));
    const xLo = d341X(lo);
    const xHi = d341X(hi);
    const series: LineSeries[] = [];
    let yMin = Infinity;
    let yMax = -Infinity;
    for (const l of lines) {
      if (!(l.kv40 > 0 && l.kv100 > 0 && l.kv40 > l.kv100)) continue;
      let line: { a: number; b: number };
      try {
        line = d341LineFromPoints({ tempC: 40, kv: l.kv40 }, { tempC: 100, kv: l.kv100 }, d341Form);
      } catch {
        continue; // data the core refuses (e.g. below the D341-20 range) is not drawn
      }
      const { a, b } = line;
      yMin = Math.min(yMin, a - b * xHi);
      yMax = Math.max(yMax, a - b * xLo);
      const segments = d341Segments(lo, hi, l.fittedC, l.pourPointC ?? null).map((sg) => {
        const x0 = d341X(sg.fromC);
        const x1 = d341X(sg.toC);
        return { kind: sg.kind, points: [{ x: x0, y: a - b * x0 }, { x: x1, y: a - b * x1 }] };
      });
      series.push({ id: l.id, label: l.label, role: l.role, segments });
    }
    // Outside −20…150 °C no D341 line of a gear oil is to be trusted: those parts of the chart are shaded.
    const bands: [number, number][] = [];
    if (lo < TRUSTED_BAND_C.min) bands.push([xLo, d341X(TRUSTED_BAND_C.min)]);
    if (hi > TRUSTED_BAND_C.max) bands.push([d341X(TRUSTED_BAND_C.max), xHi]);
    const kvLo = Number.isFinite(yMin) ? Math.max(KV_MIN, kvAt(yMin)) : 5;
    const kvHi = Number.isFinite(yMax) ? Math.min(KV_MAX, kvAt(yMax)) : 10000;
    const plotH = Math.max(50, height - 70);
    const plotW = Math.max(50, width - 90);
    // Round ticks of one even series, at least a label apart; the frame starts and ends on a label.
    const axis = kvAxis(kvLo, kvHi, y, ([a, b]) => ((b - a) / plotH) * 16);
    const yDomain: [number, number] = [y(axis.range[0]), y(axis.range[1])];
    const kvTicks = axis.ticks.map(y);
    // A label such as "−20 °C" or "100 °F" is about 45 px wide at the axis font: keep 60 px between ticks.
    const xGap = ((xHi - xLo) / plotW) * 60;
    const tempTicks = temperatureTicks(lo, hi, f.tempValue, f.tempToC, d341X, xGap).map(d341X);
    const kinds = new Set(series.flatMap((sr) => sr.segments.map((sg) => sg.kind)));
    return { series, bands, kinds, xDomain: [xLo, xHi] as [number, number], yDomain, kvTicks, tempTicks, marks };
    // eslint-disable-next-line react-hooks/exhaustive-deps -- y and kvAt depend only on d341Form
  }, [lines, operatingTempC, coldStartTempC, tempRangeC, width, height, f, d341Form]);

  const describe = lines
    .map((l) => `${l.label}: ${fmtKv(l.kv40)} mm²/s at 40 °C, ${fmtKv(l.kv100)} at 100 °C${l.pourPointC != null ? `, pour point ${formatTemp(l.pourPointC)}` : ''}`)
    .join('; ');

  return (
    <figure className="chart" data-chart="viscosity-temperature" style={{ width }}>
      <figcaption className="chart-title">{title}</figcaption>
      <div role="img" aria-label={`${title}. ${describe}`} className="chart-plot" style={plotBox(height)}>
        <LineChart accessibilityLayer={false} width={width} height={height} margin={{ top: 16, right: 24, bottom: 28, left: 28 }}>
          <CartesianGrid stroke={CHART_COLOURS.grid} />
          <XAxis
            type="number"
            dataKey="x"
            domain={model.xDomain}
            ticks={model.tempTicks}
            allowDataOverflow
            tickFormatter={(x: number) => formatTemp(d341TempC(x))}
            label={{ value: 'temperature (log absolute scale)', position: 'insideBottom', offset: -18 }}
          />
          <YAxis
            type="number"
            dataKey="y"
            domain={model.yDomain}
            ticks={model.kvTicks}
            allowDataOverflow
            width={70}
            tickFormatter={(v: number) => formatKvTick(Math.round(kvAt(v) * 1000) / 1000, f.num)}
            label={{ value: 'ν, mm²/s', angle: -90, position: 'left', offset: 2, style: { textAnchor: 'middle' } }}
          />
          <Tooltip
            isAnimationActive={false}
            formatter={(v) => [`${fmtKv(kvAt(Number(v)))} mm²/s`]}
            labelFormatter={(x) => {
              const t = d341TempC(Number(x));
              const flag = temperatureFlag(t, formatTemp);
              return `${formatTemp(t)}${flag ? ` (${flag})` : ''}`;
            }}
          />
          {model.bands.map(([x1, x2]) => (
            <ReferenceArea
              key={`band-${x1}`}
              x1={x1}
              x2={x2}
              ifOverflow="hidden"
              fill={CHART_COLOURS.untrusted}
              fillOpacity={0.55}
              stroke="none"
              className="vt-untrusted"
              label={{
                value: x1 === model.xDomain[0] ? `below ${formatTemp(TRUSTED_BAND_C.min)}` : `above ${formatTemp(TRUSTED_BAND_C.max)}`,
                position: 'insideBottom',
                fill: '#55606a',
                fontSize: 11,
              }}
            />
          ))}
          {coldStartTempC !== null && Number.isFinite(coldStartTempC) && (
            <ReferenceLine
              x={d341X(coldStartTempC)}
              stroke={CHART_COLOURS.cold}
              strokeDasharray="4 3"
              label={{ value: `cold start ${formatTemp(coldStartTempC)}`, position: 'insideTopLeft', fill: CHART_COLOURS.cold, fontSize: 11 }}
            />
          )}
          {operatingTempC !== null && Number.isFinite(operatingTempC) && (
            <ReferenceLine
              x={d341X(operatingTempC)}
              stroke={CHART_COLOURS.hot}
              strokeDasharray="4 3"
              label={{ value: `operating ${formatTemp(operatingTempC)}`, position: 'insideTopRight', fill: CHART_COLOURS.hot, fontSize: 11 }}
            />
          )}
          {model.series.flatMap((s) =>
            s.segments.map((sg, i) => (
              <Line
                key={`${s.id}-${i}`}
                data={sg.points}
                dataKey="y"
                name={sg.kind === 'measured' ? s.label : `${s.label} (${SEGMENT_WORDS[sg.kind]})`}
                type="linear"
                dot={false}
                activeDot={false}
                isAnimationActive={false}
                stroke={s.role === 'component' ? CHART_COLOURS.component : s.role === 'reference' ? CHART_COLOURS.reference : CHART_COLOURS.candidate}
                strokeOpacity={D341_SEGMENT_STYLE[sg.kind].opacity}
                strokeWidth={s.role === 'component' ? 1 : 2.5}
                strokeDasharray={D341_SEGMENT_STYLE[sg.kind].dash ?? (s.role === 'reference' ? '7 4' : undefined)}
                className={`vt-line vt-${s.role} vt-${sg.kind}`}
              />
            )),
          )}
          {live && <LiveD341Line xDomain={model.xDomain} yDomain={model.yDomain} form={d341Form} />}
        </LineChart>
      </div>
      <ul className="chart-legend" aria-hidden="true">
        {(['candidate', 'reference', 'component'] as const)
          .filter((r) => model.series.some((s) => s.role === r) || (live && r === 'candidate'))
          .map((r) => (
            <li key={r} data-legend={r}>
              <span className={`swatch swatch-${r}`} /> {LEGEND[r]}
            </li>
          ))}
      </ul>
      <ul className="chart-legend chart-legend-styles" aria-hidden="true">
        <li data-legend="measured">
          <span className="swatch swatch-measured" /> between the measured {formatTemp(40)} and {formatTemp(100)}
        </li>
        <li data-legend="extrapolated">
          <span className="swatch swatch-extrapolated" /> extrapolated
        </li>
        {(model.kinds.has('below-pour') || live) && (
          <li data-legend="below-pour">
            <span className="swatch swatch-below-pour" /> below the pour point
          </li>
        )}
        {model.bands.length > 0 && (
          <li data-legend="untrusted">
            <span className="block block-untrusted" /> outside {formatTemp(TRUSTED_BAND_C.min)}…{formatTemp(TRUSTED_BAND_C.max)}
          </li>
        )}
      </ul>
      <p className="chart-note">
        Each oil is a straight line on these axes ({D341_FORM_SHORT[d341Form]}). Beyond the measured {formatTemp(40)}–{formatTemp(100)} the
        line is extrapolated (faded); below the pour point it is no prediction at all (dotted), nor for polymer-thickened oils
        at low temperature. Outside {formatTemp(TRUSTED_BAND_C.min)}…{formatTemp(TRUSTED_BAND_C.max)} (shaded) no value read
        off it is to be trusted.
      </p>
    </figure>
  );
});

const SEGMENT_WORDS: Record<D341SegmentKind, string> = {
  measured: 'measured range',
  extrapolated: 'extrapolated',
  'below-pour': 'below its pour point',
};

const LEGEND: Record<OilRole, string> = {
  candidate: 'blend / candidate',
  reference: 'reference recipe',
  component: 'components',
};
