// @vitest-environment jsdom
import { afterEach, describe, expect, it } from 'vitest';
import { act, cleanup, render } from '@testing-library/react';
import { createRelay, RelayText, useRelay, useRelayed, type Relay } from '../../src/components/relay';

afterEach(cleanup);

describe('relay', () => {
  it('tells its readers only when a different value is handed over', () => {
    const relay = createRelay({ a: 1 });
    let told = 0;
    const stop = relay.subscribe(() => told++);
    const same = relay.get();
    relay.set(same);
    expect(told).toBe(0);
    relay.set({ a: 2 });
    expect(told).toBe(1);
    expect(relay.get()).toEqual({ a: 2 });
    stop();
    relay.set({ a: 3 });
    expect(told).toBe(1);
  });

  it('re-renders a reader only when its own piece changes', () => {
    const relay = createRelay({ kv: 320.04, cost: 1.1581 });
    const renders = { kv: 0, cost: 0 };
    function Piece({ k, r }: { k: 'kv' | 'cost'; r: Relay<{ kv: number; cost: number }> }) {
      const text = useRelay(r, (v) => v[k].toFixed(1));
      renders[k]++;
      return <span data-testid={k}>{text}</span>;
    }
    const { getByTestId } = render(
      <>
        <Piece k="kv" r={relay} />
        <Piece k="cost" r={relay} />
      </>,
    );
    expect(renders).toEqual({ kv: 1, cost: 1 });
    // 1.1581 → 1.1623 keeps its text "1.2": only the viscosity re-renders.
    act(() => relay.set({ kv: 318.96, cost: 1.1623 }));
    expect(getByTestId('kv').textContent).toBe('319.0');
    expect(getByTestId('cost').textContent).toBe('1.2');
    expect(renders).toEqual({ kv: 2, cost: 1 });
  });

  it('carries the value a component derives, to readers in the same render pass', () => {
    function Screen({ n }: { n: number }) {
      const relay = useRelayed({ n });
      return <RelayText relay={relay} select={(v) => `share ${v.n} %`} />;
    }
    const { container, rerender } = render(<Screen n={3} />);
    expect(container.textContent).toBe('share 3 %');
    rerender(<Screen n={4} />);
    expect(container.textContent).toBe('share 4 %');
  });
});
