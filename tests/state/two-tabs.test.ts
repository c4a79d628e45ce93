// Two tabs over one IndexedDB (issue 10 item 4): 40 edits committed within milliseconds, interleaved,
// are all there after a reload and in both tabs; the same record edited in both keeps the later commit,
// and the other tab is told which record changed. Each "tab" is a fresh instance of the state modules.
import 'fake-indexeddb/auto';
import { IDBFactory } from 'fake-indexeddb';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { clockPast, settleTabs } from '../helpers/settle';

type StateModule = typeof import('../../src/state');
type PersistenceModule = typeof import('../../src/state/persistence');
interface Tab {
  state: StateModule;
  persistence: PersistenceModule;
}
const open: Tab[] = [];

async function openTab(): Promise<Tab> {
  vi.resetModules();
  const state = await import('../../src/state');
  const persistence = await import('../../src/state/persistence');
  await state.startSavedWork({ requestPersistence: false });
  await persistence.whenSaved();
  const tab = { state, persistence };
  open.push(tab);
  return tab;
}

/** Wait until both tabs have nothing left to save and hold what is stored (every broadcast handled). */
const settle = (tabs: Tab[]) => settleTabs(tabs);

beforeEach(() => {
  for (const t of open.splice(0)) t.state.resetStartForTests();
  globalThis.indexedDB = new IDBFactory();
});

const names = (t: Tab) => new Map(t.state.useLibrary.getState().components.map((c) => [c.id, c.name]));

describe('two tabs committing at once', () => {
  it('keeps all 40 interleaved edits (each its own record), in both tabs and after a reload', async () => {
    const a = await openTab(); // first start: saves the invented demo
    const b = await openTab(); // second tab on the same saved work
    const all = a.state.useLibrary.getState().components.map((c) => c.id);
    const aIds = all.slice(0, 20);
    const bIds = all.slice(20); // the other 9 invented demo stocks
    // 40 edits alternating between the tabs, without waiting for any save: tab A renames 20 stocks,
    // tab B writes notes on 9 others and adds 11 new stocks.
    for (let i = 0; i < 20; i++) {
      a.state.libraryActions.updateComponent(aIds[i]!, { name: `A edit ${i}` });
      if (i < bIds.length) b.state.libraryActions.updateComponent(bIds[i]!, { notes: `B note ${i}` });
      else b.state.libraryActions.addComponent({ code: `B-NEW-${i}`, name: `B added ${i}` });
    }
    await settle([a, b]);
    const c = await openTab(); // a reload
    for (const t of [a, b, c]) {
      const comps = t.state.useLibrary.getState().components;
      const byId = new Map(comps.map((x) => [x.id, x]));
      aIds.forEach((id, i) => expect(byId.get(id)!.name).toBe(`A edit ${i}`));
      bIds.forEach((id, i) => expect(byId.get(id)!.notes).toBe(`B note ${i}`));
      for (let i = bIds.length; i < 20; i++) expect(comps.some((x) => x.code === `B-NEW-${i}` && x.name === `B added ${i}`)).toBe(true);
      expect(comps.length).toBe(29 + 20 - bIds.length); // 29 invented demo stocks + 11 added (a count)
    }
  });

  it('the same record edited in both tabs keeps the later commit, and the other tab is told which', async () => {
    const a = await openTab();
    const b = await openTab();
    const id = 'demo-bw-190';
    a.state.libraryActions.updateComponent(id, { name: 'from A (earlier)' });
    await clockPast(); // the next commit carries a later stamp
    b.state.libraryActions.updateComponent(id, { name: 'from B (later)' });
    await settle([a, b]);
    expect(names(a).get(id)).toBe('from B (later)');
    expect(names(b).get(id)).toBe('from B (later)');
    expect(a.persistence.useStorageStatus.getState().externalChange).toMatch(/stock BW-190/i);
    const c = await openTab();
    expect(names(c).get(id)).toBe('from B (later)');
  });

  it('a deletion in one tab and an edit of another stock in the other both survive', async () => {
    const a = await openTab();
    const b = await openTab();
    a.state.libraryActions.removeComponent('demo-bw-110');
    b.state.libraryActions.updateComponent('demo-bw-190', { name: 'kept' });
    await settle([a, b]);
    const c = await openTab();
    expect(names(c).has('demo-bw-110')).toBe(false);
    expect(names(c).get('demo-bw-190')).toBe('kept');
    expect(names(a).has('demo-bw-110')).toBe(false);
    expect(names(b).has('demo-bw-110')).toBe(false);
  });
});

