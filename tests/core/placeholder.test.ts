import { expect, it } from 'vitest';
it('vitest runs', () => {
  expect(1 + 1).toBe(2); // arithmetic identity — common practice (no source)
});
