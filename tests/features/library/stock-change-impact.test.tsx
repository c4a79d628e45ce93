// @vitest-environment jsdom
/**
 * A stock change that moves saved recipes is shown before it is stored (issue 10, item 14): the
 * recipes affected with ν40 old → new and whether they leave their band; cancel keeps the stored
 * value; storing it flags the recipes as changed since saved.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { act, cleanup, fireEvent, render, screen, within } from '@testing-library/react';
import LibraryScreen from '../../../src/features/library/LibraryScreen';
import { editCell } from './cells';
import { resetDemo, settingsActions, useLibrary, useRecipes } from '../../../src/state';
import { stockBasisChanges } from '../../../src/core/recipes/stock-basis';

const pib = () => useLibrary.getState().components.find((c) => c.id === 'demo-bw-510')!;
const kv40Of = (id: string) => useLibrary.getState().components.find((c) => c.id === id)!.viscosityPoints.find((p) => p.tempC === 40)!.kv;

function type(el: HTMLElement, text: string) {
  fireEvent.focus(el);
  fireEvent.change(el, { target: { value: text } });
  fireEvent.keyDown(el, { key: 'Enter' });
}

beforeEach(() => {
  resetDemo();
  useLibrary.temporal.getState().clear();
  settingsActions.updateSettings({ temperatureUnit: 'C', decimalSeparator: '.', blendMethod: 'refutas' });
});
afterEach(cleanup);

describe('stock changes that move saved recipes', () => {
  it('shows the recipes affected before storing, and cancel keeps the stored value', () => {
    render(<LibraryScreen />);
    fireEvent.change(screen.getByPlaceholderText('code or name'), { target: { value: 'BW-510' } });
    type(editCell(/^ν40 of BW-510/), '9000');
    const dialog = screen.getByRole('alertdialog');
    expect(dialog.textContent).toMatch(/Changing the viscosities of BW-510 moves 1 saved recipe/);
    const row = within(screen.getByTestId('impact-table')).getAllByRole('row')[1]!;
    // The invented VG 680 demo recipe predicts 682.9 mm²/s with the stored data (Refutas; as the designer shows).
    expect(row.textContent).toMatch(/Gear oil VG 680/);
    expect(row.textContent).toMatch(/682\.9/);
    expect(row.textContent).toMatch(/VG 680 \(612\.0–748\.0\)/); // ISO 3448 VG 680 band: mid-point 680 ± 10 % (standard, ISO 3448 table; check-values.md grade list)
    fireEvent.click(screen.getByRole('button', { name: /Cancel — keep the stored data/ }));
    expect(screen.queryByRole('alertdialog')).toBeNull();
    expect(kv40Of('demo-bw-510')).toBe(6500); // invented demo value, unchanged
    expect(screen.getByText(/Nothing changed: BW-510 keeps its stored viscosities/)).toBeTruthy();
  });

  it('stores the change when confirmed; the recipe is then flagged as changed since saved', () => {
    render(<LibraryScreen />);
    fireEvent.change(screen.getByPlaceholderText('code or name'), { target: { value: 'BW-510' } });
    type(editCell(/^ν40 of BW-510/), '9000');
    fireEvent.click(screen.getByRole('button', { name: /Store the change/ }));
    expect(kv40Of('demo-bw-510')).toBe(9000);
    const vg680 = useRecipes.getState().recipes.find((r) => r.id === 'demo-vg680')!;
    expect(stockBasisChanges(vg680.stockBasis, useLibrary.getState().components).map((c) => c.code)).toEqual(['BW-510']);
    expect(screen.getByText(/1 saved recipe is flagged as changed since saved/)).toBeTruthy();
  });

  it('stores at once a change that moves no saved recipe', () => {
    render(<LibraryScreen />);
    fireEvent.change(screen.getByPlaceholderText('code or name'), { target: { value: 'BW-612' } });
    type(editCell(/^ν40 of BW-612/), '111');
    expect(screen.queryByRole('alertdialog')).toBeNull();
    expect(kv40Of('demo-bw-612')).toBe(111);
    expect(pib().calibration).toBeNull();
  });

  it('an import that updates a stock shows the saved recipes it moves before it is confirmed', async () => {
    await import('../../../src/features/library/ImportPanel'); // loaded on first use
    render(<LibraryScreen />);
    await act(async () => {
      fireEvent.click(screen.getByRole('button', { name: 'Import CSV / JSON…' }));
    });
    const p = pib();
    const kv100 = p.viscosityPoints.find((x) => x.tempC === 100)!.kv;
    const csv = `code,category,kv40_mm2s,kv100_mm2s,density15_kg_per_l,price\nBW-510,${p.category},9000,${kv100},${p.density15},${p.price.amount}\n`;
    await act(async () => {
      fireEvent.change(await screen.findByLabelText('File', {}, { timeout: 20000 }), { target: { files: [new File([csv], 'pib.csv', { type: 'text/csv' })] } });
    });
    await screen.findByText('pib.csv is valid.');
    const box = screen.getByTestId('import-impact');
    expect(box.textContent).toMatch(/This import moves 1 saved recipe/);
    const row = within(within(box).getByTestId('impact-table')).getAllByRole('row')[1]!;
    // The invented VG 680 demo recipe predicts 682.9 mm²/s with the stored data (Refutas; as the designer shows).
    expect(row.textContent).toMatch(/Gear oil VG 680/);
    expect(row.textContent).toMatch(/682\.9/);
    expect(kv40Of('demo-bw-510')).toBe(6500); // nothing stored yet (invented demo value)
    fireEvent.click(screen.getByRole('button', { name: 'Import: add 0, update 1 (1 saved recipe moves)' }));
    expect(kv40Of('demo-bw-510')).toBe(9000);
  }, 120_000); // the import panel and its worker fallback load on first use: slow on a busy machine
});
