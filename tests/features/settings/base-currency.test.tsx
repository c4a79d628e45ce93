// @vitest-environment jsdom
/**
 * Changing the base currency while exchange rates are stored (issue 10, item 13): each rate is in
 * units of the base it was entered against, so a silent change would re-read "0.92 EUR per USD" as
 * "0.92 GBP per USD". The change is refused, naming the rates, until they are removed (or replaced
 * in the same change).
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { cleanup, fireEvent, render, screen } from '@testing-library/react';
import SettingsScreen from '../../../src/features/settings/SettingsScreen';
import { resetDemo, settingsActions, useSettingsState } from '../../../src/state';
import { makeFormatter } from '../../../src/components/format';

const rate = { currency: 'USD', rate: 0.92, asOf: '2026-11-30' };

beforeEach(() => {
  resetDemo();
  settingsActions.updateSettings({ baseCurrency: 'EUR', exchangeRates: [rate] });
});
afterEach(cleanup);

describe('base currency and stored exchange rates', () => {
  it('the store refuses a new base while rates to the old one are stored, and keeps both', () => {
    const refused = settingsActions.updateSettings({ baseCurrency: 'GBP' });
    expect(refused).toBe('The exchange rates (USD) are in EUR per unit: remove them before changing the base currency to GBP, then enter the rates to GBP.');
    const s = useSettingsState.getState().settings;
    expect(s.baseCurrency).toBe('EUR');
    expect(s.exchangeRates).toEqual([rate]);
  });

  it('accepts the same base written otherwise, a new base with no rates, and a new base with its new rates', () => {
    expect(settingsActions.updateSettings({ baseCurrency: '€' })).toBeNull();
    expect(settingsActions.updateSettings({ baseCurrency: 'GBP', exchangeRates: [{ currency: 'USD', rate: 0.79, asOf: '2026-12-01' }] })).toBeNull();
    expect(useSettingsState.getState().settings.baseCurrency).toBe('GBP');
    expect(settingsActions.updateSettings({ exchangeRates: [] })).toBeNull();
    expect(settingsActions.updateSettings({ baseCurrency: 'USD' })).toBeNull();
  });

  it('a symbol that named the old base follows the new base; money is never shown with another currency’s symbol (s19 defect hunt)', () => {
    expect(settingsActions.updateSettings({ exchangeRates: [] })).toBeNull();
    expect(useSettingsState.getState().settings.currencySymbol).toBe('€');
    expect(settingsActions.updateSettings({ baseCurrency: 'USD' })).toBeNull();
    expect(useSettingsState.getState().settings.currencySymbol).toBe('$');
    expect(settingsActions.updateSettings({ baseCurrency: 'CHF' })).toBeNull();
    expect(useSettingsState.getState().settings.currencySymbol).toBe('CHF');
    // A symbol of the user's own that names no known currency stays.
    expect(settingsActions.updateSettings({ currencySymbol: 'Fr.' })).toBeNull();
    expect(settingsActions.updateSettings({ baseCurrency: 'EUR' })).toBeNull();
    expect(useSettingsState.getState().settings.currencySymbol).toBe('Fr.');
    // Shown: a symbol naming another currency than the base gives way to the base code (costs are in the base).
    const s = useSettingsState.getState().settings;
    expect(makeFormatter({ ...s, currencySymbol: '$', baseCurrency: 'EUR' }).money(1.5)).toBe('EUR\u202f1.50');
    expect(makeFormatter({ ...s, currencySymbol: '€', baseCurrency: 'EUR' }).money(1.5)).toBe('€\u202f1.50');
    expect(makeFormatter({ ...s, currencySymbol: 'Fr.', baseCurrency: 'CHF' }).money(1.5)).toBe('Fr.\u202f1.50');
  });

  it('Settings says why beside the base currency field and keeps the stored base', () => {
    render(<SettingsScreen />);
    const field = screen.getByLabelText(/^Base currency \(code\)/) as HTMLInputElement;
    fireEvent.focus(field);
    fireEvent.change(field, { target: { value: 'GBP' } });
    fireEvent.blur(field);
    expect(screen.getAllByText(/The exchange rates \(USD\) are in EUR per unit: remove them before changing the base currency to GBP/).length).toBeGreaterThan(0);
    expect(useSettingsState.getState().settings.baseCurrency).toBe('EUR');
  });
});
