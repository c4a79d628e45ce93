/** The explorer's charts (lazy chunk with recharts). */
import { useMemo } from 'react';
import type { Component, Recipe } from '../../core/formulation/model';
import type { SubstituteCandidate } from '../../core/search/substitutes';
import { kv40kv100FromPoints } from '../../core/viscosity/viscosity-temperature';
import { oxidationClass } from '../../core/scoring/oxidation';
import {
  FrontierChart,
  SolvencyOxidationMap,
  ViscosityTemperatureChart,
  fittedRangeOf,
  useWidth,
  type FrontierPoint,
  type MapPoint,
  type ViscosityLineInput,
} from '../../components/charts';
import { makeFormatter } from '../../components/format';
import type { Settings } from '../../state';
import { assess, type Assessed } from './compare';

/** Oxidation rating axis, padded so that points at 1 and 5 are drawn whole. */
const OX_DOMAIN: readonly [number, number] = [0.75, 5.25];

export interface ExplorerChartsProps {
  candidates: readonly SubstituteCandidate[];
  frontier: readonly SubstituteCandidate[];
  selected: SubstituteCandidate | null;
  reference: Recipe | null;
  refAssessed: Assessed | null;
  /** The reference's cost per litre at the prices the search ran with (base currency); null → not costed. */
  referenceCost: number | null;
  components: readonly Component[];
  settings: Settings;
  onSelect: (key: string) => void;
}

export default function ExplorerCharts({ candidates, frontier, selected, reference, refAssessed, referenceCost, components, settings, onSelect }: ExplorerChartsProps) {
  const [ref, width] = useWidth<HTMLElement>(900);
  const fmt = useMemo(() => makeFormatter(settings), [settings]);
  const byId = useMemo(() => new Map(components.map((c) => [c.id, c])), [components]);
  const frontierKeys = useMemo(() => new Set(frontier.map((c) => c.key)), [frontier]);
  const refCost = referenceCost;
  const refAp = refAssessed?.props.anilinePoint?.value ?? null;
  const refOx = refAssessed?.props.oxidationRating ?? null;

  const fPoints = useMemo(() => {
    const pts: FrontierPoint[] = [];
    for (const c of candidates) {
      if (c.anilinePoint === null) continue;
      const role = c.key === selected?.key ? 'selected' : frontierKeys.has(c.key) ? 'frontier' : 'candidate';
      pts.push({ id: c.key, label: `candidate ${c.rank}`, costPerLitre: c.costPerLitre, anilinePoint: c.anilinePoint, role });
    }
    // Frontier members beyond the listed candidates still belong on the chart.
    for (const c of frontier) {
      if (c.anilinePoint === null || pts.some((p) => p.id === c.key)) continue;
      pts.push({ id: c.key, label: `candidate ${c.rank}`, costPerLitre: c.costPerLitre, anilinePoint: c.anilinePoint, role: 'frontier' });
    }
    if (refCost !== null && refAp !== null) pts.push({ id: 'reference', label: 'reference', costPerLitre: refCost, anilinePoint: refAp, role: 'reference' });
    return pts;
  }, [candidates, frontier, frontierKeys, selected, refCost, refAp]);

  const mapPoints = useMemo(() => {
    const pts: MapPoint[] = [];
    for (const c of candidates) {
      if (c.anilinePoint === null || c.oxidationRating === null) continue;
      pts.push({ id: c.key, label: `candidate ${c.rank}`, role: c.key === selected?.key ? 'selected' : 'candidate', solvency: c.anilinePoint, oxidation: c.oxidationRating });
    }
    if (refAp !== null && refOx !== null) pts.push({ id: 'reference', label: 'reference', role: 'reference', solvency: refAp, oxidation: refOx });
    // Draw the selected and the reference last so they sit on top.
    return pts.sort((a, b) => order(a.role) - order(b.role));
  }, [candidates, selected, refAp, refOx]);

  const vtLines = useMemo(() => {
    const out: ViscosityLineInput[] = [];
    if (selected) {
      for (const id of selected.componentIds) {
        const c = byId.get(id);
        if (!c || c.category === 'additive-package') continue;
        try {
          const v = kv40kv100FromPoints(c.viscosityPoints);
          out.push({ id, label: c.code, kv40: v.kv40, kv100: v.kv100, role: 'component', fittedC: fittedRangeOf(c.viscosityPoints), pourPointC: c.pourPoint });
        } catch {
          /* skip unusable data */
        }
      }
    }
    if (refAssessed) {
      out.push({
        id: 'reference',
        label: reference?.name ?? 'reference',
        kv40: refAssessed.props.kv40,
        kv100: refAssessed.props.kv100,
        role: 'reference',
        pourPointC: refAssessed.props.pourPoint,
      });
    }
    if (selected) {
      // The candidate's line is dotted below its estimated pour point, as the reference's is.
      const cand = assess(components, selected.lines, {
        method: settings.blendMethod,
        grade: reference?.grade ?? 0,
        operatingTempC: settings.operatingTempC,
        coldTempC: settings.coldStartTempC,
      });
      out.push({ id: 'candidate', label: `candidate ${selected.rank}`, kv40: selected.kv40, kv100: selected.kv100, role: 'candidate', pourPointC: cand?.props.pourPoint ?? null });
    }
    return out;
  }, [selected, byId, refAssessed, reference, components, settings.blendMethod, settings.operatingTempC, settings.coldStartTempC]);

  const full = Math.max(320, width);
  const half = full >= 900 ? Math.floor((full - 48) / 2) : full;
  const aps = mapPoints.map((p) => p.solvency);
  const apLo = Math.floor((Math.min(...aps) - 3) / 5) * 5;
  const apHi = Math.ceil((Math.max(...aps) + 3) / 5) * 5;

  return (
    <section className="explorer-charts" aria-label="Charts" ref={ref}>
      <h3>Charts</h3>
      <p className="muted">Click a point on the frontier chart to compare that candidate.</p>
      <div className="chart-row">
        <FrontierChart points={fPoints} currency={settings.currencySymbol} width={half} height={360} onSelect={onSelect} />
        <SolvencyOxidationMap
          points={mapPoints}
          width={half}
          height={360}
          xLabel={`aniline point, ${fmt.tempUnit} (right = more solvent)`}
          xTemperature
          yLabel="oxidation-stability rating"
          xDomain={[apLo, apHi]}
          xReversed
          yDomain={OX_DOMAIN}
          formatY={(v) => (Number.isInteger(v) ? `${v} ${oxidationClass(v)}` : '')}
          title="Solvency against oxidation stability (estimates on Blendbench's own scales)"
        />
      </div>
      <ViscosityTemperatureChart
        lines={vtLines}
        width={Math.min(full, 900)}
        height={380}
        operatingTempC={settings.operatingTempC}
        coldStartTempC={settings.coldStartTempC}
        formatTemp={(c) => fmt.temp(c)}
        d341Form={settings.d341Form}
        title={`Viscosity against temperature: reference${selected ? ` and candidate ${selected.rank}` : ''} (ASTM D341 axes)`}
      />
    </section>
  );
}

function order(role: MapPoint['role']): number {
  return role === 'candidate' ? 0 : role === 'reference' ? 1 : 2;
}
