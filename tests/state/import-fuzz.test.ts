/**
 * Fuzzing of library imports (issue 6): 10,000 generated malformed or hostile CSV / JSON files —
 * wrong types, missing columns, huge numbers, NaN, Infinity, negative viscosities, 10 MB fields,
 * duplicate codes, markup in names — must never throw and must never change the library, neither
 * the store in memory nor the copy saved in IndexedDB (fake-indexeddb here). A preview with an error
 * is refused by `applyLibraryImport`. Markup is kept as plain text, never interpreted.
 */
import 'fake-indexeddb/auto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { get as idbGet } from 'idb-keyval';
import {
  previewCsv,
  previewJson,
  previewLibraryImport,
  applyLibraryImport,
  libraryToJson,
  CSV_COLUMNS,
  type ImportPreview,
} from '../../src/state/library-io';
import { parseBackupText } from '../../src/state/backup';
import { savedWorkDb, whenSaved } from '../../src/state/persistence';
import { startSavedWork, useLibrary } from '../../src/state';
import type { Component } from '../../src/core/formulation/model';

// A fixed seed keeps the suite reproducible (as in tests/core/solver-fuzz.test.ts);
// FUZZ_SEED=<n> explores other cases. fast-check prints the seed of any failure.
fc.configureGlobal({ seed: Number(process.env.FUZZ_SEED ?? 20_261_202) });

// Share of the 10,000 runs per generator family (sums to 10,000).
const RUNS = { csvFaults: 3500, jsonFaults: 2500, rawText: 2000, envelope: 1000, backup: 1000 } as const;

let baseline: Component[];
let baselineJson: string;
let storedBefore: unknown;

beforeAll(async () => {
  await startSavedWork({ requestPersistence: false });
  await whenSaved();
  baseline = useLibrary.getState().components;
  baselineJson = JSON.stringify(baseline);
  storedBefore = await idbGet('library', savedWorkDb());
  expect(storedBefore).toBeTruthy();
});

afterAll(async () => {
  await whenSaved();
});

/** Every hostile preview must be refused, and nothing may have changed. */
function expectRefusedAndUnchanged(p: ImportPreview): void {
  expect(p.valid).toBe(false);
  expect(applyLibraryImport(p)).toBe(false);
  expect(useLibrary.getState().components).toBe(baseline);
}

function expectUnchanged(): void {
  expect(useLibrary.getState().components).toBe(baseline);
}

// ---------------------------------------------------------------------------------------------
// Building blocks

const MARKUP = [
  '<img src=x onerror="globalThis.__pwned=1">',
  '<script>globalThis.__pwned=1</script>',
  '"><svg onload=globalThis.__pwned=1>',
  "javascript:globalThis.__pwned=1",
  '=HYPERLINK("http://example.invalid")',
  '{{constructor.constructor("globalThis.__pwned=1")()}}',
  '\u202Eevil\u202C',
  '\u0000\u0001\uFFFF',
];

const NASTY_NUMBERS = [
  'NaN', 'nan', 'Infinity', '-Infinity', 'inf', '1e400', '-1e400', '9'.repeat(400), '0x10', '1,2,3', '--5', '5-',
  'abc', '١٢٣', '1 000', '∞', 'null', 'undefined', 'true', '[]', '{}', '1e', '.', '-', '+', 'e5',
];
/** Finite but absurd magnitudes (an oil's ν, density or price is never anywhere near these). */
const HUGE_NUMBERS = ['1e300', '-1e300', '1.7976931348623157e308', '1e30', '123456789012345678901234567890'];

interface Row {
  code: string;
  name: string;
  category: string;
  kv40: string;
  kv100: string;
  density: string;
  price: string;
  aniline: string;
  notes: string;
}

const validRow = (i: number) =>
  fc.record({
    code: fc.constant(`FZ-${i}`),
    name: fc.oneof(fc.string({ maxLength: 30 }), fc.constantFrom(...MARKUP)),
    category: fc.constantFrom('group-i', 'group-ii', 'group-iii', 'group-iv', 'group-v', 'II', 'pao'),
    kv40: fc.double({ min: 20, max: 2000, noNaN: true }),
    ratio: fc.double({ min: 6, max: 20, noNaN: true }),
    density: fc.double({ min: 0.82, max: 0.95, noNaN: true }),
    price: fc.double({ min: 0.5, max: 5, noNaN: true }),
    aniline: fc.double({ min: 90, max: 140, noNaN: true }),
    notes: fc.oneof(fc.string({ maxLength: 40 }), fc.constantFrom(...MARKUP)),
  }).map(
    (r): Row => ({
      code: r.code,
      name: r.name,
      category: r.category,
      kv40: r.kv40.toFixed(2),
      kv100: (r.kv40 / r.ratio).toFixed(3),
      density: r.density.toFixed(4),
      price: r.price.toFixed(3),
      aniline: r.aniline.toFixed(1),
      notes: r.notes,
    }),
  );

