// @vitest-environment jsdom
// Issue 10 item 1: over-long text typed or pasted into a stock's fields (source, notes, currency, the
// calibration's laboratory reference) is refused where it is entered, with the stored field's own
// limit (state/field-rules.ts), never cut short silently, and nothing is stored.
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { cleanup, fireEvent, render, screen, within } from '@testing-library/react';
import LibraryScreen from '../../../src/features/library/LibraryScreen';
import { resetDemo, settingsActions, useLibrary } from '../../../src/state';
import { TEXT_RULES } from '../../../src/state/field-rules';

const PIB = 'demo-bw-510';
const pib = () => useLibrary.getState().components.find((c) => c.id === PIB)!;

function paste(el: HTMLElement, text: string) {
  fireEvent.focus(el);
  fireEvent.change(el, { target: { value: text } });
  fireEvent.blur(el);
}

function openDetails() {
  render(<LibraryScreen />);
  fireEvent.change(screen.getByPlaceholderText('code or name'), { target: { value: 'BW-510' } });
  fireEvent.click(screen.getByRole('button', { name: 'More fields of BW-510' }));
}

beforeEach(() => {
  resetDemo();
  useLibrary.temporal.getState().clear();
  settingsActions.updateSettings({ temperatureUnit: 'C', decimalSeparator: '.' });
});
afterEach(cleanup);

describe('Stocks: text limits at entry', () => {
  it('refuses over-long source, notes and currency with the stored limits; the stored stock is unchanged', () => {
    openDetails();
    const before = structuredClone(pib());
    const source = screen.getByLabelText('Source') as HTMLInputElement;
    expect(source.maxLength).toBe(-1);
    paste(source, 's'.repeat(500));
    expect(screen.getByText(`The source is 500 characters long; at most ${TEXT_RULES.source.max} can be saved`)).toBeTruthy();
    paste(screen.getByLabelText('Notes'), 'n'.repeat(25_000));
    expect(screen.getByText(`The notes field is 25000 characters long; at most ${TEXT_RULES.stockNotes.max} can be saved`)).toBeTruthy();
    paste(screen.getByLabelText('Currency'), 'EURO-DOLLAR-POUND');
    expect(screen.getByText(/currency is 17 characters long; at most 12/)).toBeTruthy();
    expect(pib()).toEqual(before);
  });

  it('the calibration form refuses an over-long laboratory reference, naming its limit', () => {
    openDetails();
    fireEvent.click(screen.getByRole('button', { name: 'Calibrate from a trial blend…' }));
    const form = screen.getByRole('group', { name: 'Calibrate BW-510 from a trial blend' });
    const select = within(form).getByLabelText('Use a recipe’s composition') as HTMLSelectElement;
    fireEvent.change(select, { target: { value: [...select.options].find((o) => o.text.includes('VG 680'))!.value } });
    fireEvent.change(within(form).getByLabelText(/Measured ν40 of the trial/), { target: { value: '640' } });
    fireEvent.change(within(form).getByLabelText(/Measured ν100 of the trial/), { target: { value: '38.5' } });
    fireEvent.change(within(form).getByLabelText(/Lab reference/), { target: { value: 'L'.repeat(300) } });
    fireEvent.click(within(form).getByRole('button', { name: 'Solve effective viscosities' }));
    expect(within(form).getByRole('alert').textContent).toMatch(`laboratory reference is 300 characters long; at most ${TEXT_RULES.labReference.max}`);
    expect(screen.queryByRole('table', { name: 'Calibration result for BW-510' })).toBeNull();
    expect(pib().calibration).toBeNull();
  });
});
