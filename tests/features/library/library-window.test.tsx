// @vitest-environment jsdom
/**
 * A long library (issue 9, item 3): the Stocks table draws only the rows near the viewport, one
 * spacer row for the rest, keeps the focused row and the open details drawn, and draws every row
 * for printing. A short library is drawn whole.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { act, cleanup, fireEvent, render, screen } from '@testing-library/react';
import LibraryScreen from '../../../src/features/library/LibraryScreen';
import { resetDemo, useLibrary } from '../../../src/state';
import { demoComponents } from '../../../src/state/demo';
import { setOpeningDraw } from '../../../src/components/row-window';

/** n invented stocks: the demo stocks repeated with codes INV-0001… (labelled invented). */
function inventedLibrary(n: number) {
  const demo = demoComponents();
  return Array.from({ length: n }, (_, i) => {
    const code = `INV-${String(i + 1).padStart(4, '0')}`;
    return { ...demo[i % demo.length]!, id: `inv-${i + 1}`, code, name: `Invented stock ${i + 1}` };
  });
}

// Cells are found through their row (getByLabelText over a table of this size takes minutes in jsdom).
const nameInput = (container: HTMLElement, id: string) => container.querySelector<HTMLTextAreaElement>(`tr[data-row-key="${id}"] .name-cell textarea`);
const drawnRows = (container: HTMLElement) => [...container.querySelectorAll('tbody tr[data-row-key]')];
const nextFrame = () => act(() => new Promise<void>((r) => requestAnimationFrame(() => r())));

beforeEach(() => {
  resetDemo();
  useLibrary.temporal.getState().clear();
});
afterEach(cleanup);

describe('Stocks table, long library', () => {
  it('draws a short library whole, without spacers', () => {
    const { container } = render(<LibraryScreen />);
    expect(drawnRows(container).length).toBe(useLibrary.getState().components.length);
    expect(screen.queryAllByTestId('row-gap')).toHaveLength(0);
  });

  it('draws only the rows near the viewport of 2,000 stocks and a spacer as tall as the rest', () => {
    useLibrary.setState({ components: inventedLibrary(2000) });
    const { container } = render(<LibraryScreen />);
    const rows = drawnRows(container);
    // viewport 768 px (jsdom's window) + 600 px overscan at the assumed 34 px a row: 41 rows (by hand: ceil(1368 / 34) = 41)
    expect(rows.length).toBe(41);
    expect(rows[0]!.getAttribute('data-row-key')).toBe('inv-1');
    const gaps = screen.getAllByTestId('row-gap');
    expect(gaps).toHaveLength(1);
    expect(gaps[0]!.style.height).toBe(`${(2000 - 41) * 34}px`);
    expect(screen.getByText(/2000 stocks\./)).toBeTruthy();
    expect(container.querySelector('table')!.getAttribute('aria-rowcount')).toBe('2001');
    expect(rows[0]!.getAttribute('aria-rowindex')).toBe('2');
  });

  it('follows the scroll, keeps the focused row drawn with its typed value, and saves it on Enter', async () => {
    useLibrary.setState({ components: inventedLibrary(2000) });
    const { container } = render(<LibraryScreen />);
    // The cell is drawn as text until edited: a click draws its field, focused.
    fireEvent.click(container.querySelector<HTMLElement>('tr[data-row-key="inv-3"] .name-cell .cell-text')!);
    const name = nameInput(container, 'inv-3')!;
    expect(name.value).toBe('Invented stock 3');
    act(() => name.focus());
    fireEvent.change(name, { target: { value: 'Typed while scrolling' } });
    // Scroll the table body 34 000 px up the viewport (row 1000 at the top).
    const body = container.querySelector('tbody')!;
    body.getBoundingClientRect = () => ({ top: -34_000, bottom: 0, left: 0, right: 0, width: 0, height: 0, x: 0, y: -34_000, toJSON: () => ({}) });
    fireEvent.scroll(window);
    await nextFrame();
    const keys = drawnRows(container).map((r) => r.getAttribute('data-row-key'));
    expect(keys).toContain('inv-1001');
    expect(keys).toContain('inv-3'); // the focused row stays drawn
    expect(keys).not.toContain('inv-10');
    expect(screen.getAllByTestId('row-gap').length).toBe(3); // before row 3, between rows 3 and ~980, after the viewport
    expect(nameInput(container, 'inv-3')).toBe(name); // the same input, not drawn anew
    expect(name.value).toBe('Typed while scrolling');
    fireEvent.keyDown(name, { key: 'Enter' });
    expect(useLibrary.getState().components[2]!.name).toBe('Typed while scrolling');
  });

  it('keeps the open details drawn and draws every row for printing (250 stocks)', () => {
    useLibrary.setState({ components: inventedLibrary(250) });
    const { container } = render(<LibraryScreen />);
    fireEvent.click(container.querySelector<HTMLButtonElement>('tr[data-row-key="inv-2"] button[aria-label="More fields of INV-0002"]')!);
    expect(container.querySelector('tr[data-details-of="inv-2"]')).toBeTruthy();
    act(() => {
      window.dispatchEvent(new Event('beforeprint'));
    });
    expect(drawnRows(container).length).toBe(250);
    expect(screen.queryAllByTestId('row-gap')).toHaveLength(0);
    act(() => {
      window.dispatchEvent(new Event('afterprint'));
    });
    expect(drawnRows(container).length).toBe(41);
  });
});

