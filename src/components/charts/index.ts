import './charts.css';
// Shared chart components (recharts). Import these only from lazily loaded screens, so recharts
// stays out of the initial bundle.
export { ViscosityTemperatureChart } from './ViscosityTemperatureChart';
export type { ViscosityLineInput, ViscosityTemperatureChartProps, OilRole } from './ViscosityTemperatureChart';
export { SolvencyOxidationMap } from './SolvencyOxidationMap';
export type { MapPoint, SolvencyOxidationMapProps } from './SolvencyOxidationMap';
export { CompositionChart } from './CompositionChart';
export type { CompositionRow, CompositionChartProps } from './CompositionChart';
export { FrontierChart } from './FrontierChart';
export { BatchDistributionChart, distributionDomain, distributionPeak } from './BatchDistributionChart';
export type { BatchDistributionChartProps, DensityPoint, DistributionBand } from './BatchDistributionChart';
export { batchDistributionData, batchDistributionFromCounts, distributionEdges } from './batch-distribution-data';
export type { FrontierPoint, FrontierChartProps } from './FrontierChart';
export { d341X, d341Y, d341Kv, d341TempC, d341LineFromPoints, d341Segments, fittedRangeOf, temperatureFlag } from './d341-scale';
export { CHART_COLOURS } from './palette';
export { useWidth } from './useWidth';
export { LiveMarksProvider } from './live';
export type { LiveMarks, LiveBar, LiveDistribution } from './live';
export { roundUp } from './CompositionChart';
export { AllocationChart } from './AllocationChart';
export type { AllocationRow, AllocationChartProps } from './AllocationChart';
