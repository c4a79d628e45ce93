import { memo, useMemo } from 'react';
import { CartesianGrid, Line, LineChart, ReferenceLine, Tooltip, XAxis, YAxis } from 'recharts';
import { d341Kv, d341LineFromPoints, d341TempC, d341X, d341Y, formatKvTick, kvAxis, temperatureTicks } from './d341-scale';
import { useFormat } from '../format';
import { CHART_COLOURS } from './palette';
import { LiveD341Line } from './live';

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
   * Draw the blend from {@link LiveMarksContext} (`vt`) as a live layer: the chart keeps its props
   * while the blend changes. The axes are set by `lines` (a blend lies inside its components' envelope).
   */
  live?: boolean;
}

const KV_MIN = 2;
const KV_MAX = 1e6;

interface LineSeries {
  id: string;
  label: string;
  role: OilRole;
  points: { x: number; y: number }[];
}

/**
 * Viscosity against temperature on ASTM D341 axes: x = log10(T / K), y = log10(log10(ν + 0.7)),
 * so each oil is a straight line; ticks are labelled back in °C and mm²/s at round values.
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
}: ViscosityTemperatureChartProps) {
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
      const { a, b } = d341LineFromPoints({ tempC: 40, kv: l.kv40 }, { tempC: 100, kv: l.kv100 });
      const yAtLo = a - b * xLo;
      const yAtHi = a - b * xHi;
      yMin = Math.min(yMin, yAtHi);
      yMax = Math.max(yMax, yAtLo);
      series.push({ id: l.id, label: l.label, role: l.role, points: [{ x: xLo, y: yAtLo }, { x: xHi, y: yAtHi }] });
    }
    const kvLo = Number.isFinite(yMin) ? Math.max(KV_MIN, d341Kv(yMin)) : 5;
    const kvHi = Number.isFinite(yMax) ? Math.min(KV_MAX, d341Kv(yMax)) : 10000;
    const plotH = Math.max(50, height - 70);
    const plotW = Math.max(50, width - 90);
    // Round ticks of one even series, at least a label apart; the frame starts and ends on a label.
    const axis = kvAxis(kvLo, kvHi, d341Y, ([a, b]) => ((b - a) / plotH) * 16);
    const yDomain: [number, number] = [d341Y(axis.range[0]), d341Y(axis.range[1])];
    const kvTicks = axis.ticks.map(d341Y);
    // A label such as "−20 °C" or "100 °F" is about 45 px wide at the axis font: keep 60 px between ticks.
    const xGap = ((xHi - xLo) / plotW) * 60;
    const tempTicks = temperatureTicks(lo, hi, f.tempValue, f.tempToC, d341X, xGap).map(d341X);
    return { series, xDomain: [xLo, xHi] as [number, number], yDomain, kvTicks, tempTicks, marks };
  }, [lines, operatingTempC, coldStartTempC, tempRangeC, width, height, f]);

  const describe = lines.map((l) => `${l.label}: ${fmtKv(l.kv40)} mm²/s at 40 °C, ${fmtKv(l.kv100)} at 100 °C`).join('; ');

  return (
    <figure className="chart" data-chart="viscosity-temperature" style={{ width }}>
      <figcaption className="chart-title">{title}</figcaption>
      <div role="img" aria-label={`${title}. ${describe}`}>
        <LineChart width={width} height={height} margin={{ top: 16, right: 24, bottom: 28, left: 28 }}>
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
            tickFormatter={(y: number) => formatKvTick(Math.round(d341Kv(y) * 1000) / 1000, f.num)}
            label={{ value: 'ν, mm²/s', angle: -90, position: 'left', offset: 2, style: { textAnchor: 'middle' } }}
          />
          <Tooltip
            isAnimationActive={false}
            formatter={(y) => [`${fmtKv(d341Kv(Number(y)))} mm²/s`]}
            labelFormatter={(x) => formatTemp(d341TempC(Number(x)))}
          />
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
          {model.series.map((s) => (
            <Line
              key={s.id}
              data={s.points}
              dataKey="y"
              name={s.label}
              type="linear"
              dot={false}
              activeDot={false}
              isAnimationActive={false}
              stroke={s.role === 'component' ? CHART_COLOURS.component : s.role === 'reference' ? CHART_COLOURS.reference : CHART_COLOURS.candidate}
              strokeWidth={s.role === 'component' ? 1 : 2.5}
              strokeDasharray={s.role === 'reference' ? '7 4' : undefined}
              className={`vt-line vt-${s.role}`}
            />
          ))}
          {live && <LiveD341Line xDomain={model.xDomain} yDomain={model.yDomain} />}
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
      <p className="chart-note">
        Each oil is a straight line on these axes (ASTM D341). Below the pour point, and for polymer-thickened oils at
        low temperature, the line is an extrapolation, not a prediction.
      </p>
    </figure>
  );
});

const LEGEND: Record<OilRole, string> = {
  candidate: 'blend / candidate',
  reference: 'reference recipe',
  component: 'components',
};
