// The Stocks table draws its cells as text until edited (components/fields.tsx `textUntilEdited`):
// tests find a cell by its label, as before, and edit it through these helpers.
import { fireEvent, screen } from '@testing-library/react';

type Scope = Pick<typeof screen, 'getByLabelText'>;

/** The field of the cell labelled `label`, activated as a click does when it is still drawn as text. */
export function editCell(label: string | RegExp, scope: Scope = screen): HTMLElement {
  const el = scope.getByLabelText(label);
  if (el.matches('input, textarea, select')) return el;
  fireEvent.click(el);
  return scope.getByLabelText(label);
}

/** The value the cell labelled `label` shows: its field's value, or its text while drawn as text. */
export function cellValue(label: string | RegExp, scope: Scope = screen): string {
  const el = scope.getByLabelText(label);
  if (el instanceof HTMLInputElement || el instanceof HTMLTextAreaElement || el instanceof HTMLSelectElement) return el.value;
  return el.firstElementChild?.textContent ?? el.textContent ?? '';
}
