// @vitest-environment jsdom
import { afterEach, beforeAll, describe, expect, it } from 'vitest';
import { loadUnitConversions } from '../../../src/components/format';
import { cleanup, render } from '@testing-library/react';
import {
  BatchDistributionChart,
  CompositionChart,
  FrontierChart,
  SolvencyOxidationMap,
  ViscosityTemperatureChart,
} from '../../../src/components/charts';

afterEach(cleanup);
beforeAll(async () => {
  await loadUnitConversions(); // °F conversions (mathjs) load on demand
});

describe('ViscosityTemperatureChart', () => {
  it('draws one straight line per oil, ticks in °C and mm²/s, and the marked temperatures', () => {
    const { container, getByRole } = render(
      <ViscosityTemperatureChart
        width={640}
        height={360}
        operatingTempC={70}
        coldStartTempC={-10}
        lines={[
          { id: 'a', label: 'stock A', kv40: 30, kv100: 5.2, role: 'component' },
          { id: 'b', label: 'stock B', kv40: 480, kv100: 31.5, role: 'component' },
          { id: 'r', label: 'reference', kv40: 320, kv100: 24, role: 'reference' },
          { id: 'c', label: 'blend', kv40: 318, kv100: 25, role: 'candidate' },
        ]}
      />,
    );
    const paths = container.querySelectorAll('.recharts-line-curve');
    // each oil is drawn in three straight stretches over −20…120 °C: extrapolated below 40 °C, measured
    // 40–100 °C, extrapolated above 100 °C (no pour points given)
    expect(container.querySelectorAll('.vt-measured').length).toBe(4);
    expect(container.querySelectorAll('.vt-extrapolated').length).toBe(8);
    expect(paths.length).toBe(12);
    // every stretch is a single straight segment: "M x,y L x,y"
    for (const p of paths) expect(p.getAttribute('d')).toMatch(/^M[\d.,-]+L[\d.,-]+$/);
    const ticks = [...container.querySelectorAll('.recharts-cartesian-axis-tick-value')].map((t) => t.textContent);
    expect(ticks).toContain('40 °C');
    expect(ticks).toContain('100 °C');
    expect(ticks).toContain('100');
    expect(ticks).toContain('1000');
    expect(container.textContent).toContain('operating 70 °C');
    expect(container.textContent).toContain('cold start −10 °C');
    expect(getByRole('img').getAttribute('aria-label')).toContain('reference: 320 mm²/s at 40 °C');
  });

  it('marks the part below a pour point, and shades what lies outside −20…150 °C', () => {
    const { container } = render(
      <ViscosityTemperatureChart
        width={640}
        height={360}
        coldStartTempC={-30}
        tempRangeC={[-40, 160]}
        lines={[
          { id: 'a', label: 'stock A', kv40: 220, kv100: 19, role: 'component', pourPointC: -9 },
          { id: 'b', label: 'stock B', kv40: 480, kv100: 31.5, role: 'component', fittedC: { minC: 20, maxC: 100 } },
        ]}
      />,
    );
    // stock A: below pour −40…−9, extrapolated −9…40, measured 40…100, extrapolated 100…160
    expect(container.querySelectorAll('.vt-below-pour').length).toBe(1);
    // stock B measured from 20 °C (its own points), so its measured stretch is 20…100
    expect(container.querySelectorAll('.vt-measured').length).toBe(2);
    // two shaded areas: below −20 °C and above 150 °C (ASTM D341 band, core D341_TRUSTED_BAND_C)
    expect(container.querySelectorAll('.vt-untrusted').length).toBe(2);
    expect(container.textContent).toMatch(/below [−-]20 °C/);
    expect(container.textContent).toContain('above 150 °C');
    expect(container.textContent).toContain('below the pour point');
    expect(container.querySelector('[role="img"]')!.getAttribute('aria-label')).toMatch(/pour point [−-]9 °C/);
  });

  it('shows no shading when the range stays inside −20…150 °C', () => {
    const { container } = render(
      <ViscosityTemperatureChart width={500} height={300} lines={[{ id: 'a', label: 'A', kv40: 220, kv100: 19, role: 'candidate' }]} />,
    );
    expect(container.querySelectorAll('.vt-untrusted').length).toBe(0);
  });

  it('shows °F labels when given a formatter', () => {
    const { container } = render(
      <ViscosityTemperatureChart
        width={640}
        height={360}
        operatingTempC={60}
        formatTemp={(c) => `${Math.round((c * 9) / 5 + 32)} °F`}
        lines={[{ id: 'a', label: 'A', kv40: 220, kv100: 19, role: 'candidate' }]}
      />,
    );
    expect(container.textContent).toContain('104 °F');
  });

  it('skips oils with impossible data instead of drawing nonsense', () => {
    const { container } = render(
      <ViscosityTemperatureChart width={500} height={300} lines={[{ id: 'x', label: 'bad', kv40: 5, kv100: 9, role: 'component' }]} />,
    );
    expect(container.querySelectorAll('.recharts-line-curve').length).toBe(0);
  });
});

