/** Settings store: display units and habits, plant defaults. Persisted; no undo history. */
import { create } from 'zustand';
import { persist } from 'zustand/middleware';
import { idbPersistStorage, type StoreSpec } from './persistence';
import { settingsDataSchema } from './schemas';
import { demoSettingsPatch } from './demo';
import { firstProblem, settingsProblems } from './field-rules';

export interface Settings {
  /** Display unit for temperatures; stored values are always °C. */
  temperatureUnit: 'C' | 'F';
  /** Symbol shown before money amounts (display only; prices are never converted). */
  currencySymbol: string;
  decimalSeparator: '.' | ',';
  /** Group thousands (1 234.5 / 1.234,5). */
  thousandsGrouping: boolean;
  /** Company or plant name printed on the blend sheet. */
  companyName: string;
  /** Default gearbox operating temperature [°C]. */
  operatingTempC: number;
  /** Default cold-start temperature [°C]. */
  coldStartTempC: number;
  /** Default blending rule for viscosity. */
  blendMethod: 'refutas' | 'astm-d7152';
  /** ISO time of the last export-all backup, or null. */
  lastBackupAt: string | null;
}

export const DEFAULT_SETTINGS: Settings = {
  temperatureUnit: 'C',
  currencySymbol: '€',
  decimalSeparator: '.',
  thousandsGrouping: true,
  companyName: '',
  // Common practice (no source): enclosed industrial gear drives often run around 60–70 °C; a cold
  // start below freezing is the usual worst case. The user sets their own.
  operatingTempC: 65,
  coldStartTempC: -10,
  blendMethod: 'refutas',
  lastBackupAt: null,
};

export interface SettingsData {
  settings: Settings;
}

export interface SettingsState extends SettingsData {
  /** Change settings; null, or why the change was refused by the field rules (nothing changed then). */
  updateSettings: (patch: Partial<Settings>) => string | null;
  /** Back to defaults (with the demo company name). */
  resetSettings: () => void;
  replaceSettings: (settings: Settings) => void;
}

export const demoSettings = (): Settings => ({ ...DEFAULT_SETTINGS, ...demoSettingsPatch() });

export const SETTINGS_SPEC: StoreSpec<SettingsData> = {
  key: 'settings',
  version: 2,
  schema: settingsDataSchema,
  migrations: {
    // Schema 1 (first development builds) had no blend method and no backup date.
    1: (d) => {
      const s = (d as { settings?: Record<string, unknown> }).settings ?? {};
      return { settings: { blendMethod: 'refutas', lastBackupAt: null, ...s } };
    },
  },
};

export const useSettingsStore = create<SettingsState>()(
  persist(
    (set, get) => ({
      settings: demoSettings(),
      updateSettings: (patch) => {
        const next = { ...get().settings, ...patch };
        const refused = firstProblem(settingsProblems(next));
        if (refused) return refused;
        set({ settings: next });
        return null;
      },
      resetSettings: () => set({ settings: demoSettings() }),
      replaceSettings: (settings) => set({ settings }),
    }),
    {
      name: 'settings',
      version: SETTINGS_SPEC.version,
      storage: idbPersistStorage(SETTINGS_SPEC),
      partialize: (s): SettingsData => ({ settings: s.settings }),
      skipHydration: true,
    },
  ),
);
