// The Stocks table at narrow and wide windows (s23): the name column keeps room for the names (the
// table scrolls sideways instead of squeezing them to nothing, as it did below about 1,000 px), with
// the row actions in reach (sticky).
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { launch, screenshot, type Session } from './support';

describe('Stocks table widths', () => {
  let s: Session;
  beforeAll(async () => {
    s = await launch();
  });
  afterAll(async () => {
    await s?.close();
  });

  async function measure(width: number) {
    await s.page.setViewportSize({ width, height: 900 });
    await s.page.goto(inject('baseURL'));
    await s.page.locator('main table tbody tr').first().waitFor();
    return s.page.evaluate(() => {
      const box = document.querySelector('.table-scroll')!;
      const rem = parseFloat(getComputedStyle(document.documentElement).fontSize);
      return {
        nameRem: document.querySelector('td.name-cell')!.getBoundingClientRect().width / rem,
        scrolls: box.scrollWidth > box.clientWidth,
        actions: getComputedStyle(document.querySelector('td.actions')!).position,
      };
    });
  }

  it('a narrow window (800 px): names keep about 6rem, the table scrolls sideways with its actions in reach', async () => {
    const m = await measure(800);
    expect(m.nameRem).toBeGreaterThanOrEqual(5.8);
    expect(m.scrolls).toBe(true);
    expect(m.actions).toBe('sticky');
    await screenshot(s.page, 'library-800');
  });

  it('the bench window (1400 px): the table fits, the names take the room there is', async () => {
    const m = await measure(1400);
    expect(m.nameRem).toBeGreaterThan(15);
    expect(m.scrolls).toBe(false);
  });
});