describe('other charts', () => {
  it('renders the solvency–oxidation map with one mark per blend', () => {
    const { container } = render(
      <SolvencyOxidationMap
        width={400}
        height={300}
        points={[
          { id: 'r', label: 'ref', role: 'reference', solvency: 60, oxidation: 40 },
          { id: 'c1', label: 'c1', role: 'candidate', solvency: 45, oxidation: 70 },
          { id: 'c2', label: 'c2', role: 'selected', solvency: 50, oxidation: 60 },
        ]}
      />,
    );
    expect(container.querySelectorAll('.recharts-scatter-symbol').length).toBe(3);
  });

  it('renders composition bars and cost contributions', () => {
    const { container } = render(
      <CompositionChart
        width={700}
        height={260}
        currency="EUR"
        rows={[
          { id: 'a', label: 'N150', massPct: 60, volumePct: 61, costPerLitre: 0.8 },
          { id: 'b', label: 'HV600', massPct: 40, volumePct: 39, costPerLitre: 0.7 },
        ]}
      />,
    );
    expect(container.querySelectorAll('.recharts-bar-rectangle').length).toBe(6);
    expect(container.textContent).toContain('N150');
  });

  it('joins the frontier points with a line', () => {
    const { container } = render(
      <FrontierChart
        width={500}
        height={300}
        currency="EUR"
        points={[
          { id: 'a', label: 'a', costPerLitre: 1.0, anilinePoint: 120, role: 'frontier' },
          { id: 'b', label: 'b', costPerLitre: 1.2, anilinePoint: 105, role: 'frontier' },
          { id: 'c', label: 'c', costPerLitre: 1.3, anilinePoint: 118, role: 'candidate' },
          { id: 'r', label: 'ref', costPerLitre: 1.1, anilinePoint: 110, role: 'reference' },
        ]}
      />,
    );
    expect(container.querySelectorAll('.recharts-scatter-symbol').length).toBe(4);
    expect(container.querySelector('.recharts-line-curve')?.getAttribute('d')).toMatch(/^M.+L/);
  });
});

describe('charts are pictures, not tab stops (s25)', () => {
  it('no focusable element inside a chart: each stands in a role="img" box with its name and description, so a focusable SVG in it was an unnamed tab stop', () => {
    const { container } = render(
      <div>
        <SolvencyOxidationMap width={400} height={300} points={[{ id: 'r', label: 'ref', role: 'reference', solvency: 60, oxidation: 40 }]} />
        <CompositionChart width={700} height={260} currency="EUR" rows={[{ id: 'a', label: 'N150', massPct: 100, volumePct: 100, costPerLitre: 0.8 }]} />
        <FrontierChart width={500} height={300} currency="EUR" points={[{ id: 'a', label: 'a', costPerLitre: 1.0, anilinePoint: 120, role: 'frontier' }]} />
        <ViscosityTemperatureChart width={640} height={360} lines={[{ id: 'a', label: 'stock A', kv40: 30, kv100: 5.2, role: 'component' }]} />
      </div>,
    );
    expect(container.querySelectorAll('svg').length).toBeGreaterThanOrEqual(5);
    const stops = [...container.querySelectorAll('[role="img"] [tabindex]:not([tabindex="-1"])')].map((e) => `${e.tagName}.${e.getAttribute('class')}`);
    expect(stops).toEqual([]);
  });
});

