import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { launch, screenshot, type Session } from './support';

describe('app shell', () => {
  let s: Session;
  beforeAll(async () => {
    s = await launch();
  });
  afterAll(async () => {
    await s?.close();
  });

  it('opens with the caution visible, no console errors and no off-host request', async () => {
    await s.page.goto(inject('baseURL'));
    await s.page.getByRole('heading', { name: 'Blendbench' }).waitFor();
    await expect.poll(() => s.page.getByText(/laboratory confirmation/i).first().isVisible()).toBe(true);
    await screenshot(s.page, 'shell');
    expect(s.errors).toEqual([]);
    expect(s.offHost).toEqual([]);
  });
});
