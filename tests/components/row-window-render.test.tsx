// @vitest-environment jsdom
/**
 * The row window's table body is attached without a state update: the screen that holds the table
 * is rendered once when it mounts, not a second time before its first paint when the body arrives
 * (s23: the Stocks screen rendered twice before its first frame).
 */
import { afterEach, describe, expect, it } from 'vitest';
import { cleanup, render } from '@testing-library/react';
import { useRowWindow } from '../../src/components/row-window';

afterEach(cleanup);

function Table({ keys, renders, inViewFirst }: { keys: string[]; renders: { n: number }; inViewFirst?: boolean }) {
  renders.n++;
  const rows = useRowWindow(keys, [], { inViewFirst });
  return (
    <table>
      <tbody ref={rows.bodyRef}>
        {rows.segments.flatMap((s) =>
          s.kind === 'gap'
            ? [<tr key={`gap-${s.start}`} />]
            : keys.slice(s.start, s.end).map((k) => (
                <tr key={k} data-row-key={k}>
                  <td>{k}</td>
                </tr>
              )),
        )}
      </tbody>
    </table>
  );
}

describe('useRowWindow, mounting', () => {
  it('renders a table drawn whole once', () => {
    const renders = { n: 0 };
    const { container } = render(<Table keys={['a', 'b', 'c']} renders={renders} />);
    expect(container.querySelectorAll('tr[data-row-key]')).toHaveLength(3);
    expect(renders.n).toBe(1);
  });

  it('a long table (windowed) mounts with one render too', () => {
    const renders = { n: 0 };
    const keys = Array.from({ length: 500 }, (_, i) => `k${i}`);
    const { container } = render(<Table keys={keys} renders={renders} />);
    expect(container.querySelectorAll('tr[data-row-key]').length).toBeLessThan(500);
    expect(renders.n).toBe(1);
  });
});
