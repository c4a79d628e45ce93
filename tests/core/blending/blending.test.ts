import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  astmHeavyFraction,
  astmLogLog,
  blendViscosityAstmD7152,
  kvFromAstmLogLog,
} from '../../../src/core/blending/astm-loglog';
import {
  BLEND_METHOD_LABEL,
  BLEND_METHODS,
  blendKv40Kv100,
  blendViscosityAt,
  type BlendPart,
} from '../../../src/core/blending/blend-viscosity';
import {
  blendViscosityRefutas,
  kvFromRefutasVbn,
  refutasHeavyFraction,
  refutasVbn,
} from '../../../src/core/blending/refutas';
import { massToVolumeFractions } from '../../../src/core/blending/density';
import {
  BlendbenchInputError,
  FractionSumError,
  ImplausibleDensityError,
  InvalidNumberError,
  NonPositiveViscosityError,
  ViscosityOrderError,
  ViscosityOutOfRangeError,
} from '../../../src/core/errors';
import { viscosityAtTemperature } from '../../../src/core/viscosity/viscosity-temperature';
import { expectClose, expectRelClose, isClose } from '../../helpers/tolerance';

describe('Refutas: check values', () => {
  it('B1: blending numbers of 10, 100 and 460 mm²/s', () => {
    // formula, Refutas VBN = 14.534·ln(ln(ν + 0.8)) + 10.975 (tests/reference/check-values.md B1)
    expectClose(refutasVbn(10), 23.5747, 1e-4);
    expectClose(refutasVbn(100), 33.1962, 1e-4);
    expectClose(refutasVbn(460), 37.335, 1e-4);
  });
  it('B2: 50/50 by mass of 100 and 460 mm²/s → 203.39', () => {
    // formula, Refutas (tests/reference/check-values.md B2)
    expectClose(
      blendViscosityRefutas([
        { massFraction: 0.5, kv: 100 },
        { massFraction: 0.5, kv: 460 },
      ]),
      203.39,
      0.05,
    );
  });
  it('B3: mass fraction of the 460 stock for 220 → 0.55126', () => {
    // formula, Refutas exact linear inverse (tests/reference/check-values.md B3)
    expectClose(refutasHeavyFraction(100, 460, 220), 0.55126, 1e-4);
  });
  it('VBN ↔ ν round-trips', () => {
    // inverse functions (identity), Refutas
    for (const kv of [2, 10, 100, 460, 6500]) expectRelClose(kvFromRefutasVbn(refutasVbn(kv)), kv, 1e-12);
  });
});

describe('ASTM D7152 log-log rule: check values', () => {
  it('B4: 50/50 by volume of 100 and 460 mm²/s → 203.35', () => {
    // formula, ASTM D7152 constant-temperature form (tests/reference/check-values.md B4)
    expectClose(
      blendViscosityAstmD7152([
        { volumeFraction: 0.5, kv: 100 },
        { volumeFraction: 0.5, kv: 460 },
      ]),
      203.35,
      0.05,
    );
  });
  it('inverse reaches the B4 blend at φ = 0.5', () => {
    // formula, exact linear inverse of the log-log rule (check-values.md B4)
    expectClose(astmHeavyFraction(100, 460, 203.35), 0.5, 1e-4);
    for (const kv of [10, 460, 6500]) expectRelClose(kvFromAstmLogLog(astmLogLog(kv)), kv, 1e-12); // identity
    // ASTM D341-20's published inverse is exact to rounding only from about 5 mm²/s up (viscosity-temperature.test.ts)
    expectRelClose(kvFromAstmLogLog(astmLogLog(2)), 2, 1e-4);
  });
});

describe('B5: a one-component blend returns the component', () => {
  it('at fraction 1, by each rule', () => {
    // identity (tests/reference/check-values.md B5), 1e-9 relative
    expectRelClose(blendViscosityRefutas([{ massFraction: 1, kv: 320 }]), 320, 1e-9);
    expectRelClose(blendViscosityAstmD7152([{ volumeFraction: 1, kv: 320 }]), 320, 1e-9);
    expectRelClose(
      blendViscosityRefutas([
        { massFraction: 0, kv: 46 },
        { massFraction: 1, kv: 320 },
      ]),
      320,
      1e-9,
    );
    for (const method of BLEND_METHODS) {
      const r = blendViscosityAt(method, [{ massFraction: 1, density15: 0.88, kv40: 320, kv100: 24 }], 60);
      expectRelClose(r.kv, viscosityAtTemperature(320, 24, 60), 1e-9);
      expect(r.method).toBe(method);
    }
  });
});

