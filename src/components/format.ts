/**
 * Display formatting for the user's habits (decimal separator, thousands grouping, °C/°F, currency
 * symbol). Stored values are always SI-like (°C, mm²/s, kg/L); conversion happens only here and in
 * `parseNumber` on the way back in.
 *
 * °C ↔ °F goes through the core's unit conversions (mathjs), which are loaded only when the user
 * works in °F: the opening screen in °C needs no mathjs. The shell waits for them before showing a
 * screen in °F (`useUnitConversionsReady`); should a formatter be made before they arrive, it
 * shows and reads °C throughout (the label says so), never a °C value labelled °F.
 */
import { createContext, useContext, useEffect, useMemo, useSyncExternalStore } from 'react';
import type * as Units from '../core/units';
import { decimalsOf, formatFixed, sayNumber } from '../core/words/display';
import { gradePosition } from '../core/viscosity/iso-grades';
import { normaliseCurrency } from '../core/currency/exchange-rates';
import { useSettings, type Settings } from '../state';

let units: typeof Units | null = null;
let unitsLoading: Promise<typeof Units> | null = null;
const unitsListeners = new Set<() => void>();

/** Load the unit conversions (mathjs) once; resolves when they can be used. */
export function loadUnitConversions(): Promise<void> {
  unitsLoading ??= import('../core/units').then((m) => {
    units = m;
    for (const l of unitsListeners) l();
    return m;
  });
  return unitsLoading.then(() => undefined);
}

const subscribeUnits = (l: () => void) => {
  unitsListeners.add(l);
  return () => unitsListeners.delete(l);
};
const unitsLoaded = () => units !== null;

/** True when the settings' temperature unit can be shown: °C, or °F with the conversions loaded (loads them). */
export function useUnitConversionsReady(): boolean {
  const wantF = useSettings().temperatureUnit === 'F';
  const loaded = useSyncExternalStore(subscribeUnits, unitsLoaded, unitsLoaded);
  useEffect(() => {
    if (wantF && !loaded) void loadUnitConversions();
  }, [wantF, loaded]);
  return !wantF || loaded;
}

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
  /** Parse text typed with the user's decimal separator, with the reason when it is refused. */
  parseEntry: (text: string) => ParsedEntry;
  /** A number as text to edit: the user's decimal separator, no grouping, `digits` decimals or as stored. */
  plain: (v: number, digits?: number) => string;
  /** A number inside a message: up to 6 significant figures, the user's decimal separator, a true minus. */
  say: (v: number) => string;
  /** A temperature given in °C inside a message, in the user's unit with its symbol. */
  sayTemp: (c: number) => string;
  settings: Settings;
}

const NARROW_NBSP = '\u202f';


function fixed(v: number, digits: number, s: Pick<Settings, 'decimalSeparator' | 'thousandsGrouping'>): string {
  return formatFixed(v, digits, s);
}

/** The result of reading a typed number: the value (null for an empty field) or why it was refused. */
export type ParsedEntry = { value: number | null; error?: undefined } | { value?: undefined; error: string };

const SIGN = '[-+]?';
const EXP = '(?:[eE][-+]?\\d+)?';
/** Blanks a user may type between groups of three digits: space, no-break, narrow no-break, thin. */
const BLANK = '[ \\u00a0\\u202f\\u2009]';

/**
 * Read a number typed by a user with the chosen decimal separator. Refused, with a message in the
 * user's words, rather than guessed:
 * - the other separator where it could be a decimal separator ("12,5" with "." chosen could mean
 *   12.5 or 125; "0.885" with "," chosen could mean 0,885 or 885). The other separator is accepted
 *   only as a correct thousands grouping that cannot be read otherwise: "1,234.5" or "1,234,567"
 *   with ".", "1.234,5" with ",".
 * - a blank inside the number unless it groups thousands ("12 5" is refused, "12 345" is 12345);
 * - two decimal separators, hexadecimal, words, "Infinity".
 * Accepts a leading "−" (U+2212) or "+", and an exponent ("1e3").
 */
