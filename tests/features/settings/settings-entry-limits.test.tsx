// @vitest-environment jsdom
// Issue 10 item 1: over-long text in Settings (company name, currency symbol, an exchange rate's
// currency) is refused where it is entered with the stored field's limit; the settings are unchanged.
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { cleanup, fireEvent, render, screen, within } from '@testing-library/react';
import SettingsScreen from '../../../src/features/settings/SettingsScreen';
import { resetDemo, settingsActions, useSettingsState } from '../../../src/state';
import { TEXT_RULES } from '../../../src/state/field-rules';

function paste(el: HTMLElement, text: string) {
  fireEvent.focus(el);
  fireEvent.change(el, { target: { value: text } });
  fireEvent.blur(el);
}

beforeEach(() => {
  resetDemo();
  settingsActions.updateSettings({ temperatureUnit: 'C', decimalSeparator: '.', exchangeRates: [] });
});
afterEach(cleanup);

describe('Settings: text limits at entry', () => {
  it('refuses a 5,000-character company name and an over-long currency symbol; nothing is stored', () => {
    render(<SettingsScreen />);
    const before = structuredClone(useSettingsState.getState().settings);
    const company = screen.getByLabelText('Company or plant name (printed on the blend sheet)') as HTMLInputElement;
    expect(company.maxLength).toBe(-1);
    paste(company, 'c'.repeat(5000));
    expect(screen.getByText(`The company name is 5000 characters long; at most ${TEXT_RULES.companyName.max} can be saved`)).toBeTruthy();
    paste(screen.getByLabelText('Currency symbol'), '€€€€€€€€€€');
    expect(screen.getByText(/currency symbol is 10 characters long; at most 8/)).toBeTruthy();
    expect(useSettingsState.getState().settings).toEqual(before);
  });

  it('an exchange rate with an over-long currency is refused when added, with the rule’s limit', () => {
    render(<SettingsScreen />);
    const form = screen.getByRole('form', { name: 'Add an exchange rate' });
    fireEvent.change(within(form).getByLabelText('Currency'), { target: { value: 'USDOLLARSANDMORE' } });
    fireEvent.change(within(form).getByLabelText(/per unit/), { target: { value: '0.9' } });
    fireEvent.submit(form);
    expect(screen.getByText(/currency of the rate is 16 characters long; at most 12/)).toBeTruthy();
    expect(useSettingsState.getState().settings.exchangeRates).toEqual([]);
  });
});

describe('Settings: temperature limits in the unit of the settings (second defect hunt)', () => {
  it('says the range of a refused operating or cold-start temperature in °F when °F is chosen; nothing is stored', async () => {
    const { loadUnitConversions } = await import('../../../src/components/format');
    await loadUnitConversions(); // °F conversions (mathjs) load on demand
    settingsActions.updateSettings({ temperatureUnit: 'F' });
    try {
      render(<SettingsScreen />);
      const before = structuredClone(useSettingsState.getState().settings);
      // t_F = 9/5·t_C + 32 (definition of the Fahrenheit scale): −60…200 °C = −76…392 °F; −60…60 °C = −76…140 °F
      paste(screen.getByLabelText(/Gearbox operating temperature/), '500');
      expect(screen.getByText(/between −76 °F and 392 °F/)).toBeTruthy();
      paste(screen.getByLabelText(/Cold-start temperature/), '150');
      expect(screen.getByText(/between −76 °F and 140 °F/)).toBeTruthy();
      // below absolute zero (−459.67 °F) the conversion has no answer: refused with the range, not dropped silently
      paste(screen.getByLabelText(/Metering temperature/), '-500');
      expect(screen.getByText(/between −4 °F and 302 °F/)).toBeTruthy();
      expect(document.body.textContent).not.toMatch(/between −60 and/);
      expect(useSettingsState.getState().settings).toEqual(before);
    } finally {
      settingsActions.updateSettings({ temperatureUnit: 'C' });
    }
  });
});

describe('Settings: an exchange rate typed with the other decimal mark (second defect hunt)', () => {
  it('says that the decimal separator is “.” and what “0,92” could mean, instead of “not a number”; nothing is added', () => {
    render(<SettingsScreen />);
    const form = screen.getByRole('form', { name: 'Add an exchange rate' });
    fireEvent.change(within(form).getByLabelText('Currency'), { target: { value: 'USD' } });
    fireEvent.change(within(form).getByLabelText(/per unit/), { target: { value: '0,92' } });
    fireEvent.change(within(form).getByLabelText('As of'), { target: { value: '2026-11-30' } });
    fireEvent.submit(form);
    expect(screen.getByRole('alert').textContent).toMatch(/The rate for USD: Decimal separator is “\.” \(Settings\): “0,92” could mean 0\.92 or 92/);
    expect(useSettingsState.getState().settings.exchangeRates).toEqual([]);
  });
});
