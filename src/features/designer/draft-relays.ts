/**
 * The draft's derived numbers (the table's shares, volumes and costs; the predicted properties),
 * handed to the parts of the screen that show them through relays (`components/relay.tsx`).
 *
 * They are derived once per change of the lines, in the same step as the store takes the change
 * (a subscription to the designer store), and once per change of what else they depend on (the
 * library, the settings, the grade and band). So an edit of a share does not render the screen
 * again: the relays' readers — the table's and the properties' numbers, the charts' live layers —
 * update in the edit's one React commit (or write their text directly). Nothing here is stored.
 */
import { useLayoutEffect, useState } from 'react';
import { createRelay, type Relay } from '../../components/relay';
import type { Component, RecipeLine } from '../../core/formulation/model';
import type { Settings } from '../../state';
import { deriveDraft, type DraftView } from './derive';
import { predictRecipe, type Prediction } from './predict';
import { useDesignerStore } from './store';

/** What the derived numbers depend on besides the lines (one object per change of any of them). */
export interface DraftInputs {
  components: readonly Component[];
  byId: ReadonlyMap<string, Component>;
  /** Base currency (prices restated at the boundary); lines priced in another currency have no cost. */
  baseCurrency: string;
  settings: Pick<Settings, 'blendMethod' | 'd341Form' | 'operatingTempC' | 'coldStartTempC' | 'deliveryTempC' | 'decimalSeparator' | 'thousandsGrouping' | 'temperatureUnit'>;
  grade?: number;
  band?: { min: number; max: number } | null;
}

export interface DerivedDraft {
  view: DraftView;
  prediction: Prediction;
}

/** The numbers of a draft's lines (pure; see `deriveDraft` and `predictRecipe`). */
export function deriveAll(lines: readonly RecipeLine[], inputs: DraftInputs): DerivedDraft {
  const { components, byId, baseCurrency, settings: s, grade, band } = inputs;
  return {
    view: deriveDraft(lines, byId, baseCurrency),
    prediction: predictRecipe(lines, components, s.blendMethod, {
      operatingTempC: s.operatingTempC,
      coldTempC: s.coldStartTempC,
      deliveryTempC: s.deliveryTempC,
      d341Form: s.d341Form,
      display: { decimalSeparator: s.decimalSeparator, thousandsGrouping: s.thousandsGrouping, temperatureUnit: s.temperatureUnit },
      ...(grade === undefined ? {} : { grade }),
      ...(band ? { band: { min: band.min, max: band.max } } : {}),
    }),
  };
}

/** `deriveAll` remembering its last result: the same lines and inputs give the same objects. */
export function rememberedDerive(): (lines: readonly RecipeLine[], inputs: DraftInputs) => DerivedDraft {
  let lastLines: readonly RecipeLine[] | null = null;
  let lastInputs: DraftInputs | null = null;
  let last: DerivedDraft | null = null;
  return (lines, inputs) => {
    if (last && lines === lastLines && inputs === lastInputs) return last;
    last = deriveAll(lines, inputs);
    lastLines = lines;
    lastInputs = inputs;
    return last;
  };
}

export interface DraftRelays {
  view: Relay<DraftView>;
  /** Handed over after `view`, and always with it: a reader of both may listen to this one alone. */
  prediction: Relay<Prediction>;
}

/**
 * Relays carrying the designer draft's derived numbers for the caller's lifetime: derived from the
 * store's lines as each change is made (before React renders it), and again when `inputs` changes
 * (a layout effect, before the browser paints). `inputs` must be a new object only when a part of it
 * changes (memoise it).
 */
export function useDraftRelays(inputs: DraftInputs): DraftRelays {
  const [r] = useState(() => {
    const derive = rememberedDerive();
    const first = derive(useDesignerStore.getState().lines, inputs);
    return { derive, view: createRelay(first.view), prediction: createRelay(first.prediction) };
  });
  useLayoutEffect(() => {
    const push = () => {
      const d = r.derive(useDesignerStore.getState().lines, inputs);
      r.view.set(d.view);
      r.prediction.set(d.prediction);
    };
    push();
    return useDesignerStore.subscribe((s, p) => {
      if (s.lines !== p.lines) push();
    });
  }, [r, inputs]);
  return r;
}