export function parseEntry(text: string, decimalSeparator: '.' | ','): ParsedEntry {
  const sep = decimalSeparator;
  const other = sep === '.' ? ',' : '.';
  const t = text.trim().replace(/^\u2212/, '-');
  if (t === '') return { value: null };
  const esc = (c: string) => (c === '.' ? '\\.' : c);
  const toNumber = (s: string) => Number(s.replace(sep, '.'));
  // Plain: digits, at most one decimal separator, an optional exponent.
  if (new RegExp(`^${SIGN}(?:\\d+(?:${esc(sep)}\\d*)?|${esc(sep)}\\d+)${EXP}$`).test(t)) return { value: toNumber(t) };
  // Grouped thousands: 1–3 digits, then groups of three after one consistent grouping mark.
  const grouped = new RegExp(`^(${SIGN})(\\d{1,3})((${BLANK}|${esc(other)})\\d{3}(?:\\4\\d{3})*)((?:${esc(sep)}\\d+)?)(${EXP})$`).exec(t);
  if (grouped) {
    const mark = grouped[4]!;
    const groups = grouped[3]!.split(mark).length - 1;
    const hasFraction = grouped[5] !== '';
    // "1,234" with "." chosen may be 1.234 typed the other way: refuse; "1,234.5" and "1,234,567" cannot.
    if (mark !== other || groups > 1 || hasFraction) {
      const digits = `${grouped[1]}${grouped[2]}${grouped[3]!.split(mark).join('')}${grouped[5]}${grouped[6]}`;
      return { value: toNumber(digits) };
    }
  }
  const show = (s: string) => `“${s}”`;
  const setting = `Decimal separator is “${sep}” (Settings)`;
  if (t.includes(other)) {
    const parts = t.split(other);
    if (parts.length === 2) {
      const a = `${parts[0]}.${parts[1]}`;
      const b = `${parts[0]}${parts[1]}`;
      const plain = new RegExp(`^${SIGN}\\d*(?:\\.\\d*)?$`);
      if (plain.test(a) && plain.test(b) && /\d/.test(b)) {
        const say = (x: string) => String(Number(x)).replace('.', sep).replace('-', '−');
        return { error: `${setting}: ${show(text.trim())} could mean ${say(a)} or ${say(b)}. Type it with “${sep}”, or change the separator in Settings.` };
      }
    }
    return { error: `${setting}: ${show(text.trim())} contains “${other}”. Type the number with “${sep}” as the decimal separator.` };
  }
  if (new RegExp(BLANK).test(t) || /\s/.test(t)) {
    return { error: `${show(text.trim())} has a space inside the number; a space may only group thousands (12 345). Type it without the space.` };
  }
  if (t.split(sep).length > 2) return { error: `${show(text.trim())} has more than one decimal separator “${sep}”.` };
  return { error: `${show(text.trim())} is not a number.` };
}

/**
 * Parse a number typed by a user (see {@link parseEntry}): null for empty, NaN for anything refused.
 */
export function parseNumber(text: string, decimalSeparator: '.' | ','): number | null {
  const r = parseEntry(text, decimalSeparator);
  return r.error === undefined ? r.value : Number.NaN;
}

/** Decimals needed to show a number without losing digits (at most 6). */
export { decimalsOf };

/**
 * The mark written before money: the settings' symbol, unless it names another currency than the
 * base one every cost is in (a symbol "$" kept from before the base became EUR): then the base code.
 */
export function moneySymbol(settings: Pick<Settings, 'currencySymbol' | 'baseCurrency'>): string {
  const named = normaliseCurrency(settings.currencySymbol);
  const base = normaliseCurrency(settings.baseCurrency);
  return /^[A-Z]{3}$/.test(named) && named !== base ? base : settings.currencySymbol;
}

export function makeFormatter(settings: Settings): Formatter {
  const u = units;
  const isF = settings.temperatureUnit === 'F' && u !== null;
  const cToF = (c: number) => u!.cToF(c);
  const fToC = (f: number) => u!.fToC(f);
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
      v === null || v === undefined || !Number.isFinite(v) ? '—' : `${moneySymbol(settings)}${NARROW_NBSP}${fixed(v, digits, settings)}`,
    tempValue: (c) => (isF ? cToF(c) : c),
    tempToC: (v) => {
      try {
        // 12 significant figures: what is stored carries no floating-point tail of the conversion
        // (392 °F is stored as 200 °C, not 200.00000000000003, so a limit typed in °F compares exactly).
        return isF ? Number(fToC(v).toPrecision(12)) : v;
      } catch {
        return Number.NaN; // below absolute zero
      }
    },
    tempUnit: isF ? '°F' : '°C',
    temp: (c, digits = 0) =>
      c === null || c === undefined || !Number.isFinite(c) ? '—' : `${fixed(isF ? cToF(c) : c, digits, settings)} ${isF ? '°F' : '°C'}`,
    parse: (text) => parseNumber(text, settings.decimalSeparator),
    parseEntry: (text) => parseEntry(text, settings.decimalSeparator),
    say: (v) => sayNumber(v, settings),
    sayTemp: (c) => `${f.say(isF ? cToF(c) : c)} ${isF ? '°F' : '°C'}`,
    plain: (v, digits) => fixed(v, digits ?? decimalsOf(v), { decimalSeparator: settings.decimalSeparator, thousandsGrouping: false }).replace('−', '-'),
  };
  return f;
}

