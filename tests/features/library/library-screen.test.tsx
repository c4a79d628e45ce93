// @vitest-environment jsdom
import { beforeAll, afterEach, beforeEach, describe, expect, it } from 'vitest';
import { loadUnitConversions } from '../../../src/components/format';
import { act, cleanup, fireEvent, render, screen, waitFor, within } from '@testing-library/react';
import LibraryScreen from '../../../src/features/library/LibraryScreen';
import { cellValue, editCell } from './cells';
import { linePlanActions, recipeActions, resetDemo, settingsActions, useLibrary } from '../../../src/state';
import { setImportWorkerFactory, type ImportWorkerLike } from '../../../src/features/library/import-client';

const bs = () => useLibrary.getState().components.find((c) => c.id === 'demo-bw-190')!;
const rowOf = (code: string) => screen.getByLabelText(`Stock code of ${useLibrary.getState().components.find((c) => c.code === code)!.name}`).closest('tr')!;

/** Render the screen narrowed to the stocks matching `query` (keeps jsdom queries fast). */
function renderFor(query: string) {
  const r = render(<LibraryScreen />);
  fireEvent.change(screen.getByPlaceholderText('code or name'), { target: { value: query } });
  return r;
}

function type(el: HTMLElement, text: string, key = 'Enter') {
  fireEvent.focus(el);
  fireEvent.change(el, { target: { value: text } });
  fireEvent.keyDown(el, { key });
}

beforeEach(() => {
  resetDemo();
  useLibrary.temporal.getState().clear();
  settingsActions.updateSettings({ temperatureUnit: 'C', decimalSeparator: '.' });
});
afterEach(cleanup);


beforeAll(async () => {
  await loadUnitConversions(); // °F conversions (mathjs) load on demand
});