describe('one formatter for every chart', () => {
  it('ticks use the decimal comma and °F from the settings, and never "1e6"', async () => {
    const { settingsActions } = await import('../../../src/state');
    settingsActions.updateSettings({ decimalSeparator: ',', temperatureUnit: 'F' });
    try {
      const vt = render(
        <ViscosityTemperatureChart
          width={640}
          height={360}
          lines={[{ id: 'b', label: 'heavy', kv40: 2000, kv100: 80, role: 'component' }]}
        />,
      );
      const ticks = [...vt.container.querySelectorAll('.recharts-cartesian-axis-tick-value')].map((t) => t.textContent ?? '');
      expect(ticks.join(' ')).not.toMatch(/e\d/);
      expect(ticks.some((t) => / °F$/.test(t))).toBe(true);
      expect(ticks.some((t) => / °C$/.test(t))).toBe(false);
      vt.unmount();
      const fr = render(
        <FrontierChart
          width={500}
          height={300}
          currency="EUR"
          points={[
            { id: 'a', label: 'a', costPerLitre: 1.0, anilinePoint: 120, role: 'frontier' },
            { id: 'b', label: 'b', costPerLitre: 1.2, anilinePoint: 105, role: 'frontier' },
          ]}
        />,
      );
      const frTicks = [...fr.container.querySelectorAll('.recharts-cartesian-axis-tick-value')].map((t) => t.textContent ?? '');
      expect(fr.container.textContent).toContain('aniline point, °F');
      expect(frTicks.some((t) => /^\d+,\d+$/.test(t))).toBe(true); // cost ticks with a decimal comma
      expect(frTicks.some((t) => /\d\.\d/.test(t))).toBe(false);
      fr.unmount();
      const map = render(
        <SolvencyOxidationMap
          width={400}
          height={300}
          xTemperature
          xDomain={[80, 140]}
          yDomain={[1, 5]}
          points={[{ id: 'r', label: 'ref', role: 'reference', solvency: 110, oxidation: 3 }]}
        />,
      );
      const mapTicks = [...map.container.querySelectorAll('.recharts-xAxis .recharts-cartesian-axis-tick-value')].map((t) => Number(t.textContent));
      // 80–140 °C is 176–284 °F: round °F ticks
      expect(Math.min(...mapTicks)).toBeGreaterThanOrEqual(170);
      expect(Math.max(...mapTicks)).toBeLessThanOrEqual(290);
      for (const t of mapTicks) expect(t % 10).toBe(0);
    } finally {
      settingsActions.updateSettings({ decimalSeparator: '.', temperatureUnit: 'C' });
    }
  });
});

describe('live layers (the blend drawn with the chart\'s own scales)', () => {
  it('draws the blend line, point and bars from the context, and follows it without new chart props', async () => {
    const { LiveMarksProvider } = await import('../../../src/components/charts');
    const lines = [
      { id: 'a', label: 'light', kv40: 30, kv100: 5.2, role: 'component' as const },
      { id: 'b', label: 'heavy', kv40: 480, kv100: 31.5, role: 'component' as const },
    ];
    const rows = [
      { id: 'a', label: 'LIGHT', massPct: 0, volumePct: 0, costPerLitre: 0 },
      { id: 'b', label: 'HEAVY', massPct: 0, volumePct: 0, costPerLitre: 0 },
    ];
    const marks = (w: number) => ({
      vt: { label: 'blend', kv40: 100 + 100 * w, kv100: 11 + 8 * w },
      point: { label: 'blend', x: 110 + 5 * w, y: 3 },
      bars: [
        { id: 'a', label: 'LIGHT', massPct: 100 - 100 * w, volumePct: 100 - 100 * w, costPerLitre: 1 - w },
        { id: 'b', label: 'HEAVY', massPct: 100 * w, volumePct: 100 * w, costPerLitre: w },
      ],
    });
    const ui = (w: number) => (
      <LiveMarksProvider marks={marks(w)}>
        <ViscosityTemperatureChart width={600} height={340} lines={lines} live />
        <SolvencyOxidationMap width={400} height={300} points={[]} xDomain={[80, 140]} yDomain={[1, 5]} live />
        <CompositionChart width={700} height={200} currency="EUR" rows={rows} live pctMax={100} costMax={1} />
      </LiveMarksProvider>
    );
    const { container, rerender } = render(ui(0.3));
    const blendPath = () => container.querySelector('.vt-candidate path')!.getAttribute('d');
    const pointX = () => container.querySelector('.live-point')!.getAttribute('cx');
    // One path per series (mass, volume, cost), one closed rectangle per stock: M x,y h w v h h −w Z.
    const barWidths = () =>
      [...container.querySelectorAll('.live-bar')].flatMap((p) => [...p.getAttribute('d')!.matchAll(/M[^h]*h(-?[\d.]+)/g)].map((m) => Number(m[1])));
    const before = [blendPath(), pointX(), barWidths().join()];
    expect(before[0]).toMatch(/^M[\d.]+,[\d.]+L[\d.]+,[\d.]+$/);
    expect(barWidths().length).toBe(6); // 2 stocks × (mass, volume, cost)
    const plotLines = container.querySelectorAll('.recharts-line-curve').length;
    expect(container.querySelectorAll('.live-bar').length).toBe(3); // one path per series
    const heavyBefore = barWidths()[1]!; // the mass series: LIGHT, HEAVY
    rerender(ui(0.6));
    expect(blendPath()).not.toBe(before[0]);
    expect(pointX()).not.toBe(before[1]);
    expect(barWidths().join()).not.toBe(before[2]);
    // the heavy stock's mass bar is now twice as long as before (60 % vs 30 % on the same linear axis; arithmetic)
    expect(barWidths()[1]! / heavyBefore).toBeCloseTo(2, 3); // drawn to 0.01 px
    expect(container.querySelectorAll('.recharts-line-curve').length).toBe(plotLines);
  });
});

