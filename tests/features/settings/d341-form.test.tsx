// @vitest-environment jsdom
/**
 * The form of the ASTM D341 line (issue 13, item 1): selectable in Settings (default the full D341-20 Z),
 * persisted in the settings store (schema 5; older data upgraded to the D341-20 form it was computed
 * with), and named in the results that depend on it.
 */
import { afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { cleanup, fireEvent, render, screen } from '@testing-library/react';
import SettingsScreen from '../../../src/features/settings/SettingsScreen';
import { resetDemo, useSettingsState } from '../../../src/state';
import { interpretStored, loadSchemas } from '../../../src/state/persistence';
import { DEFAULT_SETTINGS, SETTINGS_SPEC } from '../../../src/state/settings';
import { MethodNote } from '../../../src/components/notices';
import { ViscosityTemperatureChart } from '../../../src/components/charts';

beforeAll(async () => {
  await loadSchemas();
});
beforeEach(() => resetDemo());
afterEach(cleanup);

describe('D341 form in Settings', () => {
  it('defaults to the full D341-20 form and switches to the simple form from the Settings screen', () => {
    expect(useSettingsState.getState().settings.d341Form).toBe('d341-20');
    render(<SettingsScreen />);
    const select = screen.getByLabelText(/^Viscosity–temperature line \(ASTM D341\)/) as HTMLSelectElement;
    expect(select.value).toBe('d341-20');
    expect([...select.options].map((o) => o.textContent)).toEqual([
      'ASTM D341-20 (Z = ν + 0.7 + exp(−1.47 − 1.84ν − 0.51ν²))',
      'Walther simple form (Z = ν + 0.7, ν ≥ 2 mm²/s)',
    ]);
    fireEvent.change(select, { target: { value: 'walther-simple' } });
    expect(useSettingsState.getState().settings.d341Form).toBe('walther-simple');
  });

  it('is stored at schema 5; schema-4 data is upgraded to the D341-20 form, nothing else changed', () => {
    expect(SETTINGS_SPEC.version).toBe(5);
    const { d341Form: _f, ...v4 } = { ...DEFAULT_SETTINGS, companyName: 'Plant X', operatingTempC: 70 };
    const up = interpretStored(SETTINGS_SPEC, { state: { settings: v4 }, version: 4 });
    expect(up.kind).toBe('ok');
    if (up.kind !== 'ok') return;
    expect(up.migratedFrom).toBe(4);
    expect(up.data.settings).toEqual({ ...v4, d341Form: 'd341-20' });
    const kept = interpretStored(SETTINGS_SPEC, { state: { settings: { ...v4, d341Form: 'walther-simple' } }, version: 5 });
    expect(kept.kind === 'ok' && kept.data.settings.d341Form).toBe('walther-simple');
    const bad = interpretStored(SETTINGS_SPEC, { state: { settings: { ...v4, d341Form: 'z-plus-0.8' } }, version: 5 });
    expect(bad.kind).not.toBe('ok');
  });

  it('the method note and the chart caption name the form', () => {
    render(<MethodNote method="astm-d7152" d341Form="walther-simple" />);
    expect(screen.getByTestId('method-note').textContent).toContain('Viscosity at other temperatures: ASTM D341 (Z = ν + 0.7) line through ν40 and ν100.');
    cleanup();
    const lines = [{ id: 'a', label: 'A', kv40: 220, kv100: 19, role: 'component' as const }];
    const { container } = render(<ViscosityTemperatureChart lines={lines} width={600} height={380} d341Form="walther-simple" />);
    expect(container.textContent).toContain('Each oil is a straight line on these axes (ASTM D341 (Z = ν + 0.7)).');
    cleanup();
    const { container: c2 } = render(<ViscosityTemperatureChart lines={lines} width={600} height={380} />);
    expect(c2.textContent).toContain('Each oil is a straight line on these axes (ASTM D341-20).');
  });
});
