import { describe, expect, it } from 'vitest';
import { BelowAbsoluteZeroError, ImplausibleDensityError, InvalidNumberError } from '../../src/core/errors';
import { cStToMm2s, cToF, cToK, convertPrice, fToC, mm2sToCSt } from '../../src/core/units';
import { expectClose } from '../helpers/tolerance';

describe('temperature', () => {
  it('°C ↔ °F ↔ K', () => {
    // t_F = 9/5·t_C + 32, T = t + 273.15: definitions of the scales (common practice, no source)
    expectClose(cToF(40), 104, 1e-9);
    expectClose(cToF(100), 212, 1e-9);
    expectClose(cToF(-40), -40, 1e-9);
    expectClose(fToC(212), 100, 1e-9);
    expectClose(fToC(32), 0, 1e-9);
    expectClose(cToK(40), 313.15, 1e-9);
    expectClose(cToK(-273.15), 0, 1e-9);
  });
  it('round-trips', () => {
    for (const t of [-60, -15.5, 0, 37.8, 40, 98.9, 100, 250]) {
      expectClose(fToC(cToF(t)), t, 1e-9); // inverse conversions (identity)
    }
  });
  it('rejects temperatures below absolute zero', () => {
    expect(() => cToK(-273.16)).toThrow(BelowAbsoluteZeroError);
    expect(() => cToF(-300)).toThrow(BelowAbsoluteZeroError);
    expect(() => fToC(-460)).toThrow(BelowAbsoluteZeroError);
    expect(() => cToK(Number.NaN)).toThrow(InvalidNumberError);
    expect(() => cToK(-300)).toThrow(/cToK: tC = -300 °C is below absolute zero/);
  });
});

describe('viscosity units', () => {
  it('1 cSt = 1 mm²/s exactly', () => {
    // SI definition: 1 St = 1 cm²/s, so 1 cSt = 1 mm²/s (common practice, no source)
    expect(cStToMm2s(320)).toBe(320);
    expect(mm2sToCSt(18.5)).toBe(18.5);
    expect(() => cStToMm2s(Number.POSITIVE_INFINITY)).toThrow(InvalidNumberError);
  });
});

describe('price basis', () => {
  it('per tonne, per kg, per litre at 15 °C, same currency', () => {
    // 1 t = 1000 kg; 1 L at 15 °C weighs ρ15 kg (common practice, no source)
    const p = convertPrice({ amount: 900, basis: 'per-tonne', currency: 'EUR' }, 'per-litre', 0.9);
    expectClose(p.amount, 0.81, 1e-12);
    expect(p.basis).toBe('per-litre');
    expect(p.currency).toBe('EUR');
    expectClose(convertPrice({ amount: 1.8, basis: 'per-litre', currency: 'X' }, 'per-kg', 0.9).amount, 2, 1e-12);
    expectClose(convertPrice({ amount: 2, basis: 'per-kg', currency: 'X' }, 'per-tonne', 0.9).amount, 2000, 1e-9);
    expect(convertPrice({ amount: 2, basis: 'per-kg', currency: 'X' }, 'per-kg', 0.9).amount).toBe(2);
  });
  it('rejects an implausible density', () => {
    expect(() => convertPrice({ amount: 1, basis: 'per-litre', currency: 'X' }, 'per-kg', 870)).toThrow(
      ImplausibleDensityError,
    );
  });
});
