// @vitest-environment jsdom
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { act, cleanup, fireEvent, render, screen, within } from '@testing-library/react';
import BlendSheetScreen from '../../../src/features/blend-sheet/BlendSheetScreen';
import { recipeActions, resetDemo, settingsActions, useLibrary, useRecipes } from '../../../src/state';
import { loadUnitConversions } from '../../../src/components/format';

beforeEach(() => {
  resetDemo();
  window.location.hash = '';
  recipeActions.setActiveRecipe('demo-vg320');
  settingsActions.updateSettings({ temperatureUnit: 'C', decimalSeparator: '.', operatingTempC: 60 });
});
afterEach(cleanup);

describe('Blend sheet screen (stores wired)', () => {
  it('remembers lot, batch size and unit, vessel and edited instructions per recipe after leaving the screen', () => {
    const first = render(<BlendSheetScreen />);
    fireEvent.change(screen.getByLabelText('Batch / lot no.'), { target: { value: 'L-0042' } });
    fireEvent.change(screen.getByLabelText('Batch size'), { target: { value: '2500' } });
    fireEvent.change(screen.getByLabelText('Batch size unit'), { target: { value: 'litres' } });
    fireEvent.change(screen.getByLabelText('Vessel'), { target: { value: 'Kettle 3' } });
    fireEvent.click(screen.getByRole('button', { name: 'Edit instructions' }));
    fireEvent.change(screen.getByLabelText('Instructions, one step per line'), { target: { value: 'Charge the bright stock.\nMix 45 min.' } });
    first.unmount();

    render(<BlendSheetScreen />);
    expect((screen.getByLabelText('Batch / lot no.') as HTMLInputElement).value).toBe('L-0042');
    expect((screen.getByLabelText('Batch size') as HTMLInputElement).value).toBe('2500');
    expect((screen.getByLabelText('Batch size unit') as HTMLSelectElement).value).toBe('litres');
    expect((screen.getByLabelText('Vessel') as HTMLInputElement).value).toBe('Kettle 3');
    expect(screen.getByText('Mix 45 min.')).toBeTruthy();
    expect(useRecipes.getState().sheets['demo-vg320']!.lot).toBe('L-0042');

    // Another recipe has its own (default) fields.
    fireEvent.change(screen.getByLabelText('Recipe'), { target: { value: 'demo-vg220' } });
    expect((screen.getByLabelText('Batch / lot no.') as HTMLInputElement).value).toBe('');
    expect((screen.getByLabelText('Batch size') as HTMLInputElement).value).toBe('1000');
    expect(screen.getByText(/^Heat to 50–65 °C/)).toBeTruthy();
  });

  it('prints temperatures in the unit chosen in the settings, with the unit', () => {
    settingsActions.updateSettings({ temperatureUnit: 'F' });
    render(<BlendSheetScreen />);
    // t_F = 9/5·t_C + 32 (common practice, no source): 50–65 °C → 122–149 °F; 60 °C → 140 °F
    expect(screen.getByText(/^Heat to 122–149 °F with agitation/)).toBeTruthy();
    const qc = screen.getByRole('table', { name: /Predicted properties and QC release/ });
    expect(within(qc).getByText('Viscosity at 140 °F (calculated)')).toBeTruthy();
    const flash = within(qc).getByRole('row', { name: /Flash point/ });
    expect(within(flash).getByText('°F')).toBeTruthy();
    const pour = within(qc).getByRole('row', { name: /Pour point/ });
    expect(within(pour).getByText('°F')).toBeTruthy();
    // the metering column names the Settings temperature in the chosen unit: 60 °C = 140 °F (same definition);
    // litres at 15 °C keep the standard reference temperature of the volume tables
    const components = screen.getByRole('table', { name: /Components, in charging order/ });
    expect(within(components).getByRole('columnheader', { name: 'L at 140 °F' })).toBeTruthy();
    expect(within(components).queryByRole('columnheader', { name: /L at 60 °C/ })).toBeNull();
  });
});

