// @vitest-environment jsdom
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { cleanup, fireEvent, render, screen, within } from '@testing-library/react';
import BlendSheetScreen from '../../../src/features/blend-sheet/BlendSheetScreen';
import { recipeActions, resetDemo, settingsActions, useRecipes } from '../../../src/state';

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
  });
});
