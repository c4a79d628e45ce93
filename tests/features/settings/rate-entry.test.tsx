// @vitest-environment jsdom
// s25 walk: adding an exchange rate of 0 said "the exchange rate 0 is outside the possible range (from 1e−9 to
// 1000000000)", and a rate that is no number began in lower case ("the rate for USD: …"). Rates invented.
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { cleanup, fireEvent, render, screen, within } from '@testing-library/react';
import SettingsScreen from '../../../src/features/settings/SettingsScreen';
import { resetDemo, settingsActions, useSettingsState } from '../../../src/state';

beforeEach(() => {
  resetDemo();
  settingsActions.updateSettings({ baseCurrency: 'EUR', exchangeRates: [], decimalSeparator: '.' });
});
afterEach(cleanup);

function addRate(currency: string, rate: string): string {
  const form = screen.getByRole('form', { name: 'Add an exchange rate' });
  fireEvent.change(within(form).getByLabelText('Currency'), { target: { value: currency } });
  fireEvent.change(within(form).getByLabelText(/per unit/), { target: { value: rate } });
  fireEvent.click(within(form).getByRole('button', { name: 'Add rate' }));
  return screen.queryByRole('alert')?.textContent ?? '';
}

describe('Settings: adding an exchange rate', () => {
  it('a rate of 0 or below is asked to be above 0, in plain words', () => {
    render(<SettingsScreen />);
    expect(addRate('USD', '0')).toBe('The rate for USD: an exchange rate must be above 0.');
    expect(addRate('USD', '-1')).toBe('The rate for USD: an exchange rate must be above 0.');
  });

  it('a rate that is no number is said with a capital, like every other message here', () => {
    render(<SettingsScreen />);
    expect(addRate('USD', 'abc')).toMatch(/^The rate for USD: “abc” is not a number/);
  });

  it('a currency code of other than three letters is refused at entry, and the saved rates stay (s25 walk)', () => {
    // Before: "us" was saved as a rate for "US". Currency codes have three letters (ISO 4217).
    settingsActions.updateSettings({ exchangeRates: [{ currency: 'USD', rate: 0.9, asOf: '' }] });
    render(<SettingsScreen />);
    expect(addRate('us', '1.1')).toBe('“US” is no currency code: a currency code has three letters (ISO 4217), e.g. USD.');
    expect(addRate('usdx', '1.1')).toBe('“USDX” is no currency code: a currency code has three letters (ISO 4217), e.g. USD.');
    expect(addRate('U5D', '1.1')).toBe('“U5D” is no currency code: a currency code has three letters (ISO 4217), e.g. USD.');
    expect(useSettingsState.getState().settings.exchangeRates).toEqual([{ currency: 'USD', rate: 0.9, asOf: '' }]);
    // three letters, or a symbol read as one (£ → GBP), are taken
    expect(addRate('£', '1.2')).toBe('');
    expect(useSettingsState.getState().settings.exchangeRates.map((r) => r.currency)).toEqual(['USD', 'GBP']);
  });

  it('the base currency field refuses a code of other than three letters and keeps the stored base', () => {
    render(<SettingsScreen />);
    const field = screen.getByLabelText(/^Base currency \(code\)/) as HTMLInputElement;
    fireEvent.focus(field);
    fireEvent.change(field, { target: { value: 'us' } });
    fireEvent.blur(field);
    expect(screen.getAllByText(/“US” is no currency code: a currency code has three letters \(ISO 4217\), e\.g\. USD\./).length).toBeGreaterThan(0);
    expect(useSettingsState.getState().settings.baseCurrency).toBe('EUR');
  });
});