describe('blend at any temperature', () => {
  const light: BlendPart = { massFraction: 0.5, density15: 0.865, kv40: 100, kv100: 11 };
  const heavy: BlendPart = { massFraction: 0.5, density15: 0.9, kv40: 460, kv100: 31 };

  it('at 40 °C equals the constant-temperature rule on the measured ν40', () => {
    // Refutas B2 and D7152 with ideal-mixing volume fractions (tests/reference/check-values.md B2, D1)
    const r = blendViscosityAt('refutas', [light, heavy], 40);
    expectClose(r.kv, 203.39, 0.05);
    expect(r.method).toBe('refutas');
    const phi = massToVolumeFractions([light, heavy]);
    const d = blendViscosityAt('astm-d7152', [light, heavy], 40);
    expectRelClose(
      d.kv,
      blendViscosityAstmD7152([
        { volumeFraction: phi[0]!, kv: 100 },
        { volumeFraction: phi[1]!, kv: 460 },
      ]),
      1e-12,
    );
    expect(d.method).toBe('astm-d7152');
  });

  it('moves each component along its own D341 line first', () => {
    // ASTM D341 per component, then Refutas at one temperature (method composition, no source)
    const r = blendViscosityAt('refutas', [light, heavy], 60);
    const expected = blendViscosityRefutas([
      { massFraction: 0.5, kv: viscosityAtTemperature(100, 11, 60) },
      { massFraction: 0.5, kv: viscosityAtTemperature(460, 31, 60) },
    ]);
    expectRelClose(r.kv, expected, 1e-12);
    const both = blendKv40Kv100('refutas', [light, heavy]);
    expectRelClose(both.kv40, blendViscosityAt('refutas', [light, heavy], 40).kv, 1e-12);
    expectRelClose(both.kv100, blendViscosityAt('refutas', [light, heavy], 100).kv, 1e-12);
    expect(both.method).toBe('refutas');
  });

  it('names every method', () => {
    expect(Object.keys(BLEND_METHOD_LABEL).sort()).toEqual([...BLEND_METHODS].sort());
    expect(BLEND_METHOD_LABEL.refutas).toMatch(/Refutas/);
    expect(BLEND_METHOD_LABEL['astm-d7152']).toMatch(/^D7152 ASTM Blending Method \(constant temperature\)/);
    expect(BLEND_METHOD_LABEL['d7152-wright']).toMatch(/^D7152 Wright method/);
    // Refutas is not a D7152 method and is never labelled as one (issue 13)
    expect(BLEND_METHOD_LABEL.refutas).not.toMatch(/D7152/);
  });

  it('rejects impossible parts with the part named', () => {
    expect(() => blendViscosityAt('refutas', [{ ...light, massFraction: 1, kv100: 120 }], 40)).toThrow(
      ViscosityOrderError,
    );
    expect(() => blendViscosityAt('refutas', [{ ...light, massFraction: 1, kv100: 120 }], 40)).toThrow(
      /^blendViscosityAt: parts\[0\]: kv100 = 120 mm²\/s is not below kv40/,
    );
    expect(() => blendViscosityAt('refutas', [light, { ...heavy, massFraction: 0.4 }], 40)).toThrow(FractionSumError);
    expect(() => blendViscosityAt('astm-d7152', [light, { ...heavy, density15: 900 }], 40)).toThrow(
      ImplausibleDensityError,
    );
    expect(() => blendViscosityAt('other' as never, [light, heavy], 40)).toThrow(BlendbenchInputError);
    expect(() => blendViscosityAt('refutas', [light, heavy], -274)).toThrow(/absolute zero/);
    // a component thinned below the D341 range at the blending temperature names the part
    expect(() => blendViscosityAt('refutas', [heavy, { ...light, kv40: 20, kv100: 4 }], 3000)).toThrow(
      /^blendViscosityAt: parts\[\d\]: viscosityAtTemperature: at tempC = 3000 °C/,
    );
  });
});