/**
 * The app's one formatter, provided by the shell to every screen (src/app/App.tsx), so that a field
 * reads it from context instead of subscribing to the settings itself (a table of stocks holds
 * hundreds of fields; each subscription is work when the screen is first drawn).
 */
export const FormatContext = createContext<Formatter | null>(null);

/**
 * Formatters for the current settings (memoised; made again once the unit conversions arrive): the
 * shell's formatter under {@link FormatContext}, else the component follows the settings itself
 * (a screen rendered alone, as in tests). A component is under the provider or not for its whole
 * life, so its hooks are the same at every render.
 */
export function useFormat(): Formatter {
  const provided = useContext(FormatContext);
  if (provided) return provided;
  return useOwnFormat();
}

function useOwnFormat(): Formatter {
  const settings = useSettings();
  const loaded = useSyncExternalStore(subscribeUnits, unitsLoaded, unitsLoaded);
  useEffect(() => {
    if (settings.temperatureUnit === 'F' && !loaded) void loadUnitConversions();
  }, [settings.temperatureUnit, loaded]);
  return useMemo(() => makeFormatter(settings), [settings, loaded]);
}

/**
 * The ISO grade of a ν40 in words: "VG 460", "between 460 and 680" (two grades), "above VG 3200",
 * "below VG 2" (ISO 3448 / ASTM D2422 bands); "—" when there is no usable ν40.
 */
export function gradeLabel(kv40: number | null | undefined): string {
  if (kv40 === null || kv40 === undefined || !(kv40 > 0) || !Number.isFinite(kv40)) return '—';
  const p = gradePosition(kv40);
  if (p.kind === 'in') return `VG ${p.grade}`;
  if (p.kind === 'between') return `between ${p.lower} and ${p.upper}`;
  return `${p.kind} VG ${p.grade}`;
}

/**
 * One input of a calculation's working ("show working"), in the user's format: the unit in the
 * name's brackets tells how to write each number (°C values converted to the user's unit, which
 * the label then names). A list is written "a / b" with its units in the same order.
 */
export function formatWorkingInput(
  name: string,
  value: number | string | null | readonly (number | null)[],
  fmt: Formatter,
): { label: string; text: string } {
  const m = /^(.*?)\s*\[([^\]]*)\]$/.exec(name);
  const units = m ? m[2]!.split(' / ') : [];
  const values = Array.isArray(value) ? value : [value as number | string | null];
  const text = values
    .map((v, i) => {
      if (v === null || v === undefined) return '—';
      if (typeof v === 'string') return v;
      const unit = units[i] ?? units[0];
      return unit === '°C' ? fmt.sig(fmt.tempValue(v), 5) : fmt.sig(v, 5);
    })
    .join(' / ');
  const label = m ? `${m[1]} [${units.map((u) => (u === '°C' ? fmt.tempUnit : u)).join(' / ')}]` : name;
  return { label, text };
}

/**
 * A probability for the screen and the sheets: one decimal, two near 100 %, and never rounded to a
 * certainty it is not ("> 99.99 %", "< 0.05 %").
 *
 * @param p - probability 0–1
 * @param num - formats a number with fixed decimals (the user's separator)
 */
export function probabilityText(p: number, num: (x: number, digits: number) => string): string {
  // 1 itself is only a rounding of Φ's far tail unless nothing varies; "> 99.99 %" is true either way.
  if (p >= 0.99995) return `> ${num(99.99, 2)} %`;
  if (p >= 0.9995 && p < 1) return `${num(p * 100, 2)} %`;
  if (p > 0 && p < 0.0005) return `< ${num(0.05, 2)} %`;
  return `${num(p * 100, 1)} %`;
}
