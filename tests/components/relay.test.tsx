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

  it('RelayText writes a changed text itself, without a React render, and leaves an unchanged one alone', () => {
    const relay = createRelay({ kv: 320.04 });
    let selects = 0;
    const select = (v: { kv: number }) => {
      selects++;
      return v.kv.toFixed(1);
    };
    const { container } = render(<RelayText relay={relay} select={select} />);
    const span = container.querySelector('span')!;
    const node = span.firstChild;
    expect(span.textContent).toBe('320.0');
    // Outside act(): nothing is rendered by React, yet the text follows at once, in the same text node.
    relay.set({ kv: 318.96 });
    expect(span.textContent).toBe('319.0');
    expect(span.firstChild).toBe(node);
    const seen = [] as string[];
    const mo = new MutationObserver((ms) => ms.forEach((m) => seen.push(m.type)));
    mo.observe(span, { subtree: true, characterData: true, childList: true });
    relay.set({ kv: 319.01 }); // same text "319.0"
    mo.disconnect();
    expect(mo.takeRecords().length + seen.length).toBe(0);
    expect(selects).toBeGreaterThanOrEqual(3);
  });
});

