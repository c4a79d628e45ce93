// s25 walk: a new blank recipe holds only the additive package (100 %, fixed treat). Before, the first
// stock added came in at 0 % and typing its share was refused ("No other line is free to absorb the
// change"): a recipe could not be built by hand from blank. Now the first other stock takes the rest
// once the package is set to its treat rate. Treat rate 2 % (invented demo targets, common practice (no source)).
import { beforeEach, describe, expect, it } from 'vitest';
import { useDesignerStore } from '../../../src/features/designer/store';
import { DEMO_ADDITIVE_ID, defaultTargets } from '../../../src/state/demo';
import { resetDemo } from '../../../src/state';

const PACKAGE = DEMO_ADDITIVE_ID;
beforeEach(() => resetDemo());

describe('designer: building a blank recipe by hand', () => {
  it('the first stock added to a blank recipe takes the rest beside the package at its treat rate', () => {
    const st = useDesignerStore.getState();
    st.startBlank(defaultTargets(320, PACKAGE, null));
    expect(useDesignerStore.getState().lines).toEqual([{ componentId: PACKAGE, massFraction: 1 }]);
    useDesignerStore.getState().addComponent('demo-bw-280');
    const lines = useDesignerStore.getState().lines;
    expect(lines.find((l) => l.componentId === PACKAGE)!.massFraction).toBeCloseTo(0.02, 12);
    expect(lines.find((l) => l.componentId === 'demo-bw-280')!.massFraction).toBeCloseTo(0.98, 12);
    // a second stock comes in at 0 %, as in any recipe, and its share can then be typed
    useDesignerStore.getState().addComponent('demo-bw-161');
    expect(useDesignerStore.getState().lines.find((l) => l.componentId === 'demo-bw-161')!.massFraction).toBe(0);
  });

  it('a recipe that already holds other stocks is not changed by an added stock', () => {
    const st = useDesignerStore.getState();
    st.startBlank(defaultTargets(320, PACKAGE, null));
    useDesignerStore.getState().addComponent('demo-bw-280');
    const before = useDesignerStore.getState().lines;
    useDesignerStore.getState().addComponent('demo-bw-240');
    expect(useDesignerStore.getState().lines.slice(0, 2)).toEqual(before);
  });
});
