/**
 * The workspace store's schema (s20 defect 1): a designer draft records the saved version of its
 * recipe it began from; drafts kept by schema 1 are upgraded with every field kept and marked
 * "based on an unknown version". Schema 3 (s21 item 1): each tab keeps its draft under its own key;
 * the one draft of schema 2 becomes one kept draft, every field kept.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { interpretStored, loadSchemas } from '../../src/state/persistence';
import { SCHEMA2_DRAFT_KEY, WORKSPACE_SPEC } from '../../src/state/workspace';
import { demoTargets } from '../../src/state/demo';

beforeAll(async () => {
  await loadSchemas();
});

const draftV1 = (sourceRecipeId: string | null) => ({
  targets: Object.values(demoTargets())[0]!,
  lines: [
    { componentId: 'demo-bw-190', massFraction: 0.6 },
    { componentId: 'demo-bw-160', massFraction: 0.4 },
  ],
  name: 'Kept trial',
  sourceRecipeId,
  basis: 'volume',
  rebalanceMode: 'balance',
  balanceId: 'demo-bw-190',
  dirty: true,
});

describe('workspace schema 1 → 2', () => {
  it('keeps every field of a kept draft and marks one with a recipe as based on an unknown version', () => {
    const old = draftV1('r-1');
    const got = interpretStored(WORKSPACE_SPEC, { state: { designer: old, explorer: null }, version: 1 });
    expect(got.kind).toBe('ok');
    if (got.kind !== 'ok') return;
    expect(got.migratedFrom).toBe(1);
    expect(got.data.drafts).toEqual({ [SCHEMA2_DRAFT_KEY]: { ...old, basedOn: { unknown: true }, keptAt: null } });
    expect(got.data.explorer).toBeNull();
  });

  it('a new draft (no recipe) has no version mark; no draft stays none', () => {
    const got = interpretStored(WORKSPACE_SPEC, { state: { designer: draftV1(null), explorer: null }, version: 1 });
    expect(got.kind === 'ok' && got.data.drafts[SCHEMA2_DRAFT_KEY]?.basedOn).toBeNull();
    const none = interpretStored(WORKSPACE_SPEC, { state: { designer: null, explorer: null }, version: 1 });
    expect(none.kind === 'ok' && none.data).toEqual({ drafts: {}, habits: null, explorer: null });
  });

  it('reads a schema-2 draft with its mark, and refuses a mark of the wrong shape', () => {
    const ok = interpretStored(WORKSPACE_SPEC, {
      state: { designer: { ...draftV1('r-1'), basedOn: { updatedAt: '2026-12-03T20:00:00.000Z' } }, explorer: null },
      version: 2,
    });
    expect(ok.kind === 'ok' && ok.data.drafts[SCHEMA2_DRAFT_KEY]?.basedOn).toEqual({ updatedAt: '2026-12-03T20:00:00.000Z' });
    const bad = interpretStored(WORKSPACE_SPEC, { state: { designer: { ...draftV1('r-1'), basedOn: 5 }, explorer: null }, version: 2 });
    expect(bad.kind).toBe('problem');
  });
});

describe('workspace schema 2 → 3 (one draft per tab)', () => {
  const explorer = {
    referenceId: 'r-1',
    withdrawn: ['demo-bs-1'],
    maxComponents: 3,
    objective: 'cost',
    polymerCap: null,
    result: null,
    resultFor: null,
    resultBasis: null,
    selectedKey: null,
    sort: { key: 'cost', dir: 'asc' },
    adopted: {},
  };

  it('the one draft of the browser becomes one kept draft, every field kept; its habits become the habits; the explorer session is kept', () => {
    const draft = { ...draftV1('r-1'), basedOn: { updatedAt: '2026-12-03T20:00:00.000Z' } };
    const got = interpretStored(WORKSPACE_SPEC, { state: { designer: draft, explorer }, version: 2 });
    expect(got.kind).toBe('ok');
    if (got.kind !== 'ok') return;
    expect(got.migratedFrom).toBe(2);
    expect(got.data.drafts).toEqual({ [SCHEMA2_DRAFT_KEY]: { ...draft, keptAt: null } });
    expect(got.data.habits).toEqual({ basis: 'volume', rebalanceMode: 'balance' });
    expect(got.data.explorer).toEqual(explorer);
  });

  it('a draft without unsaved edits is kept too (every record kept); no draft gives no kept draft', () => {
    const clean = { ...draftV1('r-1'), dirty: false, basedOn: { updatedAt: '2026-12-03T20:00:00.000Z' } };
    const got = interpretStored(WORKSPACE_SPEC, { state: { designer: clean, explorer: null }, version: 2 });
    expect(got.kind === 'ok' && Object.keys(got.data.drafts)).toEqual([SCHEMA2_DRAFT_KEY]);
    const none = interpretStored(WORKSPACE_SPEC, { state: { designer: null, explorer }, version: 2 });
    expect(none.kind === 'ok' && none.data).toEqual({ drafts: {}, habits: null, explorer });
  });

  it('reads schema 3 with several tabs’ drafts, and refuses a kept draft without its time field', () => {
    const a = { ...draftV1('r-1'), basedOn: null, keptAt: '2026-12-03T23:12:00.000Z' };
    const b = { ...draftV1(null), name: 'Other tab', basedOn: null, keptAt: '2026-12-03T23:14:00.000Z' };
    const ok = interpretStored(WORKSPACE_SPEC, { state: { drafts: { 'tab-a': a, 'tab-b': b }, habits: null, explorer: null }, version: 3 });
    expect(ok.kind === 'ok' && Object.keys(ok.data.drafts)).toEqual(['tab-a', 'tab-b']);
    const { keptAt: _, ...noTime } = a;
    const bad = interpretStored(WORKSPACE_SPEC, { state: { drafts: { 'tab-a': noTime }, habits: null, explorer: null }, version: 3 });
    expect(bad.kind).toBe('problem');
  });
});
