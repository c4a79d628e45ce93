/** Settings store: display units and habits, plant defaults. Persisted; no undo history. */
import { create } from 'zustand';
import { persist } from 'zustand/middleware';
import { idbPersistStorage, type StoreSpec } from './persistence';
import { demoSettingsPatch } from './demo';
import { firstProblem, settingsProblems } from './field-rules';
import { sayRefusal } from './messages';
import { normaliseCurrency, type ExchangeRate } from '../core/currency/exchange-rates';
import type { BlendMethod } from '../core/blending/blend-viscosity';
import type { D341Form } from '../core/viscosity/viscosity-temperature';

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
  blendMethod: BlendMethod;
  /**
   * Form of the ASTM D341 viscosity–temperature line (ν at the operating and cold-start temperatures,
   * the D341 charts): the full D341-20 Z (default) or the simple Z = ν + 0.7.
   */
  d341Form: D341Form;
  /** Temperature at which the plant meters litres (blend sheet "L at t") [°C]. */
  meteringTempC: number;
  /** Temperature at which delivered litres are counted for costing [°C]. */
  deliveryTempC: number;
  /** ISO time of the last export-all backup, or null. */
  lastBackupAt: string | null;
  /**
   * Currency every cost figure and the solver work in (a code, e.g. "EUR"). Stock prices in another
   * currency are restated with `exchangeRates`; a stock whose currency has no rate is left out of
   * costing and solving (see core/currency/exchange-rates.ts).
   */
  baseCurrency: string;
  /** Rates to the base currency, as the user entered them, each with its "as of" date. */
  exchangeRates: ExchangeRate[];
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
  d341Form: 'd341-20',
  // Common practice (no source): base stocks are charged and metered warm, 50–65 °C; delivered
  // litres are usually counted at the tables' 15 °C reference. The user sets their own.
  meteringTempC: 60,
  deliveryTempC: 15,
  lastBackupAt: null,
  baseCurrency: 'EUR',
  exchangeRates: [],
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
  version: 5,
  schema: (m) => m.settingsDataSchema,
  // Each setting is a record of its own when tabs merge their saves.
  layout: { maps: ['settings'], label: (key) => `the setting “${key.slice('settings/'.length)}”` },
  migrations: {
    // Schema 4 → 5: the form of the D341 line becomes a setting; older data keeps the full D341-20 Z
    // it was computed with.
    4: (d) => {
      const s = (d as { settings?: Record<string, unknown> }).settings ?? {};
      return { settings: { d341Form: 'd341-20', ...s } };
    },
    // Schema 3 → 4: metering and delivery temperatures (defaults 60 and 15 °C); the blend method may
    // also be the D7152 Wright method.
    3: (d) => {
      const s = (d as { settings?: Record<string, unknown> }).settings ?? {};
      return { settings: { meteringTempC: 60, deliveryTempC: 15, ...s } };
    },
    // Schema 2 had no exchange rates: the base currency is read from the currency symbol (€ → EUR,
    // $ → USD, £ → GBP, a code as it is; blank → EUR), with no rates yet.
    2: (d) => {
      const s = (d as { settings?: Record<string, unknown> }).settings ?? {};
      const symbol = typeof s.currencySymbol === 'string' ? normaliseCurrency(s.currencySymbol) : '';
      const base = /^[A-Z]{3}$/.test(symbol) ? symbol : 'EUR';
      return { settings: { ...s, baseCurrency: base, exchangeRates: [] } };
    },
    // Schema 1 (first development builds) had no blend method and no backup date.
    1: (d) => {
      const s = (d as { settings?: Record<string, unknown> }).settings ?? {};
      return { settings: { blendMethod: 'refutas', lastBackupAt: null, ...s } };
    },
  },
};

/**
 * A change of the base currency while exchange rates are stored is refused unless the same change
 * replaces the rates: each rate is in units of the base it was entered against, so keeping it would
 * silently re-read "0.92 EUR per USD" as "0.92 GBP per USD".
 */
export function baseChangeProblem(current: Settings, patch: Partial<Settings>): string | null {
  if (patch.baseCurrency === undefined || patch.exchangeRates !== undefined) return null;
  const from = normaliseCurrency(current.baseCurrency);
  const to = normaliseCurrency(patch.baseCurrency);
  if (from === to || current.exchangeRates.length === 0) return null;
  const listed = current.exchangeRates.map((r) => normaliseCurrency(r.currency)).join(', ');
  return `The exchange rates (${listed}) are in ${from} per unit: remove them before changing the base currency to ${to}, then enter the rates to ${to}.`;
}

/** The usual symbol of a currency code where there is one (€, $, £), else the code itself. */
const SYMBOL_OF: Record<string, string> = { EUR: '€', USD: '$', GBP: '£' };

/**
 * A change of the base currency carries a currency symbol that named the old base along (€ → $ when
 * EUR becomes USD): left behind, every cost would be shown with the symbol of a currency it is not in.
 * A symbol that names no currency Blendbench knows (e.g. "Fr.") is left as it is.
 */
export function withSymbolFollowingBase(current: Settings, patch: Partial<Settings>): Partial<Settings> {
  if (patch.baseCurrency === undefined || patch.currencySymbol !== undefined) return patch;
  const from = normaliseCurrency(current.baseCurrency);
  const to = normaliseCurrency(patch.baseCurrency);
  if (from === to || normaliseCurrency(current.currencySymbol) !== from) return patch;
  return { ...patch, currencySymbol: SYMBOL_OF[to] ?? to };
}

export const useSettingsStore = create<SettingsState>()(
  persist(
    (set, get) => ({
      settings: demoSettings(),
      updateSettings: (asked) => {
        const current = get().settings;
        const patch = withSymbolFollowingBase(current, asked);
        const next = { ...current, ...patch };
        const refused = baseChangeProblem(current, patch) ?? firstProblem(settingsProblems(next));
        if (refused) return sayRefusal(refused);
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