describe('Stocks table as the opening screen', () => {
  afterEach(() => setOpeningDraw(false));

  it('draws the rows down to the window bottom first (laid out before the paint), every row after the first paint', async () => {
    useLibrary.setState({ components: inventedLibrary(100) });
    setOpeningDraw(true);
    // A laid-out table: the body starts 250 px down, every row 30 px tall (jsdom has no layout engine).
    const real = Element.prototype.getBoundingClientRect;
    Element.prototype.getBoundingClientRect = function (this: Element) {
      if (this instanceof HTMLTableRowElement && this.hasAttribute('data-row-key')) {
        const i = [...this.parentElement!.children].indexOf(this);
        return { top: 250 + 30 * i, bottom: 280 + 30 * i, height: 30, left: 0, right: 100, width: 100, x: 0, y: 250 + 30 * i, toJSON: () => ({}) } as DOMRect;
      }
      return real.call(this);
    };
    try {
      const { container } = render(<LibraryScreen />);
      // jsdom's window is 768 px: first guess ceil((768 − 250) / 34) = 16 rows (bottom 730 px), then
      // ceil((768 − 730) / 30) + 1 = 3 more, reaching 820 px (by hand).
      expect(drawnRows(container).length).toBe(19);
      const gaps = screen.getAllByTestId('row-gap');
      expect(gaps).toHaveLength(1);
      expect(gaps[0]!.style.height).toBe(`${(100 - 19) * 34}px`);
      expect(container.querySelector('table')!.getAttribute('aria-rowcount')).toBe('101');
      // After the first paint every row is drawn: the screen asks for them in a task it queues from the
      // frame after its first render (row-window.ts). That frame's callback ran before ours (asked for
      // earlier), so its task is queued before the next one here, and act draws what it asked for.
      await nextFrame();
      await act(() => new Promise<void>((r) => setTimeout(r, 0)));
      expect(drawnRows(container).length).toBe(100);
      expect(screen.queryAllByTestId('row-gap')).toHaveLength(0);
    } finally {
      Element.prototype.getBoundingClientRect = real;
    }
  });

  it('draws every row at once where nothing is laid out, and when not the opening screen', () => {
    useLibrary.setState({ components: inventedLibrary(100) });
    setOpeningDraw(true);
    const first = render(<LibraryScreen />);
    expect(drawnRows(first.container).length).toBe(100);
    first.unmount();
    setOpeningDraw(false);
    const { container } = render(<LibraryScreen />);
    expect(drawnRows(container).length).toBe(100);
  });
});
