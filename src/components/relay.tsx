/**
 * A relay: a small store that hands a value derived in one place (a screen's render) to the small
 * parts of the page that show pieces of it. The value is handed over after the deriving component's
 * render (`useRelayed` in a layout effect); each reader selects its piece and re-renders only when
 * that piece changes (compared with `Object.is`: a formatted string re-renders only when its text
 * does), before the browser paints. So a keystroke that changes a few numbers re-renders those
 * numbers, not the tables and panels around them. The relay holds nothing of its own: the value is
 * always the deriving component's latest result.
 */
import { memo, useLayoutEffect, useState, useSyncExternalStore, type ReactNode } from 'react';

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

/** Text selected from a relay (re-rendered only when the text changes). */
export const RelayText = memo(function RelayText<T>({ relay, select }: { relay: Relay<T>; select: (value: T) => string }) {
  return <>{useRelay(relay, select)}</>;
}) as <T>(props: { relay: Relay<T>; select: (value: T) => string }) => ReactNode;