describe('two tabs editing the line plan at once', () => {
  it('keeps every grade’s demand, supply and the period typed in either tab (each entry its own record)', async () => {
    const a = await openTab();
    const b = await openTab();
    const ids = a.state.useRecipes.getState().recipes.map((r) => r.id);
    expect(ids.length).toBeGreaterThanOrEqual(2);
    // Interleaved, without waiting for any save: tab A plans one grade and the period, tab B another
    // grade and a stock's supply. Before the entries were records of their own, the whole plan was
    // one record and the later tab's copy replaced the other's edits.
    a.state.linePlanActions.setDemand(ids[0]!, 120_000);
    b.state.linePlanActions.setDemand(ids[1]!, 80_000);
    a.state.linePlanActions.setPeriod('2027');
    b.state.linePlanActions.setSupply('demo-bw-190', 50_000);
    await settle([a, b]);
    const c = await openTab(); // a reload
    for (const t of [a, b, c]) {
      const plan = t.state.useRecipes.getState().linePlan;
      expect(plan.demands).toEqual({ [ids[0]!]: 120_000, [ids[1]!]: 80_000 });
      expect(plan.period).toBe('2027');
      expect(plan.supplies['demo-bw-190']).toBe(50_000);
    }
    // A demand taken out in one tab while the other plans a third grade: both hold.
    a.state.linePlanActions.setDemand(ids[0]!, null);
    b.state.linePlanActions.setDemand(ids[2] ?? ids[1]!, 30_000);
    await settle([a, b]);
    const d = await openTab();
    for (const t of [a, b, d]) {
      const plan = t.state.useRecipes.getState().linePlan;
      expect(ids[0]! in plan.demands).toBe(false);
      expect(plan.demands[ids[2] ?? ids[1]!]).toBe(30_000);
    }
  });
});

describe('two tabs editing the QC loop of one recipe at once (s21 item 2)', () => {
  it('keeps a lot result typed in one tab and the heel and batch result typed in the other (each QC field its own record)', async () => {
    const a = await openTab();
    const b = await openTab();
    const id = a.state.useRecipes.getState().recipes[0]!.id;
    const none = { kv40: null, kv100: null, density15: null };
    // The recipe's QC entries exist (blank) in both tabs, as once either tab has opened them.
    expect(a.state.recipeActions.setQcInputs(id, { aimKv40: null })).toBeNull();
    await settle([a, b]);
    // Interleaved, without waiting for any save (invented lab values): tab A records two lots'
    // measured ν40, tab B the heel and the batch's measured ν40. Before, the recipe's QC entries were
    // one record and the later tab's copy replaced the other tab's results.
    expect(a.state.recipeActions.setQcInputs(id, { lots: { 'demo-bw-190': { ...none, kv40: 452 } } })).toBeNull();
    expect(b.state.recipeActions.setQcInputs(id, { heel: { ...a.state.DEFAULT_QC_INPUTS.heel, massKg: 1200, kv40: 300 } })).toBeNull();
    const lotsA = a.state.useRecipes.getState().qc[id]!.lots;
    expect(a.state.recipeActions.setQcInputs(id, { lots: { ...lotsA, 'demo-bw-160': { ...none, kv40: 98.5 } } })).toBeNull();
    const corrB = b.state.useRecipes.getState().qc[id]!.correction;
    expect(b.state.recipeActions.setQcInputs(id, { correction: { ...corrB, kv40: 331 } })).toBeNull();
    await settle([a, b]);
    const c = await openTab(); // a reload
    for (const t of [a, b, c]) {
      const q = t.state.useRecipes.getState().qc[id]!;
      expect(q.lots['demo-bw-190']?.kv40).toBe(452);
      expect(q.lots['demo-bw-160']?.kv40).toBe(98.5);
      expect(q.heel.massKg).toBe(1200);
      expect(q.heel.kv40).toBe(300);
      expect(q.correction.kv40).toBe(331);
    }
  });

  it('the same QC field typed in both tabs keeps the later entry, and the other tab is told which field', async () => {
    const a = await openTab();
    const b = await openTab();
    const r = a.state.useRecipes.getState().recipes[0]!;
    const heel = a.state.DEFAULT_QC_INPUTS.heel;
    a.state.recipeActions.setQcInputs(r.id, { heel: { ...heel, massKg: 900 } });
    await clockPast(); // the next commit carries a later stamp
    b.state.recipeActions.setQcInputs(r.id, { heel: { ...heel, massKg: 950 } });
    await settle([a, b]);
    expect(a.state.useRecipes.getState().qc[r.id]!.heel.massKg).toBe(950);
    expect(b.state.useRecipes.getState().qc[r.id]!.heel.massKg).toBe(950);
    expect(a.persistence.useStorageStatus.getState().externalChange).toMatch(/heel mass .*QC entries of/i);
  });
});

