/**
 * Windowed table rows: a long table (a library of 20,000 stocks) draws only the rows near the
 * viewport, plus the rows that must stay drawn (the row holding the focus, a row with its details
 * open), and one spacer row in place of each run of rows not drawn, as tall as those rows, so the
 * page's scroll bar, scroll position and the drawn rows' places match the whole table.
 *
 * Heights: every drawn row is measured after it is laid out (with its details row, if open) and
 * remembered by its key; a row never drawn counts as the median height measured so far. Short
 * tables (up to `threshold` rows) are drawn whole, so a small library behaves like a plain table
 * (the browser's own find, printing). Before printing every row is drawn.
 *
 * The page (the document) is the scroll container; the rows' positions are read from the table
 * body's place in the viewport, on scroll and resize, at most once per animation frame.
 */
import { useCallback, useEffect, useLayoutEffect, useMemo, useRef, useState } from 'react';
import { flushSync } from 'react-dom';

/** A run of rows [start, end) in the table's order: drawn, or stood in for by a spacer of `height` px. */
export type RowSegment = { kind: 'rows'; start: number; end: number } | { kind: 'gap'; start: number; end: number; height: number };

export interface RowWindowOptions {
  /** Tables with at most this many rows are drawn whole. */
  threshold?: number;
  /** Height assumed for a row before any row has been measured [px]. */
  estimatePx?: number;
  /** Rows drawn beyond each edge of the viewport [px]. */
  overscanPx?: number;
}

export interface RowWindow {
  /** True when only part of the rows is drawn. */
  windowed: boolean;
  /** The rows in order: drawn runs and spacers (one segment [0, n) when the table is drawn whole). */
  segments: RowSegment[];
  /** Attach to the table body. */
  bodyRef: (el: HTMLTableSectionElement | null) => void;
}

/** Attribute carrying a drawn row's key (on the row's first `tr`; its details row carries `data-details-of`). */
export const ROW_KEY_ATTR = 'data-row-key';
export const DETAILS_OF_ATTR = 'data-details-of';

/** Median of the positive numbers in `xs`; `fallback` when there are none. */
function medianOf(xs: Iterable<number>, fallback: number): number {
  const s = [...xs].filter((x) => x > 0).sort((a, b) => a - b);
  return s.length ? s[s.length >> 1]! : fallback;
}

/**
 * The segments for a viewport [top, bottom] in the table body's coordinates [px]: rows overlapping
 * the viewport widened by `overscan`, and every pinned index, drawn; the rest as spacers.
 * Pure (exported for tests).
 */
export function rowSegments(
  keys: readonly string[],
  heightOf: (key: string) => number,
  top: number,
  bottom: number,
  overscan: number,
  pinned: ReadonlySet<number>,
): RowSegment[] {
  const n = keys.length;
  const from = top - overscan;
  const to = bottom + overscan;
  const drawn = new Uint8Array(n);
  let y = 0;
  for (let i = 0; i < n; i++) {
    const h = heightOf(keys[i]!);
    if (y + h > from && y < to) drawn[i] = 1;
    y += h;
    if (y >= to && i + 1 < n) {
      // Past the viewport: only pinned rows from here on.
      break;
    }
  }
  for (const p of pinned) if (p >= 0 && p < n) drawn[p] = 1;
  const out: RowSegment[] = [];
  let i = 0;
  while (i < n) {
    const start = i;
    const kind = drawn[i] ? 'rows' : 'gap';
    let height = 0;
    while (i < n && (drawn[i] ? 'rows' : 'gap') === kind) {
      if (kind === 'gap') height += heightOf(keys[i]!);
      i++;
    }
    out.push(kind === 'rows' ? { kind, start, end: i } : { kind, start, end: i, height });
  }
  return out;
}

/**
 * The window of rows to draw for a table whose rows have these keys (in order); `pinnedKeys` are
 * always drawn (focused row, open details).
 */
