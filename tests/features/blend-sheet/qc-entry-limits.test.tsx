// @vitest-environment jsdom
// Issue 10 item 1: the QC loop's text is checked with the stored field's rule where typed — an
// over-long description of the heel is refused with its message, never cut short silently.
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { cleanup, fireEvent, render, screen } from '@testing-library/react';
import BlendSheetScreen from '../../../src/features/blend-sheet/BlendSheetScreen';
import { recipeActions, resetDemo, settingsActions, useRecipes } from '../../../src/state';
import { TEXT_RULES } from '../../../src/state/field-rules';

beforeEach(() => {
  resetDemo();
  window.location.hash = '';
  recipeActions.setActiveRecipe('demo-vg320');
  settingsActions.updateSettings({ temperatureUnit: 'C', decimalSeparator: '.', thousandsGrouping: false });
});
afterEach(cleanup);

describe('Blend sheet — QC entries at entry', () => {
  it('refuses a 500-character description of the heel with the stored limit and keeps the saved one', () => {
    render(<BlendSheetScreen />);
    const field = screen.getByLabelText('What the heel is') as HTMLInputElement;
    expect(field.maxLength).toBe(-1); // no silent cut
    fireEvent.change(field, { target: { value: 'h'.repeat(500) } });
    fireEvent.blur(field);
    // Limit from src/state/field-rules.ts (description of the heel: 200 characters)
    expect(screen.getByText(`The description of the heel is 500 characters long; at most ${TEXT_RULES.heelSource.max} can be saved`)).toBeTruthy();
    expect(field.value).toHaveLength(500);
    expect(useRecipes.getState().qc['demo-vg320']?.heel.source ?? '').toBe('');
    fireEvent.change(field, { target: { value: 'previous batch of VG 320, lot 2291' } });
    fireEvent.blur(field);
    expect(useRecipes.getState().qc['demo-vg320']!.heel.source).toBe('previous batch of VG 320, lot 2291');
  });
});