describe('two tabs making the first QC entries of one batch in the same millisecond (s22 item 3)', () => {
  /**
   * Run `entries` with the clock standing still, as two tabs committing within one millisecond: no save
   * runs and no tab hears of the other in between (the stamps are made as each entry is committed).
   */
  function sameMillisecond(entries: () => void): void {
    const now = Date.now();
    const clock = vi.spyOn(Date, 'now').mockReturnValue(now);
    try {
      entries();
    } finally {
      clock.mockRestore();
    }
  }
  const blankLot = { kv40: null, kv100: null, density15: null };

  it('two results of one lot, each the first entry in its tab (each creates the lot blank), are both kept', async () => {
    const a = await openTab();
    const b = await openTab();
    const id = a.state.useRecipes.getState().recipes[0]!.id;
    expect(a.state.useRecipes.getState().qc[id]).toBeUndefined(); // no QC entry yet: the first one creates them
    // Invented lab values of the lot of BW-190, entered as the QC panel does (the lot made blank, one value set).
    sameMillisecond(() => {
      expect(a.state.recipeActions.setQcInputs(id, { lots: { 'demo-bw-190': { ...blankLot, kv40: 452 } } })).toBeNull();
      expect(b.state.recipeActions.setQcInputs(id, { lots: { 'demo-bw-190': { ...blankLot, kv100: 31.5 } } })).toBeNull();
    });
    await settle([a, b]);
    const c = await openTab(); // a reload
    for (const t of [a, b, c]) expect(t.state.useRecipes.getState().qc[id]!.lots['demo-bw-190']).toEqual({ kv40: 452, kv100: 31.5, density15: null });
  });

  it('a lot result in one tab and the heel in the other, each the first entry of its recipe, are both kept, whichever tab is later', async () => {
    const a = await openTab();
    const b = await openTab();
    const [r1, r2] = a.state.useRecipes.getState().recipes.map((r) => r.id);
    const heel = a.state.DEFAULT_QC_INPUTS.heel;
    // Both orders on two recipes: whichever tab's stamps sort later, one of the two recipes has the
    // heel entered in that tab, the other the lot.
    sameMillisecond(() => {
      a.state.recipeActions.setQcInputs(r1!, { lots: { 'demo-bw-190': { ...blankLot, kv40: 452 } } });
      b.state.recipeActions.setQcInputs(r1!, { heel: { ...heel, massKg: 1200 } });
      a.state.recipeActions.setQcInputs(r2!, { heel: { ...heel, massKg: 900 } });
      b.state.recipeActions.setQcInputs(r2!, { lots: { 'demo-bw-190': { ...blankLot, kv40: 455 } } });
    });
    await settle([a, b]);
    const c = await openTab(); // a reload
    for (const t of [a, b, c]) {
      const qc = t.state.useRecipes.getState().qc;
      expect([qc[r1!]!.lots['demo-bw-190']?.kv40, qc[r1!]!.heel.massKg]).toEqual([452, 1200]);
      expect([qc[r2!]!.lots['demo-bw-190']?.kv40, qc[r2!]!.heel.massKg]).toEqual([455, 900]);
    }
  });

  it('a field cleared on purpose is an entry: it replaces an earlier value typed in the other tab', async () => {
    const a = await openTab();
    const b = await openTab();
    const id = a.state.useRecipes.getState().recipes[0]!.id;
    const heel = a.state.DEFAULT_QC_INPUTS.heel;
    a.state.recipeActions.setQcInputs(id, { heel: { ...heel, massKg: 900 } });
    await settle([a, b]);
    b.state.recipeActions.setQcInputs(id, { heel: { ...heel, massKg: 950 } });
    await clockPast(); // the next commit carries a later stamp
    a.state.recipeActions.setQcInputs(id, { heel: { ...heel, massKg: null } }); // cleared later, before hearing of B
    await settle([a, b]);
    const c = await openTab();
    for (const t of [a, b, c]) expect(t.state.useRecipes.getState().qc[id]!.heel.massKg).toBeNull();
  });
});

describe('the recipe a tab last opened (tab-local)', () => {
  it('is written when only it changes, so a reload opens it; a second tab hearing of that save writes nothing back', async () => {
    const a = await openTab();
    const b = await openTab();
    const recipes = a.state.useRecipes.getState().recipes;
    const other = recipes.find((r) => r.id !== a.state.useRecipes.getState().activeRecipeId)!;
    a.state.recipeActions.setActiveRecipe(other.id); // no other change to any recipe
    await settle([a, b]);
    const c = await openTab(); // a reload of tab A
    expect(c.state.useRecipes.getState().activeRecipeId).toBe(other.id);
    expect(b.state.useRecipes.getState().activeRecipeId).not.toBe(other.id); // B keeps its own
  });
});
