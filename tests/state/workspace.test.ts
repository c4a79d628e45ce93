/**
 * The workspace store's schema (s20 defect 1): a designer draft records the saved version of its
 * recipe it began from; drafts kept by schema 1 are upgraded with every field kept and marked
 * "based on an unknown version".
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { interpretStored, loadSchemas } from '../../src/state/persistence';
import { WORKSPACE_SPEC } from '../../src/state/workspace';
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
    expect(got.data.designer).toEqual({ ...old, basedOn: { unknown: true } });
    expect(got.data.explorer).toBeNull();
  });

  it('a new draft (no recipe) has no version mark; no draft stays none', () => {
    const got = interpretStored(WORKSPACE_SPEC, { state: { designer: draftV1(null), explorer: null }, version: 1 });
    expect(got.kind === 'ok' && got.data.designer?.basedOn).toBeNull();
    const none = interpretStored(WORKSPACE_SPEC, { state: { designer: null, explorer: null }, version: 1 });
    expect(none.kind === 'ok' && none.data.designer).toBeNull();
  });

  it('reads a schema-2 draft with its mark, and refuses a mark of the wrong shape', () => {
    const ok = interpretStored(WORKSPACE_SPEC, {
      state: { designer: { ...draftV1('r-1'), basedOn: { updatedAt: '2026-12-03T20:00:00.000Z' } }, explorer: null },
      version: 2,
    });
    expect(ok.kind === 'ok' && ok.data.designer?.basedOn).toEqual({ updatedAt: '2026-12-03T20:00:00.000Z' });
    const bad = interpretStored(WORKSPACE_SPEC, { state: { designer: { ...draftV1('r-1'), basedOn: 5 }, explorer: null }, version: 2 });
    expect(bad.kind).toBe('problem');
  });
});
