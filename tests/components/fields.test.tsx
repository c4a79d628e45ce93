// @vitest-environment jsdom
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { cleanup, fireEvent, render, screen } from '@testing-library/react';
import { useState } from 'react';
import { NumberField, TextField } from '../../src/components/fields';
import { settingsActions } from '../../src/state';

/** A field bound to a value, as the screens use it; `saved` records every commit. */
function Bound({ initial, saved, validate }: { initial: number; saved: (v: number | null) => void; validate?: (v: number | null) => { error?: string } }) {
  const [v, setV] = useState<number | null>(initial);
  return (
    <NumberField
      label="ν40 of BW-280"
      value={v}
      validate={validate}
      onCommit={(x) => {
        saved(x);
        setV(x);
      }}
    />
  );
}

function BoundText({ initial, saved, wrap }: { initial: string; saved: (v: string) => void; wrap?: boolean }) {
  const [v, setV] = useState(initial);
  return (
    <TextField
      label="Name of BW-280"
      wrap={wrap}
      value={v}
      validate={(x) => ({ error: x.trim() ? undefined : 'a name is required' })}
      onCommit={(x) => {
        saved(x);
        setV(x);
      }}
    />
  );
}

const positive = (v: number | null) => ({ error: v !== null && v <= 0 ? 'must be above zero' : undefined });

beforeEach(() => settingsActions.updateSettings({ decimalSeparator: '.', thousandsGrouping: true }));
afterEach(cleanup);

describe('NumberField: Escape, Enter and Tab', () => {
  it('after Escape, the next value typed in the same cell is checked and saved', () => {
    const saved = vi.fn();
    render(<Bound initial={280} saved={saved} validate={positive} />);
    const input = screen.getByLabelText('ν40 of BW-280') as HTMLInputElement;
    input.focus();
    fireEvent.change(input, { target: { value: '300' } });
    fireEvent.keyDown(input, { key: 'Escape' });
    expect(input.value).toBe('280');
    expect(saved).not.toHaveBeenCalled();
    // Still in the cell: a refused value is checked …
    fireEvent.change(input, { target: { value: '-5' } });
    expect(screen.getByRole('alert').textContent).toMatch(/must be above zero/);
    expect(input.getAttribute('aria-invalid')).toBe('true');
    // … and a good one is saved by Enter.
    fireEvent.change(input, { target: { value: '310' } });
    fireEvent.keyDown(input, { key: 'Enter' });
    expect(saved).toHaveBeenCalledWith(310);
    expect(input.value).toBe('310');
  });

  it('Enter commits exactly like Tab (leaving the field): same checks, same save', () => {
    for (const leave of ['Enter', 'Tab'] as const) {
      const saved = vi.fn();
      const { unmount } = render(<Bound initial={280} saved={saved} validate={positive} />);
      const input = screen.getByLabelText('ν40 of BW-280') as HTMLInputElement;
      input.focus();
      fireEvent.change(input, { target: { value: '0' } });
      if (leave === 'Enter') fireEvent.keyDown(input, { key: 'Enter' });
      else fireEvent.blur(input);
      expect(saved, leave).not.toHaveBeenCalled();
      expect(input.value, leave).toBe('0'); // refused, still shown with its message
      expect(screen.getByRole('alert').textContent).toMatch(/must be above zero/);
      fireEvent.change(input, { target: { value: '295.5' } });
      if (leave === 'Enter') fireEvent.keyDown(input, { key: 'Enter' });
      else fireEvent.blur(input);
      expect(saved, leave).toHaveBeenCalledWith(295.5);
      unmount();
    }
  });

  it('Escape after a refused value puts back the stored value and clears the message', () => {
    const saved = vi.fn();
    render(<Bound initial={280} saved={saved} validate={positive} />);
    const input = screen.getByLabelText('ν40 of BW-280') as HTMLInputElement;
    fireEvent.change(input, { target: { value: '0' } });
    fireEvent.keyDown(input, { key: 'Escape' });
    expect(input.value).toBe('280');
    expect(screen.queryByRole('alert')).toBeNull();
    fireEvent.blur(input);
    expect(saved).not.toHaveBeenCalled();
  });
});