describe('Blend sheet follows the temperature unit of the settings (second defect hunt)', () => {
  it('writes the stock data changed since the recipe was saved with the decimal separator and temperature unit of the settings', async () => {
    await loadUnitConversions(); // °F conversions (mathjs) load on demand
    settingsActions.updateSettings({ temperatureUnit: 'F', decimalSeparator: ',' });
    try {
      const id = useRecipes.getState().recipes.find((r) => r.id === 'demo-vg320')!.lines[0]!.componentId;
      const old = useLibrary.getState().components.find((c) => c.id === id)!;
      // Invented edits: density +0.002 kg/L, pour point −6 °C → −12 °C (= 21.2 °F → 10.4 °F, t_F = 9/5·t_C + 32)
      act(() =>
        useLibrary.setState((st) => ({
          components: st.components.map((c) => (c.id === id ? { ...c, density15: old.density15 + 0.002, pourPoint: -12 } : c)),
        })),
      );
      render(<BlendSheetScreen />);
      const said = screen.getByTestId('stock-changed').textContent ?? '';
      expect(said).toContain(`density at 15 °C ${String(old.density15).replace('.', ',')} kg/L → ${String(Number((old.density15 + 0.002).toPrecision(6))).replace('.', ',')} kg/L`);
      expect(said).toMatch(/pour point [^;]*→ 10,4 °F/);
      expect(said).not.toMatch(/\d\.\d/);
    } finally {
      settingsActions.updateSettings({ temperatureUnit: 'C', decimalSeparator: '.' });
    }
  });

  it('says when a stock of the recipe was given another code since it was saved, old → new, as the sheet prints the code now (s23 defect hunt)', () => {
    const id = useRecipes.getState().recipes.find((r) => r.id === 'demo-vg320')!.lines[0]!.componentId;
    const old = useLibrary.getState().components.find((c) => c.id === id)!;
    act(() => useLibrary.setState((st) => ({ components: st.components.map((c) => (c.id === id ? { ...c, code: 'BW-999' } : c)) })));
    render(<BlendSheetScreen />);
    expect(screen.getByTestId('stock-changed').textContent).toContain(`BW-999 stock code ${old.code} → BW-999`);
  });

  it('names the delivery temperature of the cost per delivered litre in °F when °F is chosen', () => {
    settingsActions.updateSettings({ temperatureUnit: 'F', deliveryTempC: 40 });
    try {
      render(<BlendSheetScreen />);
      fireEvent.click(screen.getByLabelText('Costing copy'));
      // t_F = 9/5·t_C + 32 (definition of the Fahrenheit scale): 40 °C = 104 °F
      expect(screen.getByTestId('cost-delivered').textContent).toMatch(/per delivered litre at 104 °F/);
      expect(screen.getByTestId('cost-delivered').textContent).not.toMatch(/40 °C/);
    } finally {
      settingsActions.updateSettings({ temperatureUnit: 'C', deliveryTempC: 15 });
    }
  });
});

