/** The designer's charts (lazy chunk: recharts loads only when the designer shows them). */
import { useMemo } from 'react';
import type { Component, Recipe } from '../../core/model';
import type { Settings } from '../../state';
import { CompositionChart, SolvencyOxidationMap, ViscosityTemperatureChart, useWidth, type ViscosityLineInput } from '../../components/charts';
import { makeFormatter } from '../../components/format';
import { kv40kv100FromPoints } from '../../core/viscosity-temperature';
import type { DraftView } from './derive';
import { predictRecipe, type Prediction } from './predict';
import { oxidationClass } from '../../core/oxidation';

export interface DesignerChartsProps {
  view: DraftView;
  prediction: Prediction;
  components: readonly Component[];
  referenceRecipe: Recipe | null;
  settings: Settings;
}

export default function DesignerCharts({ view, prediction, components, referenceRecipe, settings }: DesignerChartsProps) {
  const [ref, width] = useWidth<HTMLDivElement>(900);
  const fmt = useMemo(() => makeFormatter(settings), [settings]);
  const reference = useMemo(
    () => (referenceRecipe ? predictRecipe(referenceRecipe.lines, components, settings.blendMethod) : null),
    [referenceRecipe, components, settings.blendMethod],
  );

  // Component lines change only when the recipe's set of stocks changes.
  const stockKey = view.lines.map((l) => l.componentId).join('|');
  const componentLines = useMemo(() => {
    const out: ViscosityLineInput[] = [];
    for (const l of view.lines) {
      const c = l.component;
      if (!c || c.category === 'additive-package') continue;
      try {
        const { kv40, kv100 } = kv40kv100FromPoints(c.viscosityPoints);
        out.push({ id: c.id, label: c.code, kv40, kv100, role: 'component' });
      } catch {
        /* a stock without usable viscosities is left off the chart */
      }
    }
    return out;
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [stockKey, components]);

  const vtLines = useMemo(() => {
    const out = [...componentLines];
    if (reference?.ok) out.push({ id: 'reference', label: referenceRecipe?.name ?? 'reference', kv40: reference.kv40, kv100: reference.kv100, role: 'reference' });
    if (prediction.ok) out.push({ id: 'blend', label: 'this blend', kv40: prediction.kv40, kv100: prediction.kv100, role: 'candidate' });
    return out;
  }, [componentLines, reference, prediction, referenceRecipe]);

  const rows = useMemo(
    () =>
      view.lines.map((l) => ({
        id: l.componentId,
        label: l.component?.code ?? l.componentId,
        massPct: l.massFraction * 100,
        volumePct: l.volumeFraction * 100,
        costPerLitre: l.costPerLitre ?? 0,
      })),
    [view],
  );

  const mapPoints = useMemo(() => {
    const pts = [];
    if (reference?.ok && reference.anilinePoint !== null)
      pts.push({ id: 'reference', label: 'reference', role: 'reference' as const, solvency: reference.anilinePoint, oxidation: reference.oxidationRating });
    if (prediction.ok && prediction.anilinePoint !== null)
      pts.push({ id: 'blend', label: 'this blend', role: 'selected' as const, solvency: prediction.anilinePoint, oxidation: prediction.oxidationRating });
    return pts;
  }, [reference, prediction]);

  const full = Math.max(320, width);
  const half = full >= 900 ? Math.floor((full - 48) / 2) : full;
  const apValues = mapPoints.map((p) => p.solvency);
  const apLo = Math.floor((Math.min(80, ...apValues) - 5) / 10) * 10;
  const apHi = Math.ceil((Math.max(140, ...apValues) + 5) / 10) * 10;

  return (
    <section className="designer-charts" aria-label="Charts" ref={ref}>
      <h3>Charts</h3>
      <div className="chart-row">
        <ViscosityTemperatureChart
          lines={vtLines}
          width={half}
          height={380}
          operatingTempC={settings.operatingTempC}
          coldStartTempC={settings.coldStartTempC}
          formatTemp={(c) => fmt.temp(c)}
        />
        <SolvencyOxidationMap
          points={mapPoints}
          width={half}
          height={380}
          xLabel="aniline point, °C (right = more solvent)"
          yLabel="oxidation-stability rating"
          xDomain={[apLo, apHi]}
          xReversed
          yDomain={[1, 5]}
          formatY={(v) => (Number.isInteger(v) ? `${v} ${oxidationClass(v)}` : '')}
          title="Solvency against oxidation stability (estimates on Blendbench's own scales)"
        />
      </div>
      <CompositionChart rows={rows} currency={settings.currencySymbol} width={full} height={Math.max(140, 40 + rows.length * 26)} />
    </section>
  );
}
