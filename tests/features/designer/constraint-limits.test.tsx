// @vitest-environment jsdom
// Issue 10 item 1: the designer's constraints are refused where typed with the stored field's own range
// (state/field-rules.ts), so a draft or recipe that could not be read back is never kept; in °F too.
import { afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { loadUnitConversions } from '../../../src/components/format';
import { cleanup, fireEvent, render, screen } from '@testing-library/react';
import DesignerScreen from '../../../src/features/designer/DesignerScreen';
import { useDesignerStore } from '../../../src/features/designer/store';
import { resetDemo, settingsActions, useWorkspaceStore } from '../../../src/state';

beforeEach(() => {
  resetDemo();
  settingsActions.updateSettings({ temperatureUnit: 'C', decimalSeparator: '.', thousandsGrouping: false });
  useDesignerStore.setState({ initialised: false, basis: 'mass', rebalanceMode: 'proportional' });
  useWorkspaceStore.setState({ drafts: {}, habits: null });
});
afterEach(cleanup);
beforeAll(async () => {
  await loadUnitConversions(); // °F conversions (mathjs) load on demand
});

function enter(label: RegExp, text: string): HTMLInputElement {
  const el = screen.getByLabelText(label) as HTMLInputElement;
  fireEvent.focus(el);
  fireEvent.change(el, { target: { value: text } });
  fireEvent.keyDown(el, { key: 'Enter' });
  return el;
}
const alerts = () => screen.getAllByRole('alert').map((a) => a.textContent).join('\n');

describe('Designer constraints: the stored ranges at entry', () => {
  it('refuses a VI, aniline, pour or flash limit the stored targets cannot hold, and keeps the targets', () => {
    render(<DesignerScreen />);
    const before = structuredClone(useDesignerStore.getState().targets);
    // Ranges from src/state/field-rules.ts: minimum VI −100…500, aniline −100…300 °C, pour −100…100 °C, flash −50…500 °C.
    const vi = enter(/^Minimum VI/, '9999');
    expect(alerts()).toContain('The minimum VI 9999 is outside the possible range (from −100 to 500)');
    expect(vi.getAttribute('aria-invalid')).toBe('true');
    fireEvent.keyDown(vi, { key: 'Escape' });
    enter(/^Maximum aniline point/, '400');
    expect(alerts()).toMatch(/The highest aniline point 400 °C is outside the possible range \(from −100 °C to 300 °C\)/);
    enter(/^Maximum pour point/, '150');
    expect(alerts()).toMatch(/The highest pour point 150 °C is outside the possible range \(from −100 °C to 100 °C\)/);
    enter(/^Minimum flash point/, '-80');
    expect(alerts()).toMatch(/The lowest flash point −80 °C is outside the possible range \(from −50 °C to 500 °C\)/);
    expect(useDesignerStore.getState().targets).toEqual(before);
  });

  it('accepts a value inside the range, and says the range in °F when the settings use °F', () => {
    settingsActions.updateSettings({ temperatureUnit: 'F' });
    render(<DesignerScreen />);
    enter(/^Minimum VI/, '95');
    expect(useDesignerStore.getState().targets.minVi).toBe(95);
    // 250 °F = 121.1 °C, above the 100 °C most a stored pour limit can be (field-rules.ts; °F = °C × 9/5 + 32).
    enter(/^Maximum pour point/, '250');
    expect(alerts()).toMatch(/The highest pour point 250 °F is outside the possible range \(from −148 °F to 212 °F\)/);
    expect(useDesignerStore.getState().targets.maxPourPoint).not.toBeCloseTo(121.1, 0);
  });
});