describe('Library screen', () => {
  it('lists the invented demo stocks with computed VI and grade beside the entered values', () => {
    renderFor('BW-190');
    expect(screen.getByText('Stocks', { selector: 'h2' })).toBeTruthy();
    expect(screen.getByText(/Invented demo library/)).toBeTruthy();
    const row = rowOf('BW-190');
    // Computed by the core from ν40 485 / ν100 31.8: VI 96 (ASTM D2270, cf. tests/reference/check-values.md V8
    // for 480/31.5 → 96.09) and in the VG 460 band 414–506 (ISO 3448).
    expect(within(row).getByText('96')).toBeTruthy();
    expect(within(row).getByText('VG 460')).toBeTruthy();
  });

  it('refuses ν100 at or above ν40 with a specific message and leaves the stock unchanged', () => {
    renderFor('BW-190');
    const kv100 = editCell('ν100 of BW-190 [mm²/s]');
    type(kv100, '500');
    expect(screen.getByText('ν100 (500 mm²/s) must be below ν40 (485 mm²/s)')).toBeTruthy();
    expect(kv100.getAttribute('aria-invalid')).toBe('true');
    expect(bs().viscosityPoints.find((p) => p.tempC === 100)!.kv).toBe(31.8); // unchanged invented demo value
    fireEvent.keyDown(kv100, { key: 'Escape' });
    expect(cellValue('ν100 of BW-190 [mm²/s]')).toBe('31.8');
  });

  it('flags an implausible value but keeps it, with the flag visible', () => {
    renderFor('BW-190');
    const aniline = editCell('Aniline point of BW-190 [°C]');
    // 250 °C: beyond the usual range but inside the stored limit (−100 to 300 °C, field-rules.ts)
    type(aniline, '250');
    expect(bs().anilinePoint).toBe(250); // no calculation: stored as typed
    expect(screen.getByText(/250 °C is outside the usual −60 °C to 180 °C for an aniline point/)).toBeTruthy();
  });

  it('edits the lot spread of ν40: empty = the category default (stated), 0–25 % accepted, beyond refused', () => {
    renderFor('BW-190');
    fireEvent.click(screen.getByRole('button', { name: /More fields of/ }));
    const field = screen.getByLabelText(/Lot-to-lot spread of ν40/);
    // the invented demo stock has none of its own: the Group I default applies (core/qc/lot-spread.ts)
    expect(screen.getByText(/empty = default for Group I: 2\.5 % \(common practice, no source/)).toBeTruthy();
    type(field, '30');
    expect(screen.getByText(/lot spread of ν40.*25/i)).toBeTruthy(); // the field rule: 0–25 % (field-rules.ts)
    expect(bs().kv40LotSpreadPct).toBeNull();
    type(field, '3.5');
    expect(bs().kv40LotSpreadPct).toBe(3.5);
  });

  it('takes a measured ν40 shear loss beside the ν100 loss, checked by its field rule (0–100 %)', () => {
    renderFor('BW-510');
    fireEvent.click(screen.getByRole('button', { name: 'More fields of BW-510' }));
    const loss40 = screen.getByLabelText('Permanent shear loss of ν40 [%]');
    expect(screen.getByLabelText('Permanent shear loss of ν100 [%]')).toBeTruthy();
    const poly = () => useLibrary.getState().components.find((c) => c.code === 'BW-510')!;
    type(loss40, '120');
    expect(loss40.getAttribute('aria-invalid')).toBe('true');
    expect(screen.getByText(/ν40 shear loss/)).toBeTruthy();
    expect(poly().shearLoss40Pct ?? null).toBeNull(); // refused: nothing stored
    type(loss40, '4.5');
    expect(poly().shearLoss40Pct).toBe(4.5);
    type(loss40, '');
    expect(poly().shearLoss40Pct).toBeNull();
  });

  it('rejects garbage and a density typed in kg/m³', () => {
    renderFor('BW-190');
    const rho = editCell('Density at 15 °C of BW-190 [kg/L]');
    type(rho, 'abc');
    expect(screen.getByText(/“abc” is not a number/)).toBeTruthy();
    type(rho, '900');
    expect(screen.getByText(/looks like kg\/m³: enter kg\/L \(e\.g\. 0\.9\)/)).toBeTruthy();
    expect(bs().density15).toBe(0.9); // no calculation: the last valid typed value (invented demo data)
  });

  it('a density typed with the other separator is refused naming the setting, never read as kg/m³ with a hint echoing it (issue 10, item 7)', () => {
    renderFor('BW-190');
    const before = bs().density15;
    const rho = editCell('Density at 15 °C of BW-190 [kg/L]');
    // "." chosen: "0,885" could be 0.885 or 885; it must not become 885 with "looks like kg/m³ … (e.g. 0.885)"
    type(rho, '0,885');
    const alert = screen.getByRole('alert').textContent!;
    expect(alert).toMatch(/Decimal separator is “\.” \(Settings\): “0,885” could mean 0\.885 or 885/);
    expect(alert).not.toMatch(/kg\/m³/);
    expect(bs().density15).toBe(before); // nothing stored
    cleanup();
    settingsActions.updateSettings({ decimalSeparator: ',' });
    renderFor('BW-190');
    const rho2 = editCell('Density at 15 °C of BW-190 [kg/L]');
    type(rho2, '0.885'); // the mirror case
    const alert2 = screen.getByRole('alert').textContent!;
    expect(alert2).toMatch(/Decimal separator is “,” \(Settings\): “0\.885” could mean 0,885 or 885/);
    expect(alert2).not.toMatch(/kg\/m³/);
    type(rho2, '1.234,5'); // grouped thousands: a real 1234.5, so the hint applies
    expect(screen.getByRole('alert').textContent).toMatch(/looks like kg\/m³/);
    expect(bs().density15).toBe(before);
  });

  it('withdrawing a stock used in recipes says which recipes and that their blend sheets print on hold (s25 walk: Stocks said nothing)', () => {
    renderFor('BW-160');
    fireEvent.change(editCell('Availability of BW-160'), { target: { value: 'withdrawn' } });
    expect(useLibrary.getState().components.find((c) => c.code === 'BW-160')!.availability).toBe('withdrawn');
    // BW-160 is in the invented demo recipes VG 220, VG 320 and VG 460 (src/state/demo.ts)
    expect(
      screen.getByText(
        'BW-160 is withdrawn. It is used in 3 saved recipes (Gear oil VG 220 — current recipe (invented demo); Gear oil VG 320 — current recipe (invented demo); Gear oil VG 460 — current recipe (invented demo)): their blend sheets print on hold (not for release) until they are revised without it.',
      ),
    ).toBeTruthy();
  });

  it('edits are one undo step each; clone, withdraw and delete can be undone', () => {
    renderFor('BW-190');
    // no calculation: 485 is the invented demo value, 490 the typed one
    type(editCell('ν40 of BW-190 [mm²/s]'), '490');
    // BW-190 is in every demo recipe: the change is confirmed first (issue 10, item 14)
    fireEvent.click(screen.getByRole('button', { name: /Store the change/ }));
    expect(bs().viscosityPoints[0]!.kv).toBe(490);
    fireEvent.change(editCell('Availability of BW-190'), { target: { value: 'withdrawn' } });
    expect(bs().availability).toBe('withdrawn');
    fireEvent.click(screen.getByRole('button', { name: 'Clone BW-190' }));
    expect(useLibrary.getState().components.some((c) => c.code === 'BW-190-copy')).toBe(true);
    fireEvent.click(screen.getByRole('button', { name: 'Delete BW-190-copy' }));
    expect(useLibrary.getState().components.some((c) => c.code === 'BW-190-copy')).toBe(false);
    const toolbar = screen.getByRole('toolbar', { name: 'Library actions' });
    const undo = within(toolbar).getByRole('button', { name: 'Undo' });
    fireEvent.click(undo); // delete
    expect(useLibrary.getState().components.some((c) => c.code === 'BW-190-copy')).toBe(true);
    fireEvent.click(undo); // clone
    fireEvent.click(undo); // availability
    expect(bs().availability).toBe('limited');
    fireEvent.click(undo); // ν40
    expect(bs().viscosityPoints[0]!.kv).toBe(485);
    fireEvent.click(within(toolbar).getByRole('button', { name: 'Redo' }));
    expect(bs().viscosityPoints[0]!.kv).toBe(490);
  });

  it('Add stock prices the new stock in the base currency of the settings, not in EUR whatever the base (s24 hunt)', () => {
    settingsActions.updateSettings({ baseCurrency: 'USD' });
    try {
      renderFor('NEW');
      fireEvent.click(screen.getByRole('button', { name: 'Add stock' }));
      const added = useLibrary.getState().components.at(-1)!;
      // A price typed for it is in the base currency: never restated at the EUR rate unseen.
      expect(added.price.currency).toBe('USD');
    } finally {
      settingsActions.updateSettings({ baseCurrency: 'EUR' });
    }
  });

  it('a stock just added or cloned has its code field focused, ready to type (s25); before, the focus stayed on the button and the new row was out of sight', () => {
    renderFor('NEW');
    fireEvent.click(screen.getByRole('button', { name: 'Add stock' }));
    const added = useLibrary.getState().components.at(-1)!;
    const focused = document.activeElement as HTMLElement;
    expect(focused.closest('tr')?.getAttribute('data-row-key')).toBe(added.id);
    expect(focused.getAttribute('aria-label')).toMatch(/^Stock code of /);

    fireEvent.change(screen.getByPlaceholderText('code or name'), { target: { value: 'BW-190' } });
    fireEvent.click(screen.getByRole('button', { name: 'Clone BW-190' }));
    const copy = useLibrary.getState().components.find((c) => c.code === 'BW-190-copy')!;
    expect((document.activeElement as HTMLElement).closest('tr')?.getAttribute('data-row-key')).toBe(copy.id);
    expect(document.activeElement?.getAttribute('aria-label')).toMatch(/^Stock code of /);
  });

  it('writes the currency beside a price quoted in another currency than the base, so one column never mixes them unseen (s24 hunt)', () => {
    settingsActions.updateSettings({ baseCurrency: 'USD' });
    try {
      renderFor('BW-19');
      // BW-190 is quoted in EUR (invented demo): beside its price "EUR/t"; a price in the base currency keeps "/t".
      expect(within(rowOf('BW-190')).getByTitle('EUR /t').textContent).toBe('EUR/t');
      act(() => {
        expect(useLibrary.getState().updateComponent('demo-bw-190', { price: { ...bs().price, currency: 'usd' } })).toBeNull();
      });
      expect(within(rowOf('BW-190')).getByTitle('/t').textContent).toBe('/t');
    } finally {
      settingsActions.updateSettings({ baseCurrency: 'EUR' });
    }
  });

  it('an imported new stock whose row names no currency is priced in the base currency, as the panel says (s24 hunt)', async () => {
    settingsActions.updateSettings({ baseCurrency: 'USD' });
    try {
      renderFor('X-1');
      fireEvent.click(screen.getByRole('button', { name: 'Import CSV / JSON…' }));
      const input = await screen.findByLabelText('File', {}, { timeout: 15_000 });
      expect(screen.getByText(/names no currency is priced in the base currency \(USD\)/)).toBeTruthy();
      const csv = 'code,name,category,kv40_mm2s,kv100_mm2s,density15_kg_per_l,price\nX-1,Invented stock,group-ii,100,11,0.87,1.2\n'; // invented values
      await act(async () => {
        fireEvent.change(input, { target: { files: [new File([csv], 'new.csv', { type: 'text/csv' })] } });
      });
      await screen.findByText('new.csv is valid.');
      fireEvent.click(screen.getByRole('button', { name: 'Import: add 1, update 0' }));
      expect(useLibrary.getState().components.find((c) => c.code === 'X-1')!.price).toEqual({ amount: 1.2, basis: 'per-kg', currency: 'USD' });
    } finally {
      settingsActions.updateSettings({ baseCurrency: 'EUR' });
    }
  });

  it('does not delete a stock used in a recipe and says why', () => {
    renderFor('BW-190');
    fireEvent.click(screen.getByRole('button', { name: 'Delete BW-190' }));
    expect(screen.getByText(/BW-190 is used in 4 recipes/)).toBeTruthy();
    expect(bs()).toBeTruthy();
  });

  it('does not delete a stock the whole-line plan or a QC record still names, and says where (plant loop defect hunt)', () => {
    // BW-499 is in no recipe: kept in use by the line plan, and on hand for a batch correction of VG 320
    linePlanActions.setKeep('demo-bw-499', 20_000);
    recipeActions.setQcInputs('demo-vg320', {
      correction: { kv40: null, kv100: null, massKg: null, vesselLimitKg: null, bandPct: null, objective: 'cost', onHandKg: {}, stockIds: ['demo-bw-499'] },
    });
    renderFor('BW-499');
    fireEvent.click(screen.getByRole('button', { name: 'Delete BW-499' }));
    const text = screen.getByText(/BW-499 is named in/).textContent!;
    expect(text).toMatch(/the whole-line plan \(kept in use\)/);
    expect(text).toMatch(/the QC loop of “Gear oil VG 320 — current recipe \(invented demo\)” \(stocks on hand for a correction\)/);
    expect(text).toMatch(/so it was not deleted/);
    expect(useLibrary.getState().components.some((c) => c.id === 'demo-bw-499')).toBe(true);
    // once no longer named, it can be deleted
    act(() => {
      linePlanActions.setKeep('demo-bw-499', null);
      recipeActions.setQcInputs('demo-vg320', {
        correction: { kv40: null, kv100: null, massKg: null, vesselLimitKg: null, bandPct: null, objective: 'cost', onHandKg: {}, stockIds: [] },
      });
    });
    fireEvent.click(screen.getByRole('button', { name: 'Delete BW-499' }));
    expect(useLibrary.getState().components.some((c) => c.id === 'demo-bw-499')).toBe(false);
  });

  it('refuses a duplicate stock code', () => {
    renderFor('BW-190');
    const code = editCell('Stock code of Group I bright stock');
    type(code, 'BW-160');
    expect(screen.getByText(/BW-160 is already used by/)).toBeTruthy();
    expect(bs().code).toBe('BW-190');
  });

  it('shows temperatures in °F when chosen, and stores °C', () => {
    act(() => settingsActions.updateSettings({ temperatureUnit: 'F' }));
    renderFor('BW-190');
    const aniline = editCell('Aniline point of BW-190 [°F]') as HTMLInputElement;
    // 122 °C = 251.6 °F (t_F = 9/5·t_C + 32, definition of the Fahrenheit scale)
    expect(aniline.value).toBe('251.6');
    type(aniline, '212');
    // 212 °F = 100 °C (definition)
    expect(bs().anilinePoint).toBeCloseTo(100, 10);
  });

  it('imports nothing from a file with errors and shows the per-row report', async () => {
    renderFor('BW-190');
    fireEvent.click(screen.getByRole('button', { name: 'Import CSV / JSON…' }));
    const before = useLibrary.getState().components;
    const file = new File(['code,category,kv40_mm2s,kv100_mm2s,density15_kg_per_l,price\nX-1,group-ii,10,20,0.86,1\n'], 'bad.csv', { type: 'text/csv' });
    const input = await screen.findByLabelText('File', {}, { timeout: 15_000 }); // the import panel loads on first use
    await act(async () => {
      fireEvent.change(input, { target: { files: [file] } });
    });
    await screen.findByText('1 of 1 rows have errors; nothing was imported.');
    expect(within(screen.getByRole('table', { name: 'Import preview' })).getByText(/must be below ν40/)).toBeTruthy();
    expect((screen.getByRole('button', { name: 'Import' }) as HTMLButtonElement).disabled).toBe(true);
    expect(useLibrary.getState().components).toBe(before);
  });

  it('refuses ν100 below 2.0 mm²/s (ASTM D2270 scope) and keeps the stored value', () => {
    renderFor('BW-190');
    const kv100 = editCell('ν100 of BW-190 [mm²/s]') as HTMLInputElement;
    type(kv100, '0.001');
    expect(screen.getByRole('alert').textContent).toMatch(/0\.001 mm²\/s is below 2 mm²\/s, where ASTM D2270 defines no viscosity index/);
    expect(bs().viscosityPoints.find((p) => p.tempC === 100)!.kv).toBe(31.8); // unchanged invented demo value
  });

  it('shows why there is no VI while the ν100 on screen is not below ν40, and the VI again after Escape', () => {
    renderFor('BW-190');
    const row = rowOf('BW-190');
    const kv100 = editCell('ν100 of BW-190 [mm²/s]') as HTMLInputElement;
    fireEvent.focus(kv100);
    fireEvent.change(kv100, { target: { value: '500' } });
    const vi = within(row).getByTestId('vi-cell');
    expect(vi.textContent).toMatch(/^ν100 ≥ ν40/);
    expect(vi.textContent).not.toMatch(/\d{3}$/);
    fireEvent.keyDown(kv100, { key: 'Escape' });
    // ν40 485 / ν100 31.8 → VI 96 (ASTM D2270; cf. tests/reference/check-values.md V8: 480/31.5 → 96.09)
    expect(within(row).getByTestId('vi-cell').textContent).toBe('96');
  });

  it('reads a stock above VG 3200 as "above VG 3200", not "near"', () => {
    renderFor('BW-190');
    const kv40 = editCell('ν40 of BW-190 [mm²/s]');
    type(kv40, '5000');
    fireEvent.click(screen.getByRole('button', { name: /Store the change/ }));
    // ISO 3448 / ASTM D2422: VG 3200 ends at 3520 mm²/s
    expect(within(rowOf('BW-190')).getByTestId('grade-cell').textContent).toBe('above VG 3200');
  });

  it('refuses a blank or control-character name and stock code', () => {
    renderFor('BW-190');
    const name = editCell('Name of BW-190');
    type(name, '   ');
    expect(screen.getByRole('alert').textContent).toBe('a name is required');
    type(name, 'Bright\u0007stock');
    expect(screen.getByRole('alert').textContent).toMatch(/control character \(U\+0007\)/);
    expect(bs().name).toBe('Group I bright stock');
    fireEvent.keyDown(name, { key: 'Escape' });
    const code = editCell('Stock code of Group I bright stock');
    type(code, ' ');
    expect(screen.getByRole('alert').textContent).toBe('a stock code is required');
    expect(bs().code).toBe('BW-190');
  });

  it('previews an update field by field (stored → imported), shows unchanged rows, and keeps absent columns (issue 10 item 3)', async () => {
    useLibrary.getState().updateComponent('demo-bw-190', { availability: 'withdrawn', price: { amount: 1150, basis: 'per-tonne', currency: 'EUR' } });
    const b = bs();
    const kv = (t: number) => b.viscosityPoints.find((p) => p.tempC === t)!.kv;
    renderFor('BW-190');
    fireEvent.click(screen.getByRole('button', { name: 'Import CSV / JSON…' }));
    const csv = `code,category,kv40_mm2s,kv100_mm2s,density15_kg_per_l,price\nBW-190,${b.category},${kv(40)},${kv(100)},${b.density15},1200\n`;
    await act(async () => {
      fireEvent.change(screen.getByLabelText('File'), { target: { files: [new File([csv], 'update.csv', { type: 'text/csv' })] } });
    });
    await screen.findByText('update.csv is valid.');
    const table = screen.getByRole('table', { name: 'Import preview' });
    expect(within(table).getByText('price: 1150 → 1200')).toBeTruthy();
    expect(within(table).queryByText(/availability/)).toBeNull();
    fireEvent.click(screen.getByRole('button', { name: 'Import: add 0, update 1' }));
    expect(bs().availability).toBe('withdrawn');
    expect(bs().price).toEqual({ amount: 1200, basis: 'per-tonne', currency: 'EUR' });
    expect(bs().name).toBe(b.name);
    expect(bs().notes).toBe(b.notes);
  });

  it('checks a file with a progress bar and can cancel it, changing nothing', async () => {
    renderFor('BW-190');
    fireEvent.click(screen.getByRole('button', { name: 'Import CSV / JSON…' }));
    const before = useLibrary.getState().components;
    // A stand-in worker that reports progress and then waits (as a long check would).
    let terminated = false;
    setImportWorkerFactory(() => {
      const w: ImportWorkerLike = {
        onmessage: null,
        onerror: null,
        postMessage(m) {
          if (m.type === 'start') setTimeout(() => w.onmessage?.({ data: { type: 'progress', runId: m.runId, done: 5000, total: 20000 } } as MessageEvent));
        },
        terminate() {
          terminated = true;
        },
      };
      return w;
    });
    const file = new File(['code,category,kv40_mm2s,kv100_mm2s,density15_kg_per_l,price\nP-1,group-ii,45,6.6,0.86,1\n'], 'big.csv', { type: 'text/csv' });
    await act(async () => {
      fireEvent.change(screen.getByLabelText('File'), { target: { files: [file] } });
    });
    // Counts in the user's number format (default: no grouping below five digits, a narrow space above).
    await screen.findByText(/^Checking big\.csv: 5000 of 20\s000 rows$/);
    expect((screen.getByRole('progressbar') as HTMLProgressElement).value).toBe(5000);
    fireEvent.click(screen.getByRole('button', { name: 'Cancel checking' }));
    await waitFor(() => expect(screen.queryByRole('progressbar')).toBeNull(), { timeout: 10_000 });
    expect(screen.queryByRole('table', { name: 'Import preview' })).toBeNull();
    expect(terminated).toBe(true);
    expect(useLibrary.getState().components).toBe(before);
    setImportWorkerFactory(null);
  });
});
