/**
 * A deterministic in-memory stand-in for the browser's Web Locks (navigator.locks) as tab-draft.ts
 * uses them: exclusive locks by name, `ifAvailable` requests and `query`. `gate(name)` holds the next
 * request for that name until the returned function is called (a claim pending while something else
 * happens). No timing.
 */
export function memoryLocks() {
  const held = new Set<string>();
  const gates = new Map<string, Promise<void>>();
  return {
    held,
    /** Hold the next request for `name` until the returned function is called. */
    gate(name: string): () => void {
      let open!: () => void;
      gates.set(name, new Promise<void>((r) => (open = r)));
      return () => open();
    },
    async request(name: string, opts: { ifAvailable?: boolean }, cb: (lock: { name: string } | null) => unknown): Promise<unknown> {
      if (!opts.ifAvailable) throw new Error('memoryLocks: only ifAvailable requests are made');
      const gate = gates.get(name);
      gates.delete(name);
      if (gate) await gate;
      if (held.has(name)) return cb(null);
      held.add(name);
      try {
        return await cb({ name });
      } finally {
        held.delete(name);
      }
    },
    async query() {
      return { held: [...held].map((name) => ({ name, mode: 'exclusive' })), pending: [] };
    },
  };
}