describe('NumberField: decimal separator', () => {
  it('refuses "12,5" and "12 5" with "." chosen, naming the setting, and stores nothing', () => {
    const saved = vi.fn();
    render(<Bound initial={280} saved={saved} />);
    const input = screen.getByLabelText('ν40 of BW-280') as HTMLInputElement;
    fireEvent.change(input, { target: { value: '12,5' } });
    fireEvent.keyDown(input, { key: 'Enter' });
    expect(screen.getByRole('alert').textContent).toBe(
      'ν40 of BW-280: Decimal separator is “.” (Settings): “12,5” could mean 12.5 or 125. Type it with “.”, or change the separator in Settings.',
    );
    fireEvent.change(input, { target: { value: '12 5' } });
    fireEvent.blur(input);
    expect(screen.getByRole('alert').textContent).toMatch(/“12 5” has a space inside the number/);
    expect(saved).not.toHaveBeenCalled();
  });

  it('refuses "0.885" with "," chosen (the mirror case) and accepts "0,885"', () => {
    settingsActions.updateSettings({ decimalSeparator: ',' });
    const saved = vi.fn();
    render(<Bound initial={0.9} saved={saved} />);
    const input = screen.getByLabelText('ν40 of BW-280') as HTMLInputElement;
    expect(input.value).toBe('0,9');
    fireEvent.change(input, { target: { value: '0.885' } });
    fireEvent.blur(input);
    expect(screen.getByRole('alert').textContent).toMatch(/Decimal separator is “,” \(Settings\): “0\.885” could mean 0,885 or 885/);
    expect(saved).not.toHaveBeenCalled();
    fireEvent.change(input, { target: { value: '0,885' } });
    fireEvent.blur(input);
    expect(saved).toHaveBeenCalledWith(0.885);
  });

  it('edits a grouped value as plain digits, so it reads back unchanged', () => {
    settingsActions.updateSettings({ decimalSeparator: ',' });
    const saved = vi.fn();
    render(<Bound initial={12345.5} saved={saved} />);
    const input = screen.getByLabelText('ν40 of BW-280') as HTMLInputElement;
    expect(input.value).toBe('12345,5');
    fireEvent.change(input, { target: { value: '12345,5' } });
    fireEvent.blur(input);
    expect(saved).not.toHaveBeenCalled(); // the same value: nothing to save
  });
});

describe('TextField: Escape then typing', () => {
  it('checks and saves the value typed after Escape', () => {
    const saved = vi.fn();
    render(<BoundText initial="Heavy neutral" saved={saved} />);
    const input = screen.getByLabelText('Name of BW-280') as HTMLInputElement;
    fireEvent.change(input, { target: { value: 'x' } });
    fireEvent.keyDown(input, { key: 'Escape' });
    expect(input.value).toBe('Heavy neutral');
    fireEvent.change(input, { target: { value: '  ' } });
    expect(screen.getByRole('alert').textContent).toBe('a name is required');
    fireEvent.change(input, { target: { value: 'Heavy neutral 2' } });
    fireEvent.keyDown(input, { key: 'Enter' });
    expect(saved).toHaveBeenCalledWith('Heavy neutral 2');
  });
});

describe('TextField wrap: one line of text that wraps to its lines (issue 10, item 18)', () => {
  it('is a textarea without line breaks: Enter saves like Tab, a pasted line break becomes a space, Escape puts the name back', () => {
    const saved = vi.fn();
    render(<BoundText initial="Group I heavy solvent neutral (600), second refinery" saved={saved} wrap />);
    const field = screen.getByLabelText('Name of BW-280') as HTMLTextAreaElement;
    expect(field.tagName).toBe('TEXTAREA');
    expect(field.className).toMatch(/wrap-line/);
    expect(field.value).toBe('Group I heavy solvent neutral (600), second refinery'); // the whole name, no tooltip needed
    fireEvent.change(field, { target: { value: 'Heavy neutral\r\nsecond source' } });
    expect(field.value).toBe('Heavy neutral second source');
    fireEvent.keyDown(field, { key: 'Escape' });
    expect(field.value).toBe('Group I heavy solvent neutral (600), second refinery');
    fireEvent.change(field, { target: { value: 'Heavy neutral, second source' } });
    // Home and End go to the start and end of the whole name, as in a one-line field (not of the wrapped line).
    field.setSelectionRange(5, 5);
    fireEvent.keyDown(field, { key: 'End' });
    expect([field.selectionStart, field.selectionEnd]).toEqual([28, 28]);
    fireEvent.keyDown(field, { key: 'Home', shiftKey: true });
    expect([field.selectionStart, field.selectionEnd]).toEqual([0, 28]);
    const enter = fireEvent.keyDown(field, { key: 'Enter' });
    expect(enter).toBe(false); // no line break typed
    expect(saved).toHaveBeenCalledWith('Heavy neutral, second source');
  });
});
