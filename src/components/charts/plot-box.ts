import type { CSSProperties } from 'react';

/**
 * The style of a chart's plot box (class `chart-plot`, `content-visibility: auto` in charts.css): while
 * the plot is off screen the browser neither lays it out nor paints it, and sizes the box by the size
 * it had when last drawn (`auto`), or by `height` before it was ever drawn. Its marks are still written
 * at every edit (the page's content is always current); the browser draws them when the plot comes
 * near the window, before the frame that shows it. Its content stays in the accessibility tree.
 */
export function plotBox(height: number): CSSProperties {
  return { containIntrinsicSize: `auto ${Math.round(height)}px` };
}
