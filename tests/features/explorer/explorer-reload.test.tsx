// @vitest-environment jsdom
// Issue 10 item 5: the explorer's reference recipe, withdrawn set and ranked result survive a reload;
// a result computed before the library or the reference recipe changed is marked stale (and cannot
// be adopted) rather than shown as current. A "reload" is a fresh instance of every module over the
// same IndexedDB (fake-indexeddb).
import 'fake-indexeddb/auto';
import { IDBFactory } from 'fake-indexeddb';
import { StrictMode } from 'react';
import { afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { act, cleanup, fireEvent, render, screen, waitFor } from '@testing-library/react';

type StateModule = typeof import('../../../src/state');
let previous: StateModule | null = null;

async function reload() {
  cleanup();
  previous?.resetStartForTests();
  vi.resetModules();
  const state = await import('../../../src/state');
  const persistence = await import('../../../src/state/persistence');
  const { useExplorerStore } = await import('../../../src/features/explorer/store');
  const { setWorkerFactory } = await import('../../../src/features/explorer/search-client');
  const { inThreadWorker } = await import('./in-thread-worker');
  const { default: ExplorerScreen } = await import('../../../src/features/explorer/ExplorerScreen');
  previous = state;
  setWorkerFactory(inThreadWorker());
  await state.startSavedWork({ requestPersistence: false });
  render(
    <StrictMode>
      <ExplorerScreen />
    </StrictMode>,
  ); // as main.tsx renders the app: effects run twice
  return { state, persistence, explorer: useExplorerStore };
}

const refSelect = () => screen.getByLabelText('Reference recipe (the one to replace)') as HTMLSelectElement;
const rowKeys = () => [...screen.getByTestId('candidates').querySelectorAll('tbody tr')].map((r) => r.textContent);

beforeAll(() => {
  globalThis.indexedDB = new IDBFactory();
});
afterEach(cleanup);

describe('Explorer session across a reload', () => {
  it('keeps the reference, the withdrawn set and the ranked result, then marks it stale after a library change', async () => {
    const first = await reload();
    const vg460 = first.state.useRecipes.getState().recipes.find((r) => r.grade === 460)!;
    expect(refSelect().value).not.toBe(vg460.id); // not the default reference
    fireEvent.change(refSelect(), { target: { value: vg460.id } });
    const bright = first.state.useLibrary.getState().components.find((c) => c.code === 'BW-190')!;
    fireEvent.click(screen.getByLabelText('Treat BW-190 as withdrawn'));
    // "No least probability in band for this search" (null), not the reference's own (undefined).
    act(() => first.explorer.getState().setMinInBandProbability(null));
    fireEvent.click(screen.getByText('Run search'));
    // Candidates stream in while the search runs; only the final list is kept.
    await waitFor(() => expect(first.explorer.getState().status).toBe('done'), { timeout: 30000 });
    await screen.findByTestId('candidates');
    const ranked = rowKeys();
    expect(ranked.length).toBeGreaterThan(0);
    await first.persistence.whenSaved();

    const second = await reload();
    await screen.findByTestId('candidates');
    expect(refSelect().value).toBe(vg460.id);
    expect(second.explorer.getState().withdrawn).toEqual([bright.id]);
    expect(second.explorer.getState().minInBandProbability).toBeNull();
    expect(rowKeys()).toEqual(ranked);
    expect(screen.getByText(/Result restored from your last session/)).toBeTruthy();
    expect(screen.queryByTestId('stale-library')).toBeNull();
    expect((screen.getByText('Adopt as a new recipe') as HTMLButtonElement).disabled).toBe(false);

    // A stock's price changes: the kept result no longer shows what the search gives now.
    const used = second.state.useLibrary.getState().components.find((c) => c.code === 'BW-280')!;
    act(() => second.state.useLibrary.getState().updateComponent(used.id, { price: { ...used.price, amount: used.price.amount * 2 } }));
    await waitFor(() => expect(screen.getByTestId('stale-library')).toBeTruthy());
    expect(screen.getByTestId('stale-library').textContent).toMatch(/Stale result.*restored from your last session/);
    expect((screen.getByText('Adopt as a new recipe') as HTMLButtonElement).disabled).toBe(true);
    await second.persistence.whenSaved();

    // Still stale after another reload (the fingerprint of what it was computed from is kept with it).
    await reload();
    await screen.findByTestId('candidates');
    expect(screen.getByTestId('stale-library')).toBeTruthy();
    // A new run on the library as it is now is current again.
    fireEvent.click(screen.getByText('Run search'));
    await waitFor(() => expect(screen.queryByTestId('stale-library')).toBeNull(), { timeout: 30000 });
    await screen.findByTestId('candidates', {}, { timeout: 30000 });
  });

  it('the basis of a result changes with the stocks, the reference recipe’s lines or saved targets, and the blending rule', async () => {
    const s = await reload();
    const { resultBasis } = await import('../../../src/features/explorer/store');
    const lib = s.state.useLibrary.getState().components;
    const ref = s.state.useRecipes.getState().recipes[0]!;
    const targets = s.state.useRecipes.getState().targets[ref.id];
    const basis = resultBasis(lib, ref, targets, 'd7152-wright');
    expect(resultBasis(structuredClone(lib), structuredClone(ref), structuredClone(targets), 'd7152-wright')).toBe(basis);
    expect(resultBasis(lib.slice(1), ref, targets, 'd7152-wright')).not.toBe(basis);
    expect(resultBasis(lib, { ...ref, lines: ref.lines.slice(1) }, targets, 'd7152-wright')).not.toBe(basis);
    expect(resultBasis(lib, ref, targets && { ...targets, minVi: 101 }, 'd7152-wright')).not.toBe(basis);
    expect(resultBasis(lib, ref, targets, 'refutas')).not.toBe(basis);
    // The recipe's name, status or notes do not change what the search gives.
    expect(resultBasis(lib, { ...ref, name: 'Another name', notes: 'x' }, targets, 'd7152-wright')).toBe(basis);
  });
});
