// A stock just added lists its measured values not yet entered (ν40, ν100, density): the list is kept
// through saving, clone and JSON export, cleared field by field as values are entered, absent from
// older saved data (complete) and from CSV imports; CSV export never writes a placeholder as data.
import { beforeEach, describe, expect, it } from 'vitest';
import { resetDemo, useLibrary, enteredKvPatch, enteredPatch } from '../../src/state';
import { demoComponents } from '../../src/state/demo';
import { LIBRARY_SPEC } from '../../src/state/library';
import { interpretStored, loadSchemas } from '../../src/state/persistence';
import { libraryToCsv, libraryToJson, previewCsv, previewJson } from '../../src/state/library-io';

const byId = (id: string) => useLibrary.getState().components.find((c) => c.id === id)!;

beforeEach(() => {
  resetDemo();
});

describe('values not yet entered on a stock (s25)', () => {
  it('a stock just added lists ν40, ν100 and density; entering each strikes it, the last one leaves no list', () => {
    const id = useLibrary.getState().addComponent();
    expect(byId(id).notEntered).toEqual(['kv40', 'kv100', 'density15']);
    expect(useLibrary.getState().updateComponent(id, enteredKvPatch(byId(id), 'kv100', 32))).toBeNull();
    expect(byId(id).notEntered).toEqual(['kv40', 'density15']);
    // A ν100 of 50 lies above the ν40 placeholder (40): the placeholder moves so the stored pair stays
    // ordered (50 × 40/6.3 = 317, 3 digits), and stays listed. The ratio is the blank stock's placeholders
    // (common practice (no source): any ordered pair would do, it is never used).
    const moved = enteredKvPatch(byId(id), 'kv100', 50);
    expect(moved.viscosityPoints).toEqual([{ tempC: 40, kv: 317 }, { tempC: 100, kv: 50 }]);
    expect(moved.notEntered).toEqual(['kv40', 'density15']);
    expect(useLibrary.getState().updateComponent(id, enteredKvPatch(byId(id), 'kv40', 320))).toBeNull();
    expect(useLibrary.getState().updateComponent(id, enteredPatch(byId(id), ['density15'], { density15: 0.895 }))).toBeNull();
    expect('notEntered' in byId(id)).toBe(false);
    expect(byId(id).viscosityPoints).toEqual([{ tempC: 40, kv: 320 }, { tempC: 100, kv: 32 }]);
  });

  it('a change to another field keeps the list; a value given without striking it keeps it too', () => {
    const id = useLibrary.getState().addComponent();
    useLibrary.getState().updateComponent(id, { price: { amount: 1.2, basis: 'per-kg', currency: 'EUR' } });
    expect(byId(id).notEntered).toEqual(['kv40', 'kv100', 'density15']);
    // A placeholder is never taken for an entered value: only the entry forms' patches strike fields.
    useLibrary.getState().updateComponent(id, { density15: 0.87 });
    expect(byId(id).notEntered).toEqual(['kv40', 'kv100', 'density15']);
    // A complete stock gets no list from an entry patch.
    expect(enteredPatch(byId('demo-bw-190'), ['density15'], { density15: 0.9 })).toEqual({ density15: 0.9 });
  });

  it('a clone of an incomplete stock stays incomplete for the same fields', () => {
    const id = useLibrary.getState().addComponent({ code: 'NEW-A' });
    useLibrary.getState().updateComponent(id, enteredPatch(byId(id), ['density15'], { density15: 0.88 }));
    const copy = useLibrary.getState().cloneComponent(id)!;
    expect(byId(copy).notEntered).toEqual(['kv40', 'kv100']);
    expect('notEntered' in byId(useLibrary.getState().cloneComponent('demo-bw-190')!)).toBe(false);
  });

  it('older saved libraries (schema 5, no list) load unchanged and complete; the list is kept when saved', async () => {
    await loadSchemas();
    const comps = demoComponents();
    const v5 = interpretStored(LIBRARY_SPEC, { state: { components: comps }, version: 5 });
    expect(v5.kind).toBe('ok');
    if (v5.kind === 'ok') {
      expect(v5.data.components).toEqual(comps);
      expect(v5.data.components.every((c) => !('notEntered' in c))).toBe(true);
    }
    const withList = [...comps, { ...comps[0]!, id: 'x', code: 'NEW', notEntered: ['kv40' as const] }];
    const now = interpretStored(LIBRARY_SPEC, { state: { components: withList }, version: LIBRARY_SPEC.version });
    expect(now.kind === 'ok' && now.data.components.at(-1)!.notEntered).toEqual(['kv40']);
    const bad = interpretStored(LIBRARY_SPEC, { state: { components: [{ ...comps[0]!, notEntered: ['flash'] }] }, version: LIBRARY_SPEC.version });
    expect(bad.kind).toBe('problem');
  });

  it('CSV export leaves a value not entered empty (importing it back asks for it); CSV import gives complete stocks', () => {
    const lib = demoComponents();
    const fresh = { ...lib[0]!, id: 'n', code: 'NEW', notEntered: ['kv100' as const, 'density15' as const] };
    const csv = libraryToCsv([fresh]);
    const row = csv.split('\r\n')[1]!.split(',');
    const header = csv.split('\r\n')[0]!.split(',');
    expect(row[header.indexOf('kv40_mm2s')]).not.toBe('');
    expect(row[header.indexOf('kv100_mm2s')]).toBe('');
    expect(row[header.indexOf('density15_kg_per_l')]).toBe('');
    const back = previewCsv(csv, lib);
    expect(back.valid).toBe(false);
    expect(back.rows[0]!.errors).toEqual(expect.arrayContaining(['ν100: a value is required', 'density: a value is required']));
    // A full row updating an incomplete stock makes it complete.
    const full = previewCsv('code,name,category,kv40_mm2s,kv100_mm2s,density15_kg_per_l,price,price_basis\nNEW,x,group-ii,45,6.6,0.862,1.1,per-kg\n', [fresh]);
    expect(full.valid).toBe(true);
    expect('notEntered' in full.rows[0]!.component!).toBe(false);
  });

  it('JSON export keeps the list and importing it back keeps the stock incomplete', () => {
    const lib = demoComponents();
    const fresh = { ...lib[0]!, id: 'n', code: 'NEW', notEntered: ['kv40' as const] };
    const back = previewJson(libraryToJson([fresh]), lib);
    expect(back.valid).toBe(true);
    expect(back.rows[0]!.component!.notEntered).toEqual(['kv40']);
    expect('notEntered' in previewJson(libraryToJson([lib[0]!]), []).rows[0]!.component!).toBe(false);
  });
});
