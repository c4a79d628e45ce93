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
 *
 * The page's opening screen (`inViewFirst`): its first draw holds only the rows that reach the
 * bottom of the window (counted after layout, before the first paint) and one spacer for the rest;
 * the rest are drawn right after the first paint, so a short table too is whole a frame later.
 */
import { startTransition, useCallback, useEffect, useLayoutEffect, useMemo, useRef, useState } from 'react';
import { flushSync } from 'react-dom';

let openingDraw = false;
/** What usually stands above a table's rows on an opening screen (header, title, toolbar) [px]: the first guess only. */
const OPENING_ABOVE_PX = 250;
/**
 * The shell says whether the page's first screen is being drawn (set before the first render, cleared
 * once a screen has been drawn): a screen may then pass `inViewFirst` to {@link useRowWindow}.
 * Screens drawn later (navigation, a screen rendered alone) draw every row at once.
 */
export function setOpeningDraw(on: boolean): void {
  openingDraw = on;
}
/** True while the page's first screen is being drawn (see {@link setOpeningDraw}). */
export function isOpeningDraw(): boolean {
  return openingDraw;
}

/** A run of rows [start, end) in the table's order: drawn, or stood in for by a spacer of `height` px. */
export type RowSegment = { kind: 'rows'; start: number; end: number } | { kind: 'gap'; start: number; end: number; height: number };

export interface RowWindowOptions {
  /** Tables with at most this many rows are drawn whole. */
  threshold?: number;
  /** Height assumed for a row before any row has been measured [px]. */
  estimatePx?: number;
  /** Rows drawn beyond each edge of the viewport [px]. */
  overscanPx?: number;
  /**
   * First draw: only the rows down to the bottom of the window (one spacer for the rest), every row
   * right after the first paint. Read once, when the table is first drawn.
   */
  inViewFirst?: boolean;
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
  // The table body, read by the effects below (a ref, not state: attaching it does not render the screen again).
  const body = useRef<HTMLTableSectionElement | null>(null);
  const bodyRef = useCallback((el: HTMLTableSectionElement | null) => {
    body.current = el;
  }, []);
  const heights = useRef(new Map<string, number>());
  const typical = useRef(estimatePx);
  const [view, setView] = useState({ top: 0, bottom: typeof window === 'undefined' ? 900 : window.innerHeight });
  const [printing, setPrinting] = useState(false);
  const windowed = keys.length > threshold && !printing;
  // The opening draw of a table drawn whole: the first `inView` rows until the first paint.
  const [inView, setInView] = useState<number | null>(() =>
    options.inViewFirst && typeof window !== 'undefined' ? Math.max(1, Math.ceil((window.innerHeight - OPENING_ABOVE_PX) / estimatePx)) : null,
  );
  const staged = inView !== null && !windowed && !printing && inView < keys.length;

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
    if (!body.current) return;
    const r = body.current.getBoundingClientRect();
    const top = -r.top;
    const bottom = top + window.innerHeight;
    setView((v) => (Math.abs(v.top - top) < 1 && Math.abs(v.bottom - bottom) < 1 ? v : { top, bottom }));
  }, []);
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
    if (!body.current || !windowed) return;
    let changed = false;
    for (const tr of body.current.querySelectorAll<HTMLTableRowElement>(`tr[${ROW_KEY_ATTR}]`)) {
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

  // Opening draw: enough rows to reach the window's bottom, counted after layout (before the paint);
  // where nothing is laid out (no layout engine) every row at once.
  useLayoutEffect(() => {
    if (!staged || !body.current) return;
    const drawn = body.current.querySelectorAll<HTMLTableRowElement>(`tr[${ROW_KEY_ATTR}]`);
    const last = drawn[drawn.length - 1];
    const bottom = last?.getBoundingClientRect().bottom ?? 0;
    const height = last?.getBoundingClientRect().height ?? 0;
    if (height <= 0) setInView(null);
    else if (bottom < window.innerHeight) setInView((n) => (n === null ? n : n + Math.ceil((window.innerHeight - bottom) / Math.min(height, estimatePx)) + 1));
  });
  // The rest right after the first paint (a transition: typing or a click comes first).
  const stagedOnce = inView !== null;
  useEffect(() => {
    if (!stagedOnce) return;
    let timer = 0;
    const frame = requestAnimationFrame(() => {
      timer = window.setTimeout(() => startTransition(() => setInView(null)));
    });
    return () => {
      cancelAnimationFrame(frame);
      window.clearTimeout(timer);
    };
  }, [stagedOnce]);

  const segments = useMemo<RowSegment[]>(() => {
    if (staged) {
      const rest = keys.length - inView;
      return [
        { kind: 'rows', start: 0, end: inView },
        { kind: 'gap', start: inView, end: keys.length, height: rest * estimatePx },
      ];
    }
    if (!windowed) return keys.length ? [{ kind: 'rows', start: 0, end: keys.length }] : [];
    const t = typical.current;
    const heightOf = (k: string) => heights.current.get(k) ?? t;
    return rowSegments(keys, heightOf, view.top, view.bottom, overscanPx, pinned);
    // `measured` stands for the heights read after layout.
  }, [staged, inView, estimatePx, windowed, keys, view, overscanPx, pinned, measured]);

  return { windowed: windowed || staged, segments, bodyRef };
}