describe('rule input errors', () => {
  it('fractions, viscosities and two-component ranges', () => {
    expect(() => blendViscosityRefutas([])).toThrow(FractionSumError);
    expect(() =>
      blendViscosityRefutas([
        { massFraction: 0.5, kv: 100 },
        { massFraction: 0.5 + 2e-9, kv: 460 },
      ]),
    ).toThrow(FractionSumError);
    expect(() =>
      blendViscosityRefutas([
        { massFraction: 0.5, kv: 100 },
        { massFraction: 0.5 + 5e-10, kv: 460 },
      ]),
    ).not.toThrow(); // within 1e-9 (issue 2)
    expect(() =>
      blendViscosityRefutas([
        { massFraction: -0.2, kv: 100 },
        { massFraction: 1.2, kv: 460 },
      ]),
    ).toThrow(FractionSumError);
    expect(() => blendViscosityAstmD7152([{ volumeFraction: 1, kv: 0 }])).toThrow(NonPositiveViscosityError);
    expect(() => blendViscosityAstmD7152([{ volumeFraction: Number.NaN, kv: 10 }])).toThrow(InvalidNumberError);
    expect(() => refutasVbn(0.1)).toThrow(ViscosityOutOfRangeError);
    expect(() => refutasHeavyFraction(460, 100, 220)).toThrow(ViscosityOutOfRangeError);
    expect(() => refutasHeavyFraction(100, 460, 500)).toThrow(/targetKv = 500 .* outside 100–460/);
    expect(() => astmHeavyFraction(100, 460, 90)).toThrow(ViscosityOutOfRangeError);
  });
});

// ---------------------------------------------------------------------------------------------
// Properties of both mixing rules (common practice, no source: the rules are weighted means of a
// monotonic transform, so these follow from their equations)
// ---------------------------------------------------------------------------------------------
const kvArb = fc.double({ min: 2, max: 5000, noNaN: true });
const weightArb = fc.double({ min: 0.01, max: 1, noNaN: true });
const partsArb = fc.array(fc.tuple(weightArb, kvArb), { minLength: 1, maxLength: 6 }).map((ps) => {
  const total = ps.reduce((s, [w]) => s + w, 0);
  return ps.map(([w, kv]) => ({ f: w / total, kv }));
});

type Rule = (parts: { f: number; kv: number }[]) => number;
const rules: [string, Rule][] = [
  ['Refutas', (ps) => blendViscosityRefutas(ps.map((p) => ({ massFraction: p.f, kv: p.kv })))],
  ['ASTM D7152', (ps) => blendViscosityAstmD7152(ps.map((p) => ({ volumeFraction: p.f, kv: p.kv })))],
];

describe.each(rules)('%s properties', (_name, rule) => {
  it('a one-component blend returns the component', () => {
    // identity (tests/reference/check-values.md B5)
    fc.assert(fc.property(kvArb, (kv) => isClose(rule([{ f: 1, kv }]), kv, 1e-9)));
  });

  it('order does not matter', () => {
    // identity: both rules are sums over components, so order cannot matter (no external source)
    fc.assert(
      fc.property(partsArb, (parts) => isClose(rule(parts), rule([...parts].reverse()), 1e-10)),
    );
  });

  it('lies between the components', () => {
    fc.assert(
      fc.property(partsArb, (parts) => {
        const kv = rule(parts);
        const kvs = parts.map((p) => p.kv);
        // D341-20's published inverse (D7152 rule) is exact to rounding only from about 5 mm²/s up
        const tol = Math.min(...kvs) < 5 ? 2e-4 : 1e-9;
        return kv >= Math.min(...kvs) * (1 - tol) && kv <= Math.max(...kvs) * (1 + tol);
      }),
    );
  });

  it('rises with the heavy fraction', () => {
    fc.assert(
      fc.property(kvArb, kvArb, fc.double({ min: 0, max: 1, noNaN: true }), fc.double({ min: 0, max: 1, noNaN: true }), (a, b, x, y) => {
        fc.pre(a !== b);
        const [lo, hi] = a < b ? [a, b] : [b, a];
        const [w1, w2] = x < y ? [x, y] : [y, x];
        const blend = (w: number): number => rule([{ f: 1 - w, kv: lo }, { f: w, kv: hi }]);
        // a single part returns its ν exactly; a blend goes through D341-20's published inverse, exact
        // to rounding only from about 5 mm²/s up (viscosity-temperature.test.ts)
        return blend(w1) <= blend(w2) * (1 + (lo < 5 ? 2e-4 : 1e-12));
      }),
    );
  });
});

