/**
 * The core's errors in the user's words. The calculation core names the function, the field path
 * and the raw value (`prepareComponents: targets.bounds.demo-bw-280.min = 1.5; a fraction must lie
 * between 0 and 1`), which is right for a programmer and wrong on a screen. Every screen that shows
 * why a calculation stopped passes the error through {@link userMessage}: stock ids become stock
 * codes, fractions become per cent, field paths become the names on screen, function names go.
 */
import { BlendbenchInputError } from '../core/errors';
import type { Component } from '../core/formulation/model';
import type { SayNumbers } from './checks';

/** Names on screen for the fields the core names in its messages. */
const FIELD_WORDS: Record<string, string> = {
  kv40: 'ν40',
  kv100: 'ν100',
  density15: 'density at 15 °C',
  anilinePoint: 'aniline point',
  pourPoint: 'pour point',
  flashPoint: 'flash point',
  massFraction: 'share',
  pricePerKg: 'price per kg',
  price: 'price',
  shearLossPct: 'permanent shear loss',
  oxidationRating: 'oxidation rating',
  viscosityPoints: 'measured viscosities',
  componentId: 'stock',
  tolerancePct: 'tolerance',
  targetKv40: 'target ν40',
  minVi: 'minimum VI',
  maxAnilinePoint: 'maximum aniline point',
  maxPolymerFraction: 'maximum polymer share',
  maxPourPoint: 'maximum pour point',
  minFlashPoint: 'minimum flash point',
  grade: 'viscosity grade',
  tempC: 'temperature',
  targetKv: 'target viscosity',
  kvLight: 'ν of the light stock',
  kvHeavy: 'ν of the heavy stock',
};

interface Context {
  components: readonly Component[];
  /**
   * Numbers in the user's format: the app's formatter (`useFormat()`), or `FILE_NUMBERS` ("." and
   * °C) for text meant for files. Required, so that no screen shows a core message in "." and °C
   * against the user's settings.
   */
  words: SayNumbers;
}

/** A share 0–1 as per cent text, e.g. "40 %". */
function pct(f: unknown, words: SayNumbers): string {
  return typeof f === 'number' && Number.isFinite(f) ? `${words.say(Number((f * 100).toPrecision(6)))} %` : String(f);
}

function codeOf(id: string, components: readonly Component[]): string {
  return components.find((c) => c.id === id)?.code || id;
}

/** A field path in words: "components[2].density15" → "BW-280 density at 15 °C". */
function fieldWords(path: string, components: readonly Component[]): string {
  return path
    .replace(/components\[(\d+)\]\.?/g, (_, i: string) => `${components[Number(i)]?.code ?? `stock ${Number(i) + 1}`} `)
    .replace(/(?:parts|lines|reference\.lines)\[(\d+)\]\.?/g, (_, i: string) => `line ${Number(i) + 1} `)
    .replace(/targets\./g, '')
    .replace(/\b([a-zA-Z]+[0-9]*)\b/g, (w: string) => FIELD_WORDS[w] ?? w)
    .trim();
}

/**
 * The message of an error from the core (or anything thrown) in the user's words.
 *
 * @param e - what was thrown
 * @param ctx - the library (to name stocks by code) and the number format
 * @returns one or two sentences, naming the stock or field as the screens do
 */
export function userMessage(e: unknown, ctx: Context): string {
  const { words } = ctx;
  const { components } = ctx;
  if (e instanceof BlendbenchInputError) {
    // A line plan names the grade: "grades[2].targets.…" with the message "VG 320: …".
    const grade = /^grades\[\d+\]\.(.+)$/.exec(e.field);
    if (grade) {
      const opening = /^(.+?): /.exec(e.message)?.[1];
      const label = opening && !/^[a-z]+[A-Z][A-Za-z]*$/.test(opening) ? opening : undefined; // not a function name
      const inner = userMessage(new BlendbenchInputError(grade[1]!, e.value, label ? e.message.slice(label.length + 2) : e.message), ctx);
      return label ? `${label}: ${inner}` : inner;
    }
    const f = e.field;
    const bound = /^targets\.bounds\.(.+?)(?:\.(min|max))?$/.exec(f);
    if (bound) {
      const code = codeOf(bound[1]!, components);
      if (!bound[2]) {
        const b = e.value as { min?: number; max?: number };
        return `${code}: minimum ${pct(b.min, words)} is above its maximum ${pct(b.max, words)}. Lower the minimum or raise the maximum (Per-stock limits).`;
      }
      const which = bound[2] === 'min' ? 'minimum' : 'maximum';
      return `${code}: the ${which} share ${pct(e.value, words)} must be from 0 to 100 % (Per-stock limits).`;
    }
    if (f === 'targets.additive.massFraction') return `The additive treat rate ${pct(e.value, words)} must be from 0 to below 100 %.`;
    if (f === 'reference') return 'Closest to a reference recipe needs a reference recipe: choose one under Objective.';
    return polish(e.message, components, words);
  }
  if (e instanceof Error) return polish(e.message, components, words);
  return String(e);
}

/** The standard reference temperatures a property is named at (ρ15, ν40, ν100): names, not values. */
const REFERENCE_C = new Set([15, 40, 100]);
/**
 * A number as the core writes it into a message (`${x}`, `toPrecision`, `toFixed`), or a range of
 * two ("0.6–1.3", "−20…150"): not part of a word, a code or a field path ("kv40", "D341-20",
 * "BW-190", "parts[2]"), optionally followed by "°C". Groups: 1 the character before; 2 the number;
 * 3 the range mark and 4 the second number; 5 " °C" when it is a temperature.
 */
