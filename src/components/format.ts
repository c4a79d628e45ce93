/**
 * Display formatting for the user's habits (decimal separator, thousands grouping, °C/°F, currency
 * symbol). Stored values are always SI-like (°C, mm²/s, kg/L); conversion happens only here and in
 * `parseNumber` on the way back in.
 */
import { useMemo } from 'react';
import { cToF, fToC } from '../core/units';
import { useSettings, type Settings } from '../state';

export interface Formatter {
  /** A number with `digits` decimals (fixed), or "—" for null/NaN. */
  num: (v: number | null | undefined, digits?: number) => string;
  /** A number with `sig` significant figures (for viscosities spanning decades). */
  sig: (v: number | null | undefined, sig?: number) => string;
  /** A fraction 0–1 as a percentage, e.g. "45.0 %". */
  pct: (fraction: number | null | undefined, digits?: number) => string;
  /** Money with the currency symbol, e.g. "€ 1.23". */
  money: (v: number | null | undefined, digits?: number) => string;
  /** A temperature given in °C, shown in the user's unit with its symbol. */
  temp: (c: number | null | undefined, digits?: number) => string;
  /** A temperature given in °C, converted to the user's unit (number only). */
  tempValue: (c: number) => number;
  /** A temperature typed in the user's unit, converted back to °C. */
  tempToC: (v: number) => number;
  /** Unit symbol "°C" / "°F". */
  tempUnit: string;
  /** Parse text typed with the user's decimal separator; null for empty, NaN for garbage. */
  parse: (text: string) => number | null;
  settings: Settings;
}

const NARROW_NBSP = '\u202f';


function fixed(v: number, digits: number, s: Pick<Settings, 'decimalSeparator' | 'thousandsGrouping'>): string {
  const neg = v < 0 || Object.is(v, -0);
  const abs = Math.abs(v).toFixed(digits);
  let [int = '0', frac] = abs.split('.');
  if (s.thousandsGrouping && int.length > 4) {
    const sep = s.decimalSeparator === ',' ? '.' : NARROW_NBSP;
    int = int.replace(/\B(?=(\d{3})+(?!\d))/g, sep);
  }
  const body = frac !== undefined ? `${int}${s.decimalSeparator}${frac}` : int;
  // Do not print "-0.0": a rounded zero has no sign.
  return neg && /[1-9]/.test(body) ? `−${body}` : body;
}

/** Parse a number typed by a user: accepts the chosen decimal separator, a minus or "−", spaces. */
export function parseNumber(text: string, decimalSeparator: '.' | ','): number | null {
  let t = text.trim().replace(/[\s\u202f\u00a0]/g, '').replace(/^−/, '-');
  if (t === '') return null;
  if (decimalSeparator === ',') t = t.replace(/\./g, '').replace(',', '.');
  else t = t.replace(/,/g, '');
  if (!/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(t)) return Number.NaN;
  return Number(t);
}

export function makeFormatter(settings: Settings): Formatter {
  const isF = settings.temperatureUnit === 'F';
  const f: Formatter = {
    settings,
    num: (v, digits = 2) => (v === null || v === undefined || !Number.isFinite(v) ? '—' : fixed(v, digits, settings)),
    sig: (v, sig = 3) => {
      if (v === null || v === undefined || !Number.isFinite(v)) return '—';
      if (v === 0) return '0';
      const digits = Math.max(0, sig - 1 - Math.floor(Math.log10(Math.abs(v))));
      return fixed(v, Math.min(digits, 6), settings);
    },
    pct: (fr, digits = 1) => (fr === null || fr === undefined || !Number.isFinite(fr) ? '—' : `${fixed(fr * 100, digits, settings)} %`),
    money: (v, digits = 2) =>
      v === null || v === undefined || !Number.isFinite(v) ? '—' : `${settings.currencySymbol}${NARROW_NBSP}${fixed(v, digits, settings)}`,
    tempValue: (c) => (isF ? cToF(c) : c),
    tempToC: (v) => {
      try {
        return isF ? fToC(v) : v;
      } catch {
        return Number.NaN; // below absolute zero
      }
    },
    tempUnit: isF ? '°F' : '°C',
    temp: (c, digits = 0) =>
      c === null || c === undefined || !Number.isFinite(c) ? '—' : `${fixed(isF ? cToF(c) : c, digits, settings)} ${isF ? '°F' : '°C'}`,
    parse: (text) => parseNumber(text, settings.decimalSeparator),
  };
  return f;
}

/** Formatters for the current settings (memoised). */
export function useFormat(): Formatter {
  const settings = useSettings();
  return useMemo(() => makeFormatter(settings), [settings]);
}
