// @vitest-environment jsdom
// Issue 10 item 2: one stock limit everywhere, entry included. A library at the limit refuses Add,
// Clone and an import that would take it over the limit, with a message where the user acted —
// never an error thrown out of the button (nothing is added, nothing lost).
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { act, cleanup, fireEvent, render, screen } from '@testing-library/react';
import LibraryScreen from '../../../src/features/library/LibraryScreen';
import { resetDemo, settingsActions, useLibrary } from '../../../src/state';
import { COLLECTION_LIMITS } from '../../../src/state/field-rules';

const MAX = COLLECTION_LIMITS.stocks;

/** Fill the library to the limit with copies of an invented demo stock (distinct ids and codes). */
function fillToLimit() {
  const comps = useLibrary.getState().components;
  const model = comps.find((c) => c.id === 'demo-bw-110')!;
  const extra = Array.from({ length: MAX - comps.length }, (_, i) => ({ ...model, id: `fill-${i}`, code: `FILL-${i}`, name: `Filler ${i}` }));
  act(() => useLibrary.setState({ components: [...comps, ...extra] }));
}

beforeEach(() => {
  resetDemo();
  settingsActions.updateSettings({ temperatureUnit: 'C', decimalSeparator: '.', thousandsGrouping: false });
});
afterEach(cleanup);

describe('Library at the stock limit', () => {
  it('Add stock and Clone say the library is full and add nothing', () => {
    render(<LibraryScreen />);
    // Show one row only, so the full library is not drawn in jsdom.
    fireEvent.change(screen.getByPlaceholderText('code or name'), { target: { value: 'BW-190' } });
    fillToLimit();
    fireEvent.click(screen.getByRole('button', { name: 'Add stock' }));
    expect(screen.getByRole('alert').textContent).toContain(`The library holds ${MAX} stocks, the most Blendbench keeps`);
    expect(useLibrary.getState().components.length).toBe(MAX);
    fireEvent.click(screen.getByRole('button', { name: /^Clone / }));
    expect(screen.getByRole('alert').textContent).toContain(`The library holds ${MAX} stocks, the most Blendbench keeps`);
    expect(useLibrary.getState().components.length).toBe(MAX);
  }, 60_000);

  it('an import that would take the library over the limit is refused before anything is stored', async () => {
    render(<LibraryScreen />);
    fireEvent.change(screen.getByPlaceholderText('code or name'), { target: { value: 'BW-190' } });
    fillToLimit();
    fireEvent.click(screen.getByRole('button', { name: 'Import CSV / JSON…' }));
    const csv = 'code,category,kv40_mm2s,kv100_mm2s,density15_kg_per_l,price\nNEW-1,group-ii,45,6.6,0.86,1\nNEW-2,group-ii,45,6.6,0.86,1\n';
    const input = await screen.findByLabelText('File', {}, { timeout: 15_000 }); // the import panel loads on first use
    await act(async () => {
      fireEvent.change(input, { target: { files: [new File([csv], 'two-new.csv', { type: 'text/csv' })] } });
    });
    await screen.findByText(`This import would add 2 stocks to the library’s ${MAX}; Blendbench keeps at most ${MAX}.`, { exact: false }, { timeout: 20_000 });
    expect((screen.getByRole('button', { name: 'Import: add 2, update 0' }) as HTMLButtonElement).disabled).toBe(true);
    expect(useLibrary.getState().components.length).toBe(MAX);
  }, 60_000);
});
