/** Blendbench chart colours (our own palette; contrast checked against the light background). */
export const CHART_COLOURS = {
  grid: '#dcd8cc',
  component: '#8a949a',
  reference: '#5b3a8c',
  candidate: '#0b7a75',
  frontier: '#b5651d',
  hot: '#b23a2b',
  cold: '#2f5d9a',
  cost: '#b5651d',
  mass: '#0b7a75',
  volume: '#6a8f3a',
  /** Shading of the temperatures outside −20…150 °C on the viscosity–temperature chart. */
  untrusted: '#e4e0d4',
} as const;

/** A repeating set of distinct fills for per-component bars. */
export const SERIES_FILLS = [
  '#0b7a75', '#b5651d', '#5b3a8c', '#6a8f3a', '#2f5d9a', '#a23b72', '#7a6a1f', '#3f7f9f', '#8c4a2f', '#4d6b53', '#9b5fc0', '#56606a',
] as const;
