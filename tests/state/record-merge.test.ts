// Per-record merge across tabs (issue 10 item 4): the pure merge, then two tabs over one IndexedDB.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { joinRecords, mergeRecords, pruneGone, splitRecords, stampMaker, type RecordLayout, type RecordSet } from '../../src/state/record-merge';

const layout: RecordLayout = { lists: { items: 'id' }, maps: ['byId'], local: ['active'] };

describe('records', () => {
  it('splits lists, maps and single fields, leaves tab-local fields out, and joins back', () => {
    const data = { items: [{ id: 'a', v: 1 }, { id: 'b', v: 2 }], byId: { a: { x: 1 } }, plan: { p: 1 }, active: 'a' };
    const r = splitRecords(data, layout);
    expect([...r.keys()]).toEqual(['items/a', 'items/b', 'byId/a', 'plan']);
    expect(joinRecords(r, layout, { active: 'b' })).toEqual({ ...data, active: 'b' });
  });

  it('stamps sort in commit order within a tab, even within one millisecond', () => {
    const s = stampMaker('tab0000001', () => 5);
    const a = s();
    const b = s();
    expect(a < b).toBe(true);
    expect(pruneGone({ k: a }, 5 + 61 * 86_400_000)).toEqual({}); // older than 60 days: forgotten
  });
});

describe('mergeRecords', () => {
  const set = (entries: Array<[string, unknown, string]>, gone: Record<string, string> = {}): RecordSet => ({
    records: new Map(entries.map(([k, v]) => [k, v])),
    stamps: Object.fromEntries(entries.map(([k, , s]) => [k, s])),
    gone,
  });

  it('keeps a record changed on one side only, and the later commit when both changed it', () => {
    const base = { stamps: { 'items/a': '1', 'items/b': '1', 'items/c': '1' }, gone: {} };
    const mine = set([['items/a', 'A-mine', '5'], ['items/b', 'b', '1'], ['items/c', 'C-mine', '3']]);
    const theirs = set([['items/a', 'a', '1'], ['items/b', 'B-theirs', '4'], ['items/c', 'C-theirs', '7']]);
    const m = mergeRecords(base, mine, theirs);
    expect([...m.records.values()]).toEqual(['A-mine', 'B-theirs', 'C-theirs']);
    expect(m.fromTheirs).toEqual(['items/b', 'items/c']);
    expect(m.replacedMine).toEqual(['items/c']);
    expect(m.differsFromTheirs).toBe(true);
  });

  it('a deletion is a record too: not undone by an older copy, and a newer edit elsewhere brings it back', () => {
    const base = { stamps: { 'items/a': '1', 'items/b': '1' }, gone: {} };
    const mine = set([['items/b', 'b', '1']], { 'items/a': '5' });
    const theirs = set([['items/a', 'a', '1'], ['items/b', 'b', '1']]);
    const m = mergeRecords(base, mine, theirs);
    expect([...m.records.keys()]).toEqual(['items/b']);
    expect(m.gone).toEqual({ 'items/a': '5' });
    const later = set([['items/a', 'A-later', '9'], ['items/b', 'b', '1']]);
    expect([...mergeRecords(base, mine, later).records.values()]).toEqual(['A-later', 'b']);
  });

  it('a stale copy written over storage (older stamps, a record missing without a tombstone) does not roll back what both sides agreed on (s21 item 1)', () => {
    // This tab saved b at stamp 5 and added c at 6 (both agreed with storage); another tab, leaving,
    // then wrote its older copy blindly: b at 3, no c.
    const base = { stamps: { 'items/a': '1', 'items/b': '5', 'items/c': '6' }, gone: {} };
    const mine = set([['items/a', 'a', '1'], ['items/b', 'B-new', '5'], ['items/c', 'C-new', '6']]);
    const stale = set([['items/a', 'a', '1'], ['items/b', 'B-old', '3']]);
    const m = mergeRecords(base, mine, stale);
    expect([...m.records.values()]).toEqual(['a', 'B-new', 'C-new']);
    expect(m.fromTheirs).toEqual([]);
    expect(m.differsFromTheirs).toBe(true); // written back
    // A later commit elsewhere still wins.
    const later = set([['items/a', 'a', '1'], ['items/b', 'B-later', '8'], ['items/c', 'C-new', '6']]);
    expect([...mergeRecords(base, mine, later).records.values()]).toEqual(['a', 'B-later', 'C-new']);
  });

  it('new records of both sides are kept, mine after their predecessor', () => {
    const base = { stamps: { 'items/a': '1' }, gone: {} };
    const mine = set([['items/a', 'a', '1'], ['items/m', 'm', '3']]);
    const theirs = set([['items/a', 'a', '1'], ['items/t', 't', '2']]);
    expect([...mergeRecords(base, mine, theirs).records.keys()]).toEqual(['items/a', 'items/m', 'items/t']);
  });

  it('property: tabs committing and saving in any interleaving end with the latest commit of every record', () => {
    // Model: a shared store and two tabs; each step either commits an edit in a tab or saves a tab
    // (merge with the store, as persistence.ts does in one transaction). After both tabs save at the end,
    // every record holds the value of its last commit anywhere (common practice for last-writer-wins per record).
    const keys = ['items/0', 'items/1', 'items/2', 'items/3'];
    const step = fc.record({ tab: fc.integer({ min: 0, max: 1 }), save: fc.boolean(), key: fc.constantFrom(...keys) });
    fc.assert(
      fc.property(fc.array(step, { minLength: 1, maxLength: 40 }), (steps) => {
        let clock = 0;
        const makers = [stampMaker('tabaaaaaaa', () => clock), stampMaker('tabbbbbbbb', () => clock)];
        const init = (): RecordSet => ({ records: new Map(keys.map((k) => [k, 'init'])), stamps: Object.fromEntries(keys.map((k) => [k, ''])), gone: {} });
        let store = init();
        const tabs = [init(), init()].map((mine) => ({ mine, base: { stamps: { ...mine.stamps }, gone: {} } }));
        const last = new Map<string, string>(keys.map((k) => [k, 'init']));
        const save = (t: (typeof tabs)[number]) => {
          const m = mergeRecords(t.base, t.mine, store);
          store = { records: m.records, stamps: m.stamps, gone: m.gone };
          t.mine = { records: new Map(m.records), stamps: { ...m.stamps }, gone: { ...m.gone } };
          t.base = { stamps: { ...m.stamps }, gone: { ...m.gone } };
        };
        steps.forEach((st, i) => {
          clock += 1;
          const t = tabs[st.tab]!;
          if (st.save) save(t);
          else {
            const value = `v${i}`;
            t.mine.records.set(st.key, value);
            t.mine.stamps[st.key] = makers[st.tab]!();
            last.set(st.key, value);
          }
        });
        save(tabs[0]!);
        save(tabs[1]!);
        save(tabs[0]!);
        for (const k of keys) expect(store.records.get(k)).toBe(last.get(k));
        for (const t of tabs) for (const k of keys) expect(t.mine.records.get(k)).toBe(last.get(k));
      }),
      { seed: 20251, numRuns: 500 },
    );
  });
});