type CsvFault =
  | { kind: 'nasty'; field: 'kv40' | 'kv100' | 'density' | 'price'; value: string }
  | { kind: 'huge'; field: 'kv40' | 'kv100' | 'density' | 'price' | 'aniline'; value: string }
  | { kind: 'negative-viscosity'; field: 'kv40' | 'kv100' }
  | { kind: 'zero-viscosity'; field: 'kv40' | 'kv100' }
  | { kind: 'kv100-not-below-kv40' }
  | { kind: 'bad-category'; value: string }
  | { kind: 'duplicate-code'; upper: boolean }
  | { kind: 'empty-code' }
  | { kind: 'missing-column'; column: 'code' | 'category' | 'kv40_mm2s' | 'kv100_mm2s' | 'density15_kg_per_l' | 'price' }
  | { kind: 'unbalanced-quote' }
  | { kind: 'empty-required'; field: 'kv40' | 'kv100' | 'density' | 'price' };

const csvFault: fc.Arbitrary<CsvFault> = fc.oneof(
  fc.record({ kind: fc.constant('nasty' as const), field: fc.constantFrom('kv40', 'kv100', 'density', 'price'), value: fc.constantFrom(...NASTY_NUMBERS) }),
  fc.record({ kind: fc.constant('huge' as const), field: fc.constantFrom('kv40', 'kv100', 'density', 'price', 'aniline'), value: fc.constantFrom(...HUGE_NUMBERS) }),
  fc.record({ kind: fc.constant('negative-viscosity' as const), field: fc.constantFrom('kv40', 'kv100') }),
  fc.record({ kind: fc.constant('zero-viscosity' as const), field: fc.constantFrom('kv40', 'kv100') }),
  fc.record({ kind: fc.constant('kv100-not-below-kv40' as const) }),
  fc.record({ kind: fc.constant('bad-category' as const), value: fc.oneof(fc.string({ maxLength: 12 }), fc.constantFrom(...MARKUP)) }),
  fc.record({ kind: fc.constant('duplicate-code' as const), upper: fc.boolean() }),
  fc.record({ kind: fc.constant('empty-code' as const) }),
  fc.record({
    kind: fc.constant('missing-column' as const),
    column: fc.constantFrom('code', 'category', 'kv40_mm2s', 'kv100_mm2s', 'density15_kg_per_l', 'price'),
  }),
  fc.record({ kind: fc.constant('unbalanced-quote' as const) }),
  fc.record({ kind: fc.constant('empty-required' as const), field: fc.constantFrom('kv40', 'kv100', 'density', 'price') }),
);

const HEADER: Record<keyof Row, string> = {
  code: 'code',
  name: 'name',
  category: 'category',
  kv40: 'kv40_mm2s',
  kv100: 'kv100_mm2s',
  density: 'density15_kg_per_l',
  price: 'price',
  aniline: 'aniline_point_c',
  notes: 'notes',
};

const quote = (s: string) => `"${s.replace(/"/g, '""')}"`;

function toCsv(rows: Row[], fault: CsvFault, at: number, order: (keyof Row)[], sep: ',' | ';'): string {
  const r = rows.map((x) => ({ ...x }));
  const target = r[at % r.length]!;
  let columns = order;
  let tail = '';
  switch (fault.kind) {
    case 'nasty':
    case 'huge':
      target[fault.field] = fault.value;
      break;
    case 'negative-viscosity':
      target[fault.field] = `-${target[fault.field]}`;
      break;
    case 'zero-viscosity':
      target[fault.field] = '0';
      break;
    case 'kv100-not-below-kv40':
      target.kv100 = target.kv40;
      break;
    case 'bad-category':
      target.category = `x${fault.value}`; // never a category name or alias
      break;
    case 'duplicate-code': {
      if (r.length < 2) r.push({ ...target });
      const other = r.find((x) => x !== target)!;
      other.code = fault.upper ? target.code.toUpperCase() : ` ${target.code.toLowerCase()} `;
      break;
    }
    case 'empty-code':
      target.code = '   ';
      break;
    case 'missing-column':
      columns = order.filter((k) => HEADER[k] !== fault.column);
      break;
    case 'unbalanced-quote':
      tail = `${sep}"never closed`;
      break;
    case 'empty-required':
      target[fault.field] = '';
      break;
  }
  const dec = (s: string) => (sep === ';' ? s.replace('.', ',') : s);
  const numeric = new Set<keyof Row>(['kv40', 'kv100', 'density', 'price', 'aniline']);
  const lines = [columns.map((k) => HEADER[k]).join(sep)];
  for (const row of r) {
    lines.push(columns.map((k) => quote(numeric.has(k) ? dec(row[k]) : row[k])).join(sep) + (row === target ? tail : ''));
  }
  return lines.join(fault.kind === 'unbalanced-quote' ? '\n' : '\r\n');
}