describe('two-component inverses reproduce their target', () => {
  it('Refutas (mass) and D7152 (volume)', () => {
    // exact linear inverses of the rules (tests/reference/check-values.md B3)
    fc.assert(
      fc.property(kvArb, kvArb, fc.double({ min: 0, max: 1, noNaN: true }), (a, b, s) => {
        fc.pre(Math.abs(a - b) > 1e-6 * Math.max(a, b));
        const [lo, hi] = a < b ? [a, b] : [b, a];
        // clamped: lo + 1·(hi − lo) can round one ulp above hi (found by the property, seed −1026814035)
        const target = Math.min(hi, lo + s * (hi - lo));
        const w = refutasHeavyFraction(lo, hi, target);
        const phi = astmHeavyFraction(lo, hi, target);
        const r = blendViscosityRefutas([
          { massFraction: 1 - w, kv: lo },
          { massFraction: w, kv: hi },
        ]);
        const d = blendViscosityAstmD7152([
          { volumeFraction: 1 - phi, kv: lo },
          { volumeFraction: phi, kv: hi },
        ]);
        // the D7152 rule inverts Z by D341-20's published inverse: exact to rounding from about 5 mm²/s
        return w >= -1e-12 && w <= 1 + 1e-12 && isClose(r, target, 1e-8) && isClose(d, target, target < 5 ? 2e-4 : 1e-8);
      }),
    );
  });
});

describe('blend at any temperature: properties', () => {
  const partArb = fc
    .tuple(
      fc.double({ min: 0.01, max: 1, noNaN: true }),
      fc.double({ min: 0.8, max: 1.05, noNaN: true }),
      fc.double({ min: 2.5, max: 200, noNaN: true }),
      fc.double({ min: 4, max: 20, noNaN: true }),
    )
    .map(([w, rho, kv100, ratio]) => ({ w, density15: rho, kv100, kv40: kv100 * ratio }));
  const blendArb = fc.array(partArb, { minLength: 1, maxLength: 5 }).map((ps) => {
    const total = ps.reduce((s, p) => s + p.w, 0);
    return ps.map((p): BlendPart => ({ massFraction: p.w / total, density15: p.density15, kv40: p.kv40, kv100: p.kv100 }));
  });
  const tArb = fc.double({ min: 0, max: 100, noNaN: true });
  const methodArb = fc.constantFrom(...BLEND_METHODS);

  it('one component returns its own D341 viscosity; order does not matter; result between parts', () => {
    // identity and weighted-mean properties of the rules after ASTM D341 per component (no source)
    fc.assert(
      fc.property(blendArb, tArb, methodArb, (parts, t, method) => {
        const one = parts[0]!;
        const single = blendViscosityAt(method, [{ ...one, massFraction: 1 }], t).kv;
        const own = viscosityAtTemperature(one.kv40, one.kv100, t);
        const kv = blendViscosityAt(method, parts, t).kv;
        const rev = blendViscosityAt(method, [...parts].reverse(), t).kv;
        const kvs = parts.map((p) => viscosityAtTemperature(p.kv40, p.kv100, t));
        return (
          isClose(single, own, 1e-9) &&
          isClose(kv, rev, 1e-10) &&
          kv >= Math.min(...kvs) * (1 - 1e-9) &&
          kv <= Math.max(...kvs) * (1 + 1e-9)
        );
      }),
    );
  });
});
