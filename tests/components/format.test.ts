import { beforeAll, describe, expect, it } from 'vitest';
import { loadUnitConversions, makeFormatter, parseEntry, parseNumber, type Formatter } from '../../src/components/format';
import { DEFAULT_SETTINGS } from '../../src/state/settings';

const point = makeFormatter({ ...DEFAULT_SETTINGS, currencySymbol: '€' });
// Made before the °F conversions (mathjs) have loaded: it must show and read °C, labelled °C.
const early = makeFormatter({ ...DEFAULT_SETTINGS, temperatureUnit: 'F' });
let comma: Formatter;

beforeAll(async () => {
  await loadUnitConversions(); // °F conversions (mathjs) load on demand
  comma = makeFormatter({ ...DEFAULT_SETTINGS, decimalSeparator: ',', temperatureUnit: 'F' });
});

describe('°F before the unit conversions have loaded', () => {
  it('shows and reads °C, labelled °C, never a °C value labelled °F', () => {
    // identity: no conversion at all (no source needed)
    expect(early.temp(40)).toBe('40 °C');
    expect(early.tempUnit).toBe('°C');
    expect(early.tempToC(40)).toBe(40);
  });
});

describe('number formatting for the user’s habits', () => {

  it('formats with the chosen separators, grouping only from five digits', () => {
    expect(point.num(12345.678, 2)).toBe('12\u202f345.68');
    expect(point.num(1234.5, 1)).toBe('1234.5');
    expect(comma.num(12345.678, 2)).toBe('12.345,68');
    expect(point.num(-0.001, 2)).toBe('0.00'); // a rounded zero has no sign
    expect(point.num(-3.5, 1)).toBe('−3.5');
    expect(point.num(null)).toBe('—');
    expect(point.pct(0.4512)).toBe('45.1 %');
    expect(point.money(2.5)).toBe('€\u202f2.50');
    expect(point.sig(6500, 3)).toBe('6500');
    expect(point.sig(0.012345, 3)).toBe('0.0123');
  });

  it('shows temperatures in the chosen unit and converts typed values back to °C', () => {
    // 40 °C = 104 °F; 100 °C = 212 °F (definition of the Fahrenheit scale)
    expect(comma.temp(40)).toBe('104 °F');
    expect(comma.tempToC(212)).toBeCloseTo(100, 10);
    expect(point.temp(-12)).toBe('−12 °C');
    expect(Number.isNaN(comma.tempToC(-500))).toBe(true); // below absolute zero
  });

  it('stores a temperature typed in °F without a floating-point tail, so a limit typed as 392 °F is 200 °C exactly (second defect hunt)', () => {
    // t_C = 5/9·(t_F − 32) (definition of the Fahrenheit scale): 392 °F = 200 °C, 21.2 °F = −6 °C, −4 °F = −20 °C
    expect(comma.tempToC(392)).toBe(200);
    expect(comma.tempToC(21.2)).toBe(-6);
    expect(comma.tempToC(-4)).toBe(-20);
    // shown again in °F, the stored value reads as typed
    expect(comma.tempValue(comma.tempToC(10))).toBeCloseTo(10, 9);
  });

  it('parses what a user types, and refuses garbage', () => {
    // identity: the typed text is the number itself, in either decimal convention (no external source)
    expect(parseNumber(' 1 234.5 ', '.')).toBe(1234.5);
    expect(parseNumber('1.234,5', ',')).toBe(1234.5);
    expect(parseNumber('−12', '.')).toBe(-12);
    expect(parseNumber('1e3', '.')).toBe(1000);
    expect(parseNumber('', '.')).toBeNull();
    expect(Number.isNaN(parseNumber('12abc', '.')!)).toBe(true);
    expect(Number.isNaN(parseNumber('0x10', '.')!)).toBe(true);
  });
});

describe('ambiguous separators are refused, not guessed', () => {
  // identity: each accepted text is the number itself (no external source); each refusal is our rule.
  it('with "." chosen: "12,5", "12 5", "1,234" refused; grouped thousands accepted', () => {
    expect(parseEntry('12,5', '.').error).toMatch(/^Decimal separator is “\.” \(Settings\): “12,5” could mean 12\.5 or 125\./);
    expect(parseEntry('12 5', '.').error).toMatch(/space inside the number/);
    expect(parseEntry('1,234', '.').error).toMatch(/could mean 1\.234 or 1234/);
    expect(parseEntry('1,2,3', '.').error).toMatch(/contains “,”/);
    expect(parseEntry('1.2.3', '.').error).toMatch(/more than one decimal separator/);
    expect(parseEntry('1,234.5', '.').value).toBe(1234.5);
    expect(parseEntry('1,234,567', '.').value).toBe(1234567);
    expect(parseEntry('12 345', '.').value).toBe(12345);
    expect(parseEntry('12\u202f345.6', '.').value).toBe(12345.6);
    expect(Number.isNaN(parseNumber('12,5', '.')!)).toBe(true);
  });
  it('with "," chosen (mirror case): "12.5" and "0.885" refused; "1.234,5" accepted', () => {
    expect(parseEntry('12.5', ',').error).toMatch(/^Decimal separator is “,” \(Settings\): “12\.5” could mean 12,5 or 125\./);
    expect(parseEntry('0.885', ',').error).toMatch(/could mean 0,885 or 885/);
    expect(parseEntry('1.234,5', ',').value).toBe(1234.5);
    expect(parseEntry('0,885', ',').value).toBe(0.885);
    expect(parseEntry('', ',').value).toBeNull();
  });
  it('editing text is plain: the user separator, no grouping', () => {
    expect(comma.plain(12345.5)).toBe('12345,5');
    expect(point.plain(-3.25)).toBe('-3.25');
    expect(point.plain(0.1 + 0.2)).toBe('0.3');
  });
});