describe('BatchDistributionChart, live', () => {
  it('draws the histogram and the model curve from the provider on fixed axes, and follows the blend', async () => {
    const { LiveMarksProvider } = await import('../../../src/components/charts');
    // A made-up distribution (arithmetic only): a triangle of density around ν40 = c, histogram of 4 bins.
    const dist = (c: number) => ({
      curve: [-10, -5, 0, 5, 10].map((d) => ({ kv: c + d, y: (10 - Math.abs(d)) / 100 })),
      histogram: [
        { kv: c - 10, y: 0.02 },
        { kv: c - 5, y: 0.08 },
        { kv: c, y: 0.08 },
        { kv: c + 5, y: 0.02 },
        { kv: c + 10, y: 0 },
      ],
      plantProbability: 0.9,
      isoProbability: 0.99,
      simulation: `4000 simulated batches around ${c}`,
    });
    const ui = (c: number) => (
      <LiveMarksProvider marks={{ distribution: dist(c) }}>
        <BatchDistributionChart
          live
          xDomain={[280, 360]}
          yMax={0.12}
          plantBand={{ min: 304, max: 336, label: 'solve band' }}
          isoBand={{ min: 288, max: 352, label: 'ISO band' }}
          formatPct={(p) => `${(100 * p).toFixed(1)} %`}
          width={600}
          height={260}
        />
      </LiveMarksProvider>
    );
    const { container, getByTestId, rerender } = render(ui(318));
    const curve = () => container.querySelector('.live-curve')!.getAttribute('d')!;
    const area = () => container.querySelector('.live-histogram')!.getAttribute('d')!;
    const ticks = () => [...container.querySelectorAll('.recharts-xAxis .recharts-cartesian-axis-tick-value')].map((t) => t.textContent).join();
    expect(curve()).toMatch(/^M[\d.]+,[\d.]+(L[\d.]+,[\d.]+){4}$/); // 5 points
    expect(area()).toMatch(/^M[\d.]+,[\d.]+L[\d.]+,[\d.]+(H[\d.]+V[\d.]+){4}V[\d.]+Z$/); // steps after 5 points, closed to the base
    expect(getByTestId('distribution-note').textContent).toBe(
      'Model: 90.0 % of batches in the solve band (304.0–336.0 mm²/s), 99.0 % in the ISO band (288.0–352.0 mm²/s). Simulation: 4000 simulated batches around 318.',
    );
    const before = [curve(), area(), ticks()];
    rerender(ui(326));
    expect(curve()).not.toBe(before[0]);
    expect(area()).not.toBe(before[1]);
    expect(ticks()).toBe(before[2]); // the axes keep still
    expect(getByTestId('distribution-note').textContent).toContain('around 326');
  });
});
