/**
 * A relay: a small store that hands a value derived in one place to the small parts of the page
 * that show pieces of it. The value is handed over either by the deriving code as it derives it
 * (`createRelay` + `set`, e.g. from a store subscription, in the same task as the change) or after
 * a component's render (`useRelayed`, in a layout effect). Readers select their piece: `useRelay`
 * re-renders its caller only when the piece changes (compared with `Object.is`), and `RelayText`
 * writes its text node itself when the text changes, without a React render. So a keystroke that
 * changes a few numbers touches those numbers, not the tables and panels around them, before the
 * browser paints. The relay holds nothing of its own: the value is always the deriver's latest.
 */
import { memo, useLayoutEffect, useRef, useState, useSyncExternalStore, type ReactNode } from 'react';

export interface Relay<T> {
  /** The value as last handed over. */
  get(): T;
  subscribe(onChange: () => void): () => void;
  /** Hands over a new value; readers are told when it is a different object. */
  set(value: T): void;
}

export function createRelay<T>(initial: T): Relay<T> {
  let value = initial;
  const listeners = new Set<() => void>();
  return {
    get: () => value,
    subscribe: (onChange) => {
      listeners.add(onChange);
      return () => void listeners.delete(onChange);
    },
    set: (next) => {
      if (next === value) return;
      value = next;
      for (const l of listeners) l();
    },
  };
}

/**
 * A relay for the caller's lifetime that carries `value`: created with the first value, then given
 * each new one after the render (layout effect), so its readers update in the same task.
 */
export function useRelayed<T>(value: T): Relay<T> {
  const [relay] = useState(() => createRelay(value));
  useLayoutEffect(() => relay.set(value), [relay, value]);
  return relay;
}

/** One piece of the relay's value; the caller re-renders when the piece changes. */
export function useRelay<T, R>(relay: Relay<T>, select: (value: T) => R): R {
  const read = () => select(relay.get());
  return useSyncExternalStore(relay.subscribe, read, read);
}

/**
 * Text selected from a relay, in a span of its own. React renders the text once; after that the
 * span follows the relay by itself: at each new value it writes the text node only when the text
 * changed, in the same task as the value is handed over, without a React render or commit.
 */
export const RelayText = memo(function RelayText<T>({ relay, select, className }: { relay: Pick<Relay<T>, 'get' | 'subscribe'>; select: (value: T) => string; className?: string }) {
  const ref = useRef<HTMLSpanElement>(null);
  const text = select(relay.get());
  useLayoutEffect(() => {
    const span = ref.current;
    if (!span) return;
    const follow = () => {
      const next = select(relay.get());
      if (span.textContent === next) return;
      // Change the text node in place (no node removed or added); React set it as the span's text.
      const node = span.firstChild;
      if (node && node.nodeType === Node.TEXT_NODE && node === span.lastChild && next !== '') (node as Text).data = next;
      else span.textContent = next;
    };
    follow();
    return relay.subscribe(follow);
  }, [relay, select]);
  return (
    <span ref={ref} className={className}>
      {text}
    </span>
  );
}) as <T>(props: { relay: Pick<Relay<T>, 'get' | 'subscribe'>; select: (value: T) => string; className?: string }) => ReactNode;
