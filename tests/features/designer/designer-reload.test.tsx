// @vitest-environment jsdom
// Issue 10 item 5: the designer's constraints (targets, per-stock limits, objective, robust
// probability) and unsaved lines survive a reload. A "reload" is a fresh instance of every module
// over the same IndexedDB (fake-indexeddb).
import 'fake-indexeddb/auto';
import { IDBFactory } from 'fake-indexeddb';
import { StrictMode } from 'react';
import { afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { act, cleanup, fireEvent, render, screen } from '@testing-library/react';
import { createStore, get as idbGet, set as idbSet } from 'idb-keyval';
import { clockPast } from '../../helpers/settle';

type StateModule = typeof import('../../../src/state');
let previous: StateModule | null = null;
let previousPersistence: typeof import('../../../src/state/persistence') | null = null;

/** Start the app's modules afresh (as a reload does) and open the designer. */
async function reload() {
  // As a page leaves (pagehide), the draft written after the frame is written now and its save ends.
  await previousPersistence?.whenSaved();
  cleanup();
  previous?.resetStartForTests();
  vi.resetModules();
  const state = await import('../../../src/state');
  const persistence = await import('../../../src/state/persistence');
  const { useDesignerStore } = await import('../../../src/features/designer/store');
  const { default: DesignerScreen } = await import('../../../src/features/designer/DesignerScreen');
  previous = state;
  previousPersistence = persistence;
  await state.startSavedWork({ requestPersistence: false });
  render(
    <StrictMode>
      <DesignerScreen />
    </StrictMode>,
  ); // as main.tsx renders the app: effects run twice
  return { state, persistence, designer: useDesignerStore };
}

beforeAll(() => {
  globalThis.indexedDB = new IDBFactory();
});
afterEach(cleanup);

describe('Designer draft across a reload', () => {
  it('keeps targets, per-stock limits, objective, robust probability and the edited lines', async () => {
    const first = await reload();
    const d = first.designer;
    expect(d.getState().initialised).toBe(true);
    const bwId = first.state.useLibrary.getState().components.find((c) => c.code === 'BW-160')!.id;
    act(() => {
      d.getState().setTargets({ objective: 'solvency', minVi: 95, maxPourPoint: -12, minInBandProbability: 0.9, tolerancePct: 4 });
      d.getState().setBound(bwId, { max: 0.3 });
      d.getState().setName('Trial with less heavy neutral');
      d.getState().setBasis('volume');
    });
    const lines = d.getState().lines;
    await first.persistence.whenSaved();

    const second = await reload();
    const t = second.designer.getState().targets;
    expect(t.objective).toBe('solvency');
    expect(t.minVi).toBe(95);
    expect(t.maxPourPoint).toBe(-12);
    expect(t.minInBandProbability).toBe(0.9);
    expect(t.tolerancePct).toBe(4);
    expect(t.bounds[bwId]).toEqual({ max: 0.3 });
    expect(second.designer.getState().lines).toEqual(lines);
    expect(second.designer.getState().name).toBe('Trial with less heavy neutral');
    expect(second.designer.getState().basis).toBe('volume');
    expect(second.designer.getState().dirty).toBe(true);
    expect(screen.getByText(/Restored the draft from your last session/)).toBeTruthy();
  });

  it('a draft without unsaved edits opens its recipe as saved now; a deleted stock’s line is left out and said so', async () => {
    // Save the draft (no unsaved edits), then change the recipe's saved name in "another session".
    const a = await reload();
    const srcId = a.designer.getState().sourceRecipeId!;
    act(() => a.designer.getState().markSaved(srcId));
    await a.persistence.whenSaved();
    // A saved draft is no longer kept (s21 item 1).
    expect(a.state.useWorkspaceStore.getState().drafts[a.state.ownDraftKey()]).toBeUndefined();
    act(() => void a.state.recipeActions.renameRecipe(srcId, 'Renamed elsewhere'));
    await a.persistence.whenSaved();
    const b = await reload();
    expect(b.designer.getState().name).toBe('Renamed elsewhere');
    expect(screen.queryByText(/Restored the draft/)).toBeNull();

    // A dirty draft using a stock deleted since: that line is left out, the rest is renormalised.
    const extra = b.state.useLibrary.getState().components.find((c) => c.code === 'BW-240')!.id;
    act(() => b.designer.getState().addComponent(extra));
    await b.persistence.whenSaved();
    act(() => b.state.useLibrary.getState().removeComponent(extra));
    await b.persistence.whenSaved();
    const c = await reload();
    expect(c.designer.getState().lines.some((l) => l.componentId === extra)).toBe(false);
    const sum = c.designer.getState().lines.reduce((s, l) => s + l.massFraction, 0);
    expect(sum).toBeCloseTo(1, 9); // shares sum to 100 % (common practice, no source)
    expect(screen.getByText(/1 line of stocks no longer in the library was left out/)).toBeTruthy();
  });
  it('a draft with unsaved edits remembers across a reload which saved version it began from: a save made since in another tab is not overwritten (s20 defect 1)', async () => {
    const a = await reload();
    const copy = a.state.recipeActions.duplicateRecipe('demo-vg320')!;
    const began = a.state.useRecipes.getState().recipes.find((r) => r.id === copy)!;
    act(() => {
      a.designer.getState().load(began, a.state.useRecipes.getState().targets[copy]!);
      a.state.recipeActions.setActiveRecipe(copy);
    });
    const first = began.lines.find((l) => l.massFraction > 0.1)!;
    // This tab: an invented hand edit, not yet saved.
    act(() => a.designer.getState().editLine(first.componentId, first.massFraction - 0.05, () => 0.9));
    await a.persistence.whenSaved();
    expect(a.state.useWorkspaceStore.getState().drafts[a.state.ownDraftKey()]?.basedOn).toEqual({ updatedAt: began.updatedAt });
    // Another tab saves the same draft after this tab's edits began (merged into the stored recipes).
    await clockPast(); // a later stamp (ms)
    act(() => void a.state.recipeActions.saveChanges(copy, { name: 'Saved in the other tab' }, ''));
    await a.persistence.whenSaved();
    const theirs = structuredClone(a.state.useRecipes.getState().recipes.find((r) => r.id === copy)!);

    const b = await reload();
    expect(b.designer.getState().dirty).toBe(true);
    expect(b.designer.getState().sourceRecipeId).toBe(copy);
    // The restored draft says at once that its recipe was saved since it began.
    expect(screen.getByText(/was changed and saved after this draft began/)).toBeTruthy();
    fireEvent.click(screen.getByRole('button', { name: /^Save changes to draft/ }));
    expect(screen.getByRole('alert').textContent).toMatch(/Not saved: .*was changed and saved after this draft was opened.*Save as a new recipe to keep both/);
    expect(b.state.useRecipes.getState().recipes.find((r) => r.id === copy)).toEqual(theirs);
  });

  it('a draft kept by workspace schema 1 (no version mark) is upgraded, every record kept, and is never saved silently over its recipe (s20 defect 1)', async () => {
    const a = await reload();
    const copy = a.state.recipeActions.duplicateRecipe('demo-vg320')!;
    const recipe = a.state.useRecipes.getState().recipes.find((r) => r.id === copy)!;
    await a.persistence.whenSaved();
    const db = createStore('blendbench', 'saved-work');
    const lines = recipe.lines.map((l, i) => ({ ...l, massFraction: l.massFraction + (i === 0 ? -0.01 : i === 1 ? 0.01 : 0) }));
    const oldDraft = {
      targets: a.state.useRecipes.getState().targets[copy]!,
      lines,
      name: recipe.name,
      sourceRecipeId: copy,
      basis: 'mass',
      rebalanceMode: 'proportional',
      balanceId: null,
      dirty: true,
    };
    await idbSet('workspace', { state: { designer: oldDraft, explorer: null }, version: 1 }, db);

    const b = await reload();
    await b.persistence.whenSaved();
    expect(b.persistence.useStorageStatus.getState().stores.workspace.origin).toBe('migrated');
    // The one draft of the browser is offered by name, not picked silently (s21 item 1).
    fireEvent.click(await screen.findByRole('button', { name: /^Open the draft kept by an earlier version/ }, { timeout: 5000 }));
    expect(b.designer.getState().lines).toEqual(lines);
    expect(b.designer.getState().dirty).toBe(true);
    await b.persistence.whenSaved();
    expect(b.state.useWorkspaceStore.getState().drafts[b.state.ownDraftKey()]?.basedOn).toEqual({ unknown: true });
    expect(((await idbGet('workspace', db)) as { version: number }).version).toBe(b.state.STORE_VERSION.workspace);
    const before = structuredClone(b.state.useRecipes.getState().recipes.find((r) => r.id === copy)!);
    fireEvent.click(screen.getByRole('button', { name: /^Save changes to draft/ }));
    expect(screen.getByRole('alert').textContent).toMatch(/Not saved: .*does not record which saved version of .* it began from.*Save as a new recipe to keep both/);
    expect(b.state.useRecipes.getState().recipes.find((r) => r.id === copy)).toEqual(before);
    // Save as new keeps the draft as a recipe of its own.
    fireEvent.change(screen.getByLabelText('Recipe name'), { target: { value: 'Kept from the old draft' } });
    fireEvent.click(screen.getByText('Save as new recipe'));
    expect(b.state.useRecipes.getState().recipes.find((r) => r.name === 'Kept from the old draft')!.lines).toEqual(lines);
  });
});
