// @vitest-environment jsdom
/**
 * Restoring a backup replaces the library, recipes and settings; the settings have no undo history,
 * so the screen offers to put back the whole work the restore replaced (s19 defect hunt: a restore
 * could not be taken back for the settings).
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { act, cleanup, fireEvent, render, screen } from '@testing-library/react';
import SettingsScreen from '../../../src/features/settings/SettingsScreen';
import { libraryActions, resetDemo, settingsActions, useLibrary, useSettingsState } from '../../../src/state';
import { makeBackupText } from '../../../src/state/backup';

beforeEach(() => {
  resetDemo();
  settingsActions.updateSettings({ currencySymbol: '€' });
});
afterEach(cleanup);

describe('restoring a backup on the Settings screen', () => {
  it('offers to put back the library, recipes and settings the restore replaced, and does so', async () => {
    const text = makeBackupText(new Date('2025-04-01T10:00:00Z'));
    // Work done since the backup: a stock removed and another currency symbol.
    libraryActions.removeComponent('demo-bw-110');
    settingsActions.updateSettings({ currencySymbol: 'CHF' });
    const stocksNow = useLibrary.getState().components.length;
    render(<SettingsScreen />);
    const input = screen.getByLabelText(/Import a backup/) as HTMLInputElement;
    act(() => {
      fireEvent.change(input, { target: { files: [new File([text], 'old.json', { type: 'application/json' })] } });
    });
    fireEvent.click(await screen.findByRole('button', { name: 'Replace everything with this backup' }));
    expect(useSettingsState.getState().settings.currencySymbol).toBe('€');
    expect(useLibrary.getState().components.length).toBe(stocksNow + 1);
    fireEvent.click(screen.getByRole('button', { name: 'Put back the work before the restore' }));
    expect(useSettingsState.getState().settings.currencySymbol).toBe('CHF');
    expect(useLibrary.getState().components.length).toBe(stocksNow);
    expect(screen.getByText(/Put back the library, recipes and settings that were there before old\.json was restored\./)).toBeTruthy();
    expect(screen.queryByRole('button', { name: 'Put back the work before the restore' })).toBeNull();
  });
});