const NUM = '[-−]?\\d+(?:\\.\\d+)?(?:e[-+]?\\d+)?';
const CORE_NUMBER = new RegExp(`(^|[\\s(=:,;–…/<>≤≥±])(${NUM})(?:([–…])(${NUM}))?(?![\\w\\]]|\\.\\d)( ?°C\\b)?`, 'g');

/**
 * The numbers of a core message written by the user's formatter: temperatures in their unit
 * (`sayTemp`; a reference temperature after "at" — "at 15 °C", "at 40 °C" — stays the name it is),
 * other numbers with their decimal separator and a true minus, digits as the core wrote them
 * (exponents kept: "1e-9").
 */
export function sayCoreNumbers(message: string, words: SayNumbers): string {
  const sep = words.say(0.5).includes(',') ? ',' : '.';
  const plain = (num: string) => num.replace(/^-/, '−').replace('.', sep);
  const value = (num: string) => Number(num.replace('−', '-'));
  return message.replace(
    CORE_NUMBER,
    (whole, before: string, a: string, mark: string | undefined, b: string | undefined, degC: string | undefined, offset: number) => {
      if (!Number.isFinite(value(a)) || (b !== undefined && !Number.isFinite(value(b)))) return whole;
      const isReference = b === undefined && REFERENCE_C.has(value(a)) && /\bat $/.test(message.slice(Math.max(0, offset - 3), offset + before.length));
      if (degC && !isReference) {
        const unit = words.sayTemp(0).replace(/^[^ ]* /, '');
        // A temperature below absolute zero (the very thing such a message is about): the app's
        // converter refuses it, so the unit's definition is applied here (t_F = 9/5·t_C + 32).
        const say = (tC: number): string => {
          if (tC > -273.15) return words.sayTemp(tC).replace(/ [^ ]*$/, '');
          return words.say(unit === '°F' ? Number(((tC * 9) / 5 + 32).toPrecision(6)) : tC);
        };
        // "40–100 °C" → "104–212 °F": both ends converted, the unit written once.
        return `${before}${say(value(a))}${b === undefined ? '' : `${mark}${say(value(b))}`} ${unit}`;
      }
      return `${before}${plain(a)}${b === undefined ? '' : `${mark}${plain(b)}`}${degC ?? ''}`;
    },
  );
}

/**
 * The generic rewording: drop "functionName: " openings, write field paths in words and stock ids
 * as codes, and "x = v" as "x of v".
 */
function polish(message: string, components: readonly Component[], words: SayNumbers): string {
  // Numbers first, while the message still holds the core's field names (their digits are not numbers).
  let m = sayCoreNumbers(message.replace(/\b[a-z]+[A-Z][A-Za-z]*: /g, ''), words);
  // Field paths: components[i].x, parts[i].x, targets.x, bare known fields.
  // The QC loop's heel and the blend sheet's batch, named as on screen.
  m = m.replace(/\bheel\.massKg\b/g, 'heel mass').replace(/\bbatch\.(?:kg|litres)\b/g, 'batch size');
  m = m.replace(/\bpoints\[(\d+)\]\.kv\b/g, (_, i: string) => `measured viscosity ${Number(i) + 1}`);
  m = m.replace(/\bpoints\[(\d+)\]/g, (_, i: string) => `measured point ${Number(i) + 1}`);
  m = m.replace(/\b(?:components|parts|lines|reference\.lines)\[\d+\](?:\.[A-Za-z0-9]+)*|\btargets\.[A-Za-z0-9.]+/g, (p) => fieldWords(p, components));
  m = m.replace(/\b(kv40|kv100|density15|anilinePoint|pourPoint|flashPoint|massFraction|shearLossPct|tolerancePct|componentId|tempC|targetKv|kvLight|kvHeavy)\b/g, (w) => FIELD_WORDS[w] ?? w);
  // Stock ids in quotes or bare → codes.
  for (const c of components) {
    if (c.id && c.code && c.id !== c.code && m.includes(c.id)) m = m.split(`"${c.id}"`).join(c.code).split(c.id).join(c.code);
  }
  m = m.replace(/ = /g, ' of ');
  // A capital for a Latin opening only: "ν100 …" keeps its small nu (a capital Ν reads as N).
  return /^[a-z]/.test(m) ? m.charAt(0).toUpperCase() + m.slice(1) : m;
}

/**
 * How the stores write the numbers of their refusals (a field rule broken by a save, a change, an
 * import): the app's formatter, handed over once by the composition (`setRefusalWords(useFormat())`
 * in src/app), so that a refusal reads with the user's decimal separator and temperature unit as every
 * other message does. Until then (and for text meant for files) the rules' own "." and °C stand.
 */
let refusalWords: SayNumbers | null = null;

/** Hand the stores the app's number formatter (null: back to "." and °C). */
export function setRefusalWords(words: SayNumbers | null): void {
  refusalWords = words;
}

/**
 * A store's refusal (written by the field rules with "." and °C) in the user's numbers, through
 * {@link sayCoreNumbers} — the one rewriting every core message goes through. What the user named is
 * left as typed: the record the message opens with ("Stock SN 1.5: …") and anything in “quotes”
 * (a recipe's name, a typed value). Null stays null.
 */
export function sayRefusal(message: string | null, words: SayNumbers | null = refusalWords): string | null {
  if (message === null || words === null) return message;
  const who = /^(?:Stock [^:]*|Recipe “[^”]*”|The rate for [^:]*): /.exec(message)?.[0] ?? '';
  const rest = message
    .slice(who.length)
    .split(/(“[^”]*”)/)
    .map((part, i) => (i % 2 === 1 ? part : sayCoreNumbers(part, words)))
    .join('');
  return who + rest;
}