const columnOrder = fc.shuffledSubarray(Object.keys(HEADER) as (keyof Row)[], { minLength: 9, maxLength: 9 });
const rowsArb = fc.integer({ min: 1, max: 4 }).chain((n) => fc.tuple(...Array.from({ length: n }, (_, i) => validRow(i))));

// ---------------------------------------------------------------------------------------------

describe('library import fuzzing (10,000 hostile files)', () => {
  it(`CSV with one injected fault is refused and changes nothing (${RUNS.csvFaults} runs)`, () => {
    fc.assert(
      fc.property(rowsArb, csvFault, fc.nat(), columnOrder, fc.constantFrom(',' as const, ';' as const), (rows, fault, at, order, sep) => {
        const text = toCsv(rows, fault, at, order, sep);
        const p = previewCsv(text, baseline);
        expectRefusedAndUnchanged(p);
        // The failing row (or the file) says what is wrong.
        expect(p.fileErrors.length + p.rows.filter((x) => x.errors.length > 0).length).toBeGreaterThan(0);
      }),
      { numRuns: RUNS.csvFaults },
    );
  });

  it(`JSON components with wrong types or impossible values are refused (${RUNS.jsonFaults} runs)`, () => {
    const good = {
      code: 'FZ-J',
      name: 'fuzz stock',
      category: 'group-ii',
      viscosityPoints: [
        { tempC: 40, kv: 100 },
        { tempC: 100, kv: 11 },
      ],
      density15: 0.87,
      anilinePoint: 115,
      pourPoint: -12,
      flashPoint: 230,
      sulfurPct: null,
      saturatesPct: null,
      price: { amount: 1.2, basis: 'per-kg', currency: 'EUR' },
      availability: 'available',
      oxidationRating: null,
      shearLossPct: null,
      calibration: null,
      source: 'fuzz',
      sourceDate: '2024-01-01',
      notes: '',
    };
    type Json = Record<string, unknown>;
    // Written into the file as the literal 1e999, which JSON.parse reads as Infinity.
    const INF = '__INF__';
    const hostileValue = fc.oneof(
      fc.constantFrom<unknown>('1e400', 'NaN', -5, 0, -1e-9, null, true, [], {}, '', '<b>x</b>', 1e300, -1e300, Number.MAX_VALUE),
      fc.anything({ maxDepth: 2 }),
    );
    // A mutation that must make the component invalid.
    const mutation = fc.oneof(
      fc.record({ path: fc.constantFrom('kv40', 'kv100'), value: fc.constantFrom<unknown>(-1, 0, -1e300, 'NaN', '100', null, INF, [], {}) }),
      fc.record({ path: fc.constant('kv-order'), value: fc.constant(null) }),
      fc.record({ path: fc.constantFrom('density15'), value: fc.constantFrom<unknown>(-0.8, 0, 870, 1e300, 'heavy', null, INF) }),
      fc.record({ path: fc.constantFrom('price.amount'), value: fc.constantFrom<unknown>(-1, 'free', null, INF, 1e300) }),
      fc.record({ path: fc.constantFrom('category', 'availability', 'price.basis'), value: fc.oneof(fc.string({ maxLength: 10 }), hostileValue) }),
      fc.record({ path: fc.constantFrom('viscosityPoints'), value: fc.constantFrom<unknown>([], [{ tempC: 40, kv: 100 }], 'lots', null, [{ tempC: 40, kv: 1 }, { tempC: 40, kv: 2 }]) }),
      fc.record({ path: fc.constantFrom('code'), value: fc.constantFrom<unknown>('', '   ', null, 42, 'x'.repeat(41)) }),
      fc.record({ path: fc.constantFrom('name', 'notes', 'source'), value: fc.constantFrom<unknown>(42, null, {}, 'x'.repeat(5000)) }),
      fc.record({ path: fc.constantFrom('anilinePoint', 'pourPoint', 'flashPoint'), value: fc.constantFrom<unknown>('hot', {}, INF, 1e300, -1e300) }),
      fc.record({ path: fc.constant('duplicate-code'), value: fc.constant(null) }),
      fc.record({ path: fc.constant('not-an-object'), value: fc.anything({ maxDepth: 1 }).filter((v) => typeof v !== 'object' || v === null || Array.isArray(v)) }),
    );
    const apply = (base: Json, m: { path: string; value: unknown }): Json[] => {
      const c = structuredClone(base);
      const pts = c.viscosityPoints as { tempC: number; kv: unknown }[];
      switch (m.path) {
        case 'kv40':
          pts[0]!.kv = m.value;
          return [c];
        case 'kv100':
          pts[1]!.kv = m.value;
          return [c];
        case 'kv-order':
          pts[1]!.kv = 150;
          return [c];
        case 'price.amount':
          (c.price as Json).amount = m.value;
          return [c];
        case 'price.basis':
          (c.price as Json).basis = typeof m.value === 'string' ? `x${m.value}` : m.value;
          return [c];
        case 'category':
        case 'availability':
          c[m.path] = typeof m.value === 'string' ? `x${m.value}` : m.value;
          return [c];
        case 'duplicate-code':
          return [c, { ...structuredClone(base), code: ' fz-j ' }];
        case 'not-an-object':
          return [m.value as Json];
        default:
          c[m.path] = m.value;
          return [c];
      }
    };
    fc.assert(
      fc.property(
        mutation,
        fc.constantFrom(...MARKUP),
        fc.boolean(),
        fc.integer({ min: 0, max: 3 }),
        (m, markup, wrapped, extraGood) => {
          const base = { ...good, name: markup };
          const items: unknown[] = Array.from({ length: extraGood }, (_, i) => ({ ...structuredClone(good), code: `FZ-OK-${i}` }));
          items.push(...apply(base, m));
          // JSON.stringify turns NaN/Infinity into null; write 1e999 literally so JSON.parse yields Infinity.
          const body = JSON.stringify(wrapped ? { format: 'blendbench-library', components: items } : items).replace(/"__INF__"/g, '1e999');
          const p = previewJson(body, baseline);
          expectRefusedAndUnchanged(p);
        },
      ),
      { numRuns: RUNS.jsonFaults },
    );
  });

  it(`arbitrary text as CSV or JSON never throws and changes nothing (${RUNS.rawText} runs)`, () => {
    const text = fc.oneof(
      fc.string({ maxLength: 300 }),
      fc.string({ unit: 'grapheme', maxLength: 200 }),
      fc.string({ unit: 'binary', maxLength: 200 }),
      fc.json({ maxDepth: 3 }),
      fc.anything({ maxDepth: 3 }).map((v) => {
        try {
          return JSON.stringify(v) ?? '';
        } catch {
          return '';
        }
      }),
      fc.array(fc.array(fc.oneof(fc.string({ maxLength: 12 }), fc.constantFrom(...NASTY_NUMBERS, ...HUGE_NUMBERS, ...MARKUP, ...CSV_COLUMNS)), { maxLength: 22 }), { maxLength: 8 })
        .map((rows) => rows.map((r) => r.join(',')).join('\n')),
    );
    fc.assert(
      fc.property(text, fc.constantFrom('x.csv', 'x.json', 'x.JSON', 'x.txt', ''), (t, name) => {
        const p = previewLibraryImport(name, t, baseline);
        expect(Array.isArray(p.rows)).toBe(true);
        if (!p.valid) expect(applyLibraryImport(p)).toBe(false);
        expectUnchanged();
      }),
      { numRuns: RUNS.rawText },
    );
  });

  it(`hostile JSON envelopes and prototype tricks are refused (${RUNS.envelope} runs)`, () => {
    const envelope = fc.oneof(
      fc.constantFrom(
        '{"__proto__":{"polluted":true},"format":"blendbench-library","components":[{"__proto__":{"polluted":true}}]}',
        '[{"constructor":{"prototype":{"polluted":true}}}]',
        '{"format":"blendbench-library","components":{"length":3}}',
        '{"format":"blendbench-library"}',
        '{"format":"other","components":[]}',
        '[]',
        '{}',
        'null',
        '"components"',
        '[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]]',
        NaN.toString(),
        '[NaN]',
        '[Infinity]',
        '{"format":"blendbench-library","components":[1,2,3]}',
      ),
      fc.record({ format: fc.oneof(fc.constant('blendbench-library'), fc.string()), components: fc.anything({ maxDepth: 2 }) }).map((o) => JSON.stringify(o)),
      fc.array(fc.dictionary(fc.constantFrom('code', 'name', 'category', 'viscosityPoints', 'density15', 'price', '__proto__', 'id'), fc.anything({ maxDepth: 1 })), { maxLength: 4 }).map((a) => JSON.stringify(a)),
    );
    fc.assert(
      fc.property(envelope, (t) => {
        const p = previewJson(t, baseline);
        expectRefusedAndUnchanged(p);
        expect(({} as Record<string, unknown>).polluted).toBeUndefined();
      }),
      { numRuns: RUNS.envelope },
    );
  });

  it(`hostile backup files are refused without touching anything (${RUNS.backup} runs)`, () => {
    const libJson = JSON.parse(libraryToJson(baseline)) as { components: unknown[] };
    const backup = fc.oneof(
      fc.string({ maxLength: 200 }),
      fc.json({ maxDepth: 3 }),
      fc.record({
        format: fc.constantFrom('blendbench-backup', 'blendbench-library', ''),
        exportedAt: fc.oneof(fc.constant('2024-01-01T00:00:00Z'), fc.anything({ maxDepth: 0 })),
        sections: fc.record({
          library: fc.record({ version: fc.oneof(fc.integer({ min: -2, max: 99 }), fc.double()), data: fc.oneof(fc.anything({ maxDepth: 2 }), fc.constant({ components: [...libJson.components, { code: 'x' }] })) }),
          recipes: fc.record({ version: fc.integer({ min: -2, max: 99 }), data: fc.anything({ maxDepth: 2 }) }),
          settings: fc.record({ version: fc.integer({ min: -2, max: 99 }), data: fc.anything({ maxDepth: 2 }) }),
        }),
      }).map((o) => JSON.stringify(o)),
    );
    fc.assert(
      fc.property(backup, (t) => {
        const r = parseBackupText(t);
        expect(r.ok).toBe(false);
        if (!r.ok) expect(r.errors.length).toBeGreaterThan(0);
        expectUnchanged();
      }),
      { numRuns: RUNS.backup },
    );
  });

  it('10 MB fields are refused or bounded, quickly, and change nothing', () => {
    const big = 'A'.repeat(10_000_000);
    const header = 'code,name,category,kv40_mm2s,kv100_mm2s,density15_kg_per_l,price';
    const cases: Array<[string, string]> = [
      ['big-name.csv', `${header}\r\nFZ-1,"${big}",group-ii,100,11,0.87,1.2`],
      ['big-number.csv', `${header}\r\nFZ-1,x,group-ii,${'9'.repeat(10_000_000)},11,0.87,1.2`],
      ['big-code.json', JSON.stringify([{ code: big, name: 'x' }])],
      ['big-notes.json', JSON.stringify({ format: 'blendbench-library', components: [{ ...JSON.parse(libraryToJson(baseline.slice(0, 1))).components[0], code: 'FZ-BIG', notes: big }] })],
      ['garbage.csv', `${header}\n${'"'.repeat(10_000_000)}`],
    ];
    for (const [name, text] of cases) {
      const p = previewLibraryImport(name, text, baseline);
      expectRefusedAndUnchanged(p);
      // The report never echoes the 10 MB field back in full.
      const report = JSON.stringify([p.fileErrors, p.rows.map((r) => [r.code, r.name, r.errors, r.warnings])]);
      expect(report.length).toBeLessThan(20_000);
    }
  });

  it('markup in names is kept as plain text, never interpreted', () => {
    for (const m of MARKUP) {
      const csv = `code,name,category,kv40_mm2s,kv100_mm2s,density15_kg_per_l,price,notes\r\nFZ-M,${quote(m)},group-ii,100,11,0.87,1.2,${quote(m)}`;
      const p = previewCsv(csv, baseline);
      const comp = p.rows[0]?.component;
      if (comp) {
        expect(comp.name).toBe(m.trim());
        expect(comp.notes).toBe(m);
      } else {
        // A control character may be refused, but with a reason and without throwing.
        expect(p.rows[0]?.errors.length ?? p.fileErrors.length).toBeGreaterThan(0);
      }
      expectUnchanged();
    }
    expect((globalThis as { __pwned?: unknown }).__pwned).toBeUndefined();
  });

  it('the saved copy in IndexedDB is untouched after all of the above', async () => {
    await whenSaved();
    expect(JSON.stringify(useLibrary.getState().components)).toBe(baselineJson);
    expect(await idbGet('library', savedWorkDb())).toEqual(storedBefore);
  });
});
