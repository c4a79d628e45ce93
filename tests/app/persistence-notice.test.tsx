// @vitest-environment jsdom
import { afterEach, describe, expect, it } from 'vitest';
import { act, cleanup, render, screen } from '@testing-library/react';
import { SavedWorkNotices } from '../../src/app/SavedWorkNotices';
import SettingsScreen from '../../src/features/settings/SettingsScreen';
import { useStorageStatus } from '../../src/state';
import type { PersistentStorageState } from '../../src/state/persistence';

afterEach(cleanup);

describe('the persistent-storage notice agrees with Settings', () => {
  it('says the same thing in the banner and in Settings for every state the browser can give', () => {
    render(
      <>
        <SavedWorkNotices />
        <SettingsScreen />
      </>,
    );
    for (const state of ['unknown', 'granted', 'refused', 'unsupported'] as PersistentStorageState[]) {
      act(() => useStorageStatus.setState({ persistent: state }));
      const setting = screen.getByTestId('persistence-setting').textContent;
      const banner = screen.queryByTestId('persistence-banner');
      if (state === 'refused' || state === 'unsupported') {
        expect(banner?.textContent, state).toBe(setting);
        expect(setting).toMatch(/may clear/);
      } else {
        expect(banner, state).toBeNull();
        expect(setting).not.toMatch(/may clear/);
      }
    }
  });
});