describe('deep records (s21 item 2: each QC field its own record)', () => {
  const layout = { deep: ['qc'] } as const;
  const data = {
    qc: {
      'r/1': {
        aimKv40: null,
        lots: { s1: { kv40: 452, kv100: null } },
        heel: { massKg: 1200 },
        correction: { onHandKg: {}, stockIds: ['s2'] },
      },
    },
    other: 1,
  };

  it('cuts each value into a record (empty objects and arrays are values) and joins them back as they were', () => {
    const recs = splitRecords(data, layout);
    expect([...recs.keys()].sort()).toEqual(
      ['other', 'qc/r%2F1/aimKv40', 'qc/r%2F1/correction/onHandKg', 'qc/r%2F1/correction/stockIds', 'qc/r%2F1/heel/massKg', 'qc/r%2F1/lots/s1/kv100', 'qc/r%2F1/lots/s1/kv40'].sort(),
    );
    expect(joinRecords(recs, layout, null)).toEqual(data);
  });

  it('an empty object beside entries of the same path never hides them, whichever comes first, and is never changed', () => {
    const empty = {};
    const a = new Map<string, unknown>([
      ['qc/r/lots', empty],
      ['qc/r/lots/s1/kv40', 450],
    ]);
    const b = new Map<string, unknown>([
      ['qc/r/lots/s1/kv40', 450],
      ['qc/r/lots', empty],
    ]);
    expect(joinRecords(a, layout, null)).toEqual({ qc: { r: { lots: { s1: { kv40: 450 } } } } });
    expect(joinRecords(b, layout, null)).toEqual({ qc: { r: { lots: { s1: { kv40: 450 } } } } });
    expect(empty).toEqual({});
  });
});
