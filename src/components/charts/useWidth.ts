import { useLayoutEffect, useRef, useState } from 'react';

/**
 * Width of an element in CSS pixels, following resizes (ResizeObserver); `fallback` where the
 * browser has none (jsdom) or before the first measurement. Charts are drawn at fixed sizes from it.
 */
export function useWidth<T extends HTMLElement>(fallback: number): [React.RefObject<T | null>, number] {
  const ref = useRef<T>(null);
  const [width, setWidth] = useState(fallback);
  useLayoutEffect(() => {
    const el = ref.current;
    if (!el) return;
    const measure = () => {
      const w = Math.floor(el.getBoundingClientRect().width);
      if (w > 0) setWidth((old) => (Math.abs(old - w) >= 1 ? w : old));
    };
    measure();
    if (typeof ResizeObserver === 'undefined') return;
    const ro = new ResizeObserver(measure);
    ro.observe(el);
    return () => ro.disconnect();
  }, []);
  return [ref, width];
}
