/** Type into a labelled form field and commit it with Enter, as a user does (jsdom screen tests). */
import { fireEvent, screen } from '@testing-library/react';

export function enter(label: string, text: string): HTMLInputElement {
  const el = screen.getByLabelText(label, { exact: false }) as HTMLInputElement;
  fireEvent.focus(el);
  fireEvent.change(el, { target: { value: text } });
  fireEvent.keyDown(el, { key: 'Enter' });
  return el;
}
