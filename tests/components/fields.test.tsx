// @vitest-environment jsdom
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { cleanup, fireEvent, render, screen } from '@testing-library/react';
import { useState } from 'react';
import { NumberField, SelectField, TextField } from '../../src/components/fields';
import { settingsActions } from '../../src/state';

/** A field bound to a value, as the screens use it; `saved` records every commit. */
function Bound({ initial, saved, validate, asText }: { initial: number; saved: (v: number | null) => void; validate?: (v: number | null) => { error?: string }; asText?: boolean }) {
  const [v, setV] = useState<number | null>(initial);
  return (
    <NumberField
      label="ν40 of BW-280"
      hideLabel={asText}
      textUntilEdited={asText}
      value={v}
      validate={validate}
      onCommit={(x) => {
        saved(x);
        setV(x);
      }}
    />
  );
}

function BoundText({ initial, saved, wrap, asText }: { initial: string; saved: (v: string) => void; wrap?: boolean; asText?: boolean }) {
  const [v, setV] = useState(initial);
  return (
    <TextField
      label="Name of BW-280"
      hideLabel={asText}
      textUntilEdited={asText}
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

describe('fields drawn as text until edited (a table of many fields, issue 9 item 3)', () => {
  const cell = (name = 'ν40 of BW-280') => screen.getByRole('textbox', { name });
  const choices = [
    { value: 'available', label: 'Available' },
    { value: 'limited', label: 'Limited' },
    { value: 'withdrawn', label: 'Withdrawn' },
  ] as const;
  function BoundChoice({ saved }: { saved: (v: string) => void }) {
    const [v, setV] = useState<string>('limited');
    return (
      <SelectField
        label="Availability of BW-280"
        hideLabel
        textUntilEdited
        value={v}
        options={choices}
        onChange={(x) => {
          saved(x);
          setV(x);
        }}
      />
    );
  }

  it('shows the value as focusable text carrying the field\'s name, without an input', () => {
    render(<Bound initial={280} saved={vi.fn()} asText />);
    const text = cell();
    expect(text.tagName).toBe('SPAN');
    expect(text.textContent).toBe('280');
    expect(text.tabIndex).toBe(0); // in the Tab order where the input stood
    expect(document.querySelector('input')).toBeNull();
  });

  it('Enter draws the field focused with its text selected; Escape draws the text again, focused, nothing saved', () => {
    const saved = vi.fn();
    render(<Bound initial={280} saved={saved} asText />);
    cell().focus();
    fireEvent.keyDown(cell(), { key: 'Enter' });
    const input = screen.getByLabelText('ν40 of BW-280') as HTMLInputElement;
    expect(input.tagName).toBe('INPUT');
    expect(document.activeElement).toBe(input);
    expect([input.selectionStart, input.selectionEnd]).toEqual([0, 3]);
    fireEvent.change(input, { target: { value: '300' } });
    fireEvent.keyDown(input, { key: 'Escape' });
    expect(cell().textContent).toBe('280');
    expect(document.activeElement).toBe(cell());
    expect(saved).not.toHaveBeenCalled();
  });

  it('a typing key draws the field focused with its text selected (what the key types replaces it); Enter saves and draws the text again, focused', () => {
    const saved = vi.fn();
    render(<Bound initial={280} saved={saved} validate={positive} asText />);
    cell().focus();
    fireEvent.keyDown(cell(), { key: '3' });
    const input = screen.getByLabelText('ν40 of BW-280') as HTMLInputElement;
    expect(document.activeElement).toBe(input);
    expect([input.selectionStart, input.selectionEnd]).toEqual([0, 3]);
    // jsdom types nothing for a key: the browser's input of "3", then "10", as change events
    fireEvent.change(input, { target: { value: '3' } });
    fireEvent.change(input, { target: { value: '310' } });
    fireEvent.keyDown(input, { key: 'Enter' });
    expect(saved).toHaveBeenCalledWith(310);
    expect(cell().textContent).toBe('310');
    expect(document.activeElement).toBe(cell());
  });

  it('a paste key (Ctrl+V, Ctrl+Shift+V, Shift+Insert) draws the field focused with its text selected, so the pasted text replaces it', () => {
    for (const key of [{ key: 'v', ctrlKey: true }, { key: 'V', ctrlKey: true, shiftKey: true }, { key: 'Insert', shiftKey: true }]) {
      const saved = vi.fn();
      render(<Bound initial={280} saved={saved} asText />);
      cell().focus();
      fireEvent.keyDown(cell(), key);
      const input = screen.getByLabelText('ν40 of BW-280') as HTMLInputElement;
      expect(input.tagName, JSON.stringify(key)).toBe('INPUT');
      expect(document.activeElement).toBe(input);
      expect([input.selectionStart, input.selectionEnd]).toEqual([0, 3]);
      // jsdom pastes nothing: the browser's paste into the focused field, as a change event
      fireEvent.change(input, { target: { value: '320' } });
      fireEvent.keyDown(input, { key: 'Enter' });
      expect(saved).toHaveBeenCalledWith(320);
      cleanup();
    }
  });

  it('other keys with Ctrl, Alt or Shift (Insert alone, Ctrl+C, Alt+V, Shift) leave the text as it is', () => {
    render(<Bound initial={280} saved={vi.fn()} asText />);
    for (const key of [{ key: 'Insert' }, { key: 'c', ctrlKey: true }, { key: 'v', altKey: true }, { key: 'Shift', shiftKey: true }]) {
      fireEvent.keyDown(cell(), key);
      expect(cell().tagName, JSON.stringify(key)).toBe('SPAN');
    }
    expect(document.querySelector('input')).toBeNull();
  });

  it('a click on a choice drawn as text draws its select, focused (its list opened where the browser can)', () => {
    const saved = vi.fn();
    render(<BoundChoice saved={saved} />);
    fireEvent.click(screen.getByRole('combobox', { name: 'Availability of BW-280' }));
    const select = screen.getByLabelText('Availability of BW-280') as HTMLSelectElement;
    expect(select.tagName).toBe('SELECT');
    expect(document.activeElement).toBe(select);
    expect(select.value).toBe('limited');
    expect(saved).not.toHaveBeenCalled();
    fireEvent.change(select, { target: { value: 'available' } });
    expect(saved).toHaveBeenCalledWith('available');
  });

  it('a click draws the field with the caret at the end; leaving it saves and draws the text again', () => {
    const saved = vi.fn();
    render(<Bound initial={280} saved={saved} asText />);
    fireEvent.click(cell());
    const input = screen.getByLabelText('ν40 of BW-280') as HTMLInputElement;
    expect(document.activeElement).toBe(input);
    expect([input.selectionStart, input.selectionEnd]).toEqual([3, 3]);
    fireEvent.change(input, { target: { value: '295' } });
    fireEvent.blur(input);
    expect(saved).toHaveBeenCalledWith(295);
    expect(cell().textContent).toBe('295');
  });

  it('leaving a refused entry keeps the field with the typed text and its message (nothing typed is lost)', () => {
    const saved = vi.fn();
    render(<Bound initial={280} saved={saved} validate={positive} asText />);
    fireEvent.click(cell());
    const input = screen.getByLabelText('ν40 of BW-280') as HTMLInputElement;
    fireEvent.change(input, { target: { value: '-5' } });
    fireEvent.blur(input);
    expect(screen.getByLabelText('ν40 of BW-280')).toBe(input);
    expect(input.value).toBe('-5');
    expect(input.getAttribute('aria-invalid')).toBe('true');
    expect(screen.getByRole('alert').textContent).toMatch(/must be above zero/);
    expect(saved).not.toHaveBeenCalled();
    // Back in the field, Escape puts back the stored value and draws the text again, focused.
    input.focus();
    fireEvent.keyDown(input, { key: 'Escape' });
    expect(cell().textContent).toBe('280');
    expect(document.activeElement).toBe(cell());
  });

  it('a stored value with a message is drawn as the field, with its message', () => {
    render(<Bound initial={-1} saved={vi.fn()} validate={positive} asText />);
    expect(screen.getByLabelText('ν40 of BW-280').tagName).toBe('INPUT');
    expect(screen.getByRole('alert').textContent).toMatch(/must be above zero/);
  });

  it('a wrapping name is drawn as text and becomes its textarea; Backspace opens it with the name selected', () => {
    const saved = vi.fn();
    render(<BoundText initial="Group II heavy neutral" saved={saved} wrap asText />);
    const text = cell('Name of BW-280');
    expect(text.textContent).toBe('Group II heavy neutral');
    fireEvent.keyDown(text, { key: 'Backspace' });
    const area = screen.getByLabelText('Name of BW-280') as HTMLTextAreaElement;
    expect(area.tagName).toBe('TEXTAREA');
    expect([area.selectionStart, area.selectionEnd]).toEqual([0, 22]);
    fireEvent.change(area, { target: { value: '' } }); // what Backspace does to the selected name
    expect(screen.getByRole('alert').textContent).toBe('a name is required'); // checked as typed
    fireEvent.change(area, { target: { value: 'Renamed' } });
    fireEvent.keyDown(area, { key: 'Enter' });
    expect(saved).toHaveBeenCalledWith('Renamed');
    expect(cell('Name of BW-280').textContent).toBe('Renamed');
  });

  it('a choice is drawn as text named like its select; Enter draws the select, an arrow key picks the next choice, Escape draws the text', () => {
    const saved = vi.fn();
    render(<BoundChoice saved={saved} />);
    const text = screen.getByRole('combobox', { name: 'Availability of BW-280' });
    expect(text.tagName).toBe('SPAN');
    expect(text.firstElementChild!.textContent).toBe('Limited');
    fireEvent.keyDown(text, { key: 'Enter' });
    const select = screen.getByLabelText('Availability of BW-280') as HTMLSelectElement;
    expect(select.tagName).toBe('SELECT');
    expect(document.activeElement).toBe(select);
    expect(saved).not.toHaveBeenCalled();
    fireEvent.keyDown(select, { key: 'Escape' });
    const again = screen.getByRole('combobox', { name: 'Availability of BW-280' });
    expect(again.tagName).toBe('SPAN');
    expect(document.activeElement).toBe(again);
    fireEvent.keyDown(again, { key: 'ArrowDown' });
    expect(saved).toHaveBeenCalledWith('withdrawn');
    expect((screen.getByLabelText('Availability of BW-280') as HTMLSelectElement).value).toBe('withdrawn');
  });
});
