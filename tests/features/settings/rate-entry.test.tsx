// @vitest-environment jsdom
// s25 walk: adding an exchange rate of 0 said "the exchange rate 0 is outside the possible range (from 1e−9 to
// 1000000000)", and a rate that is no number began in lower case ("the rate for USD: …"). Rates invented.
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { cleanup, fireEvent, render, screen, within } from '@testing-library/react';
import SettingsScreen from '../../../src/features/settings/SettingsScreen';
import { resetDemo, settingsActions } from '../../../src/state';

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
  return screen.getByRole('alert').textContent ?? '';
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
});