export function useRowWindow(keys: readonly string[], pinnedKeys: readonly (string | null | undefined)[], options: RowWindowOptions = {}): RowWindow {
  const threshold = options.threshold ?? 200;
  const estimatePx = options.estimatePx ?? 34;
  const overscanPx = options.overscanPx ?? 600;
  const [body, setBody] = useState<HTMLTableSectionElement | null>(null);
  const heights = useRef(new Map<string, number>());
  const typical = useRef(estimatePx);
  const [view, setView] = useState({ top: 0, bottom: typeof window === 'undefined' ? 900 : window.innerHeight });
  const [printing, setPrinting] = useState(false);
  const windowed = keys.length > threshold && !printing;

  const indexOf = useMemo(() => {
    const m = new Map<string, number>();
    keys.forEach((k, i) => m.set(k, i));
    return m;
  }, [keys]);
  const pinned = useMemo(() => {
    const s = new Set<number>();
    for (const k of pinnedKeys) {
      const i = k == null ? undefined : indexOf.get(k);
      if (i !== undefined) s.add(i);
    }
    return s;
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [indexOf, ...pinnedKeys]);

  // The viewport in the body's coordinates, read at most once per frame.
  const frame = useRef(0);
  const readView = useCallback(() => {
    frame.current = 0;
    if (!body) return;
    const r = body.getBoundingClientRect();
    const top = -r.top;
    const bottom = top + window.innerHeight;
    setView((v) => (Math.abs(v.top - top) < 1 && Math.abs(v.bottom - bottom) < 1 ? v : { top, bottom }));
  }, [body]);
  useEffect(() => {
    if (!windowed) return;
    const schedule = () => {
      if (!frame.current) frame.current = requestAnimationFrame(readView);
    };
    readView();
    window.addEventListener('scroll', schedule, { passive: true });
    window.addEventListener('resize', schedule);
    return () => {
      window.removeEventListener('scroll', schedule);
      window.removeEventListener('resize', schedule);
      if (frame.current) cancelAnimationFrame(frame.current);
      frame.current = 0;
    };
  }, [windowed, readView]);

  // Every row is drawn for printing (the paper copy holds the whole table).
  useEffect(() => {
    const before = () => flushSync(() => setPrinting(true));
    const after = () => setPrinting(false);
    window.addEventListener('beforeprint', before);
    window.addEventListener('afterprint', after);
    return () => {
      window.removeEventListener('beforeprint', before);
      window.removeEventListener('afterprint', after);
    };
  }, []);

  // Measure the drawn rows once laid out; a changed height moves the window (next frame).
  const [measured, setMeasured] = useState(0);
  useLayoutEffect(() => {
    if (!body || !windowed) return;
    let changed = false;
    for (const tr of body.querySelectorAll<HTMLTableRowElement>(`tr[${ROW_KEY_ATTR}]`)) {
      const key = tr.getAttribute(ROW_KEY_ATTR)!;
      let h = tr.getBoundingClientRect().height;
      const next = tr.nextElementSibling;
      if (next?.getAttribute(DETAILS_OF_ATTR) === key) h += next.getBoundingClientRect().height;
      if (h <= 0) continue; // not laid out (no layout engine)
      if (Math.abs((heights.current.get(key) ?? -1) - h) >= 0.5) {
        heights.current.set(key, h);
        changed = true;
      }
    }
    if (changed) {
      typical.current = medianOf(heights.current.values(), estimatePx);
      setMeasured((x) => x + 1);
    }
  });

  const segments = useMemo<RowSegment[]>(() => {
    if (!windowed) return keys.length ? [{ kind: 'rows', start: 0, end: keys.length }] : [];
    const t = typical.current;
    const heightOf = (k: string) => heights.current.get(k) ?? t;
    return rowSegments(keys, heightOf, view.top, view.bottom, overscanPx, pinned);
    // `measured` stands for the heights read after layout.
  }, [windowed, keys, view, overscanPx, pinned, measured]);

  return { windowed, segments, bodyRef: setBody };
}