describe('Blend sheet fields keep to the stored limits (issue 10 item 1)', () => {
  it('refuses a 500-character lot and vessel, 25,000 characters of instructions and a 40-digit batch size, keeping the saved values', () => {
    render(<BlendSheetScreen />);
    const lot = screen.getByLabelText('Batch / lot no.') as HTMLInputElement;
    fireEvent.change(lot, { target: { value: 'L-7' } });
    fireEvent.change(lot, { target: { value: 'L'.repeat(500) } });
    // Limits from src/state/field-rules.ts (lot 120, vessel 120, instructions 20,000 characters; batch ≤ 1e7)
    expect(screen.getByText(/The lot number is 500 characters long; at most 120 can be saved\. Not saved/)).toBeTruthy();
    expect(lot.value).toBe('L'.repeat(500)); // still shown for the user to shorten
    expect(useRecipes.getState().sheets['demo-vg320']!.lot).toBe('L-7');

    fireEvent.change(screen.getByLabelText('Vessel'), { target: { value: 'V'.repeat(500) } });
    expect(screen.getByText(/The vessel is 500 characters long/)).toBeTruthy();
    fireEvent.change(screen.getByLabelText('Batch size'), { target: { value: '1234567890123456789012345678901234567890' } });
    expect(screen.getByText(/The batch size 1\.23457e\+39 is outside the possible range \(above 0 and at most 10000000\)/)).toBeTruthy();
    fireEvent.click(screen.getByRole('button', { name: 'Edit instructions' }));
    fireEvent.change(screen.getByLabelText('Instructions, one step per line'), { target: { value: 'x'.repeat(25_000) } });
    expect(screen.getByText(/The text of the blending instructions is 25000 characters long; at most 20000/)).toBeTruthy();

    const stored = useRecipes.getState().sheets['demo-vg320']!;
    expect(stored.vessel).toBe('');
    expect(stored.batchSize).toBe('1000');
    expect(stored.instructions).toBeNull();

    // A value within the rules is saved again and the message goes.
    fireEvent.change(lot, { target: { value: 'L-8' } });
    expect(useRecipes.getState().sheets['demo-vg320']!.lot).toBe('L-8');
    expect(screen.queryByText(/The lot number is/)).toBeNull();
  });

  it('reads the batch size with the decimal separator of the settings, and refuses the other mark where typed (plant loop defect hunt)', () => {
    settingsActions.updateSettings({ decimalSeparator: ',', thousandsGrouping: false });
    try {
      render(<BlendSheetScreen />);
      const size = screen.getByLabelText('Batch size') as HTMLInputElement;
      fireEvent.change(size, { target: { value: '2500,5' } });
      expect(useRecipes.getState().sheets['demo-vg320']!.batchSize).toBe('2500,5');
      // 2 500,5 kg as typed, written back with the comma
      expect(document.querySelector('.bs-batch-text')!.textContent).toMatch(/^2500,5 kg/);
      fireEvent.change(size, { target: { value: '2500.5' } });
      expect(screen.getByText(/Batch size: Decimal separator is “,” \(Settings\): “2500\.5” could mean 2500,5 or 25005/)).toBeTruthy();
      expect(size.value).toBe('2500.5'); // still shown for the user to correct
      expect(useRecipes.getState().sheets['demo-vg320']!.batchSize).toBe('2500,5');
    } finally {
      settingsActions.updateSettings({ decimalSeparator: '.' });
    }
    // a size saved with the other separator is not guessed: the sheet says so instead of building a table
    cleanup();
    render(<BlendSheetScreen />);
    expect(screen.getByText(/The component table cannot be built: the batch size “2500,5” cannot be read with the decimal separator “\.” \(Settings\)/)).toBeTruthy();
  });

  it('the store itself refuses what the rules refuse (the last guard)', () => {
    expect(recipeActions.setSheetInputs('demo-vg320', { lot: 'L'.repeat(500) })).toMatch(/lot number is 500 characters/);
    expect(recipeActions.setSheetInputs('demo-vg320', { batchSize: '5e40' }, Number)).toMatch(/batch size 5e\+40 is outside/);
    expect(useRecipes.getState().sheets['demo-vg320']?.lot ?? '').not.toMatch(/^L{500}$/);
    expect(recipeActions.updateRecipe('demo-vg320', { name: 'x'.repeat(5000) })).toMatch(/recipe name is 5000 characters long/);
    expect(useRecipes.getState().recipes.find((r) => r.id === 'demo-vg320')!.name).not.toBe('x'.repeat(5000));
    expect(() => recipeActions.addRecipe({ name: 'y'.repeat(5000), grade: 320 })).toThrow(/recipe name is 5000 characters long/);
  });

  it('section 3 (predicted properties and QC release) uses the decimal comma and °F from the settings', () => {
    settingsActions.updateSettings({ decimalSeparator: ',', temperatureUnit: 'F' });
    render(<BlendSheetScreen />);
    const qc = screen.getByRole('table', { name: /3\. Predicted properties and QC release/ });
    const row = (name: RegExp) => within(qc).getByText(name).closest('tr')!;
    // ν40 printed with a comma (e.g. "312,4"), its aim band too; no "." decimals anywhere in the section.
    expect(within(row(/Kinematic viscosity at 40/)).getAllByText(/^\d+,\d$/).length).toBeGreaterThan(0);
    expect(qc.textContent).not.toMatch(/\d\.\d/);
    // The operating temperature 60 °C = 140 °F (definition of the Fahrenheit scale).
    expect(qc.textContent).toMatch(/Viscosity at 140 °F/);
    expect(within(row(/Flash point/)).getByText('°F')).toBeTruthy();
  });
});
