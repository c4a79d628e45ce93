// Recipe designer in the built app (Chromium via playwright-core): solve, live edit, working, save, reload.
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { launch, screenshot, type Session, stored } from './support';
import { axeSerious } from './axe';

const kvOf = async (page: Page) => Number((await page.getByTestId('prop-kv40').innerText()).replace(/[^\d.]/g, ''));

describe('recipe designer', () => {
  let s: Session;
  beforeAll(async () => {
    s = await launch();
  });
  afterAll(async () => {
    await s?.close();
  });

  it('first start shows the invented demo, and solving VG 320 for least cost gives an in-grade recipe', async () => {
    const { page } = s;
    await page.goto(inject('baseURL'));
    await expect.poll(() => page.getByText(/invented demo data/i).first().isVisible()).toBe(true);
    await page.getByRole('link', { name: /Recipe designer/ }).click();
    await page.getByRole('heading', { name: 'Recipe designer' }).waitFor();
    await page.getByLabel('ISO viscosity grade', { exact: true }).selectOption('320');
    await expect.poll(() => page.getByLabel('Least cost per litre (at 15 °C)').isChecked()).toBe(true);
    await page.getByRole('button', { name: 'Solve', exact: true }).click();
    await page.getByText('Solved', { exact: true }).waitFor();
    // ISO 3448 band of VG 320: 288–352 mm²/s, inclusive (tests/reference/check-values.md G2)
    await expect.poll(() => kvOf(page)).toBeGreaterThanOrEqual(288);
    await expect.poll(() => kvOf(page)).toBeLessThanOrEqual(352);
    await expect.poll(() => page.getByTestId('prop-grade').innerText()).toBe('VG 320');
    await expect.poll(() => page.getByTestId('total-mass').innerText()).toBe('100.00');
    // one standing caution in the app frame, not repeated beside the numbers
    await expect.poll(() => page.getByRole('note', { name: 'Caution' }).filter({ visible: true }).count()).toBe(1);
    await expect.poll(() => page.getByTestId('predicted').getByText(/laboratory confirmation/i).count()).toBe(0);
    await page.waitForSelector('[data-chart="viscosity-temperature"] .recharts-line-curve');
    await screenshot(page, 'designer');
  });

  it('recomputes while a fraction is typed, and shows the working of a number', async () => {
    const { page } = s;
    const before = await kvOf(page);
    // A share cell is text until focused; a click puts the field in its place, its share selected.
    const cell = page.getByTestId('recipe-lines').locator('.pct-input').first();
    const label = (await cell.getAttribute('aria-label')) ?? '';
    await cell.click();
    const first = page.getByLabel(label, { exact: true });
    await expect.poll(() => first.evaluate((el) => el.tagName)).toBe('INPUT');
    await first.pressSequentially('10'); // replaces the selected share
    // the properties follow the typed share (drawn a moment after the keystroke)
    await expect.poll(() => kvOf(page)).not.toBe(before);
    await expect.poll(() => page.getByTestId('total-mass').innerText()).toBe('100.00');
    await first.press('Tab');
    // Left: text again, showing the stored share; Shift-Tab comes back to the field.
    await expect.poll(() => page.getByLabel(label, { exact: true }).innerText()).toBe('10.00');
    await page.keyboard.press('Shift+Tab');
    await expect.poll(() => page.evaluate(() => [document.activeElement?.tagName, document.activeElement?.getAttribute('aria-label')])).toEqual(['INPUT', label]);
    await expect.poll(() => page.getByLabel(label, { exact: true }).inputValue()).toBe('10.00');
    await page.keyboard.press('Escape');
    await page.keyboard.press('Tab');
    await page.getByLabel('show working for Viscosity at 40 °C').click();
    await expect.poll(() => page.locator('#working-kv40').innerText()).toMatch(/Refutas/);
    await page.getByLabel('show working for Viscosity index').click();
    await expect.poll(() => page.locator('#working-vi').innerText()).toMatch(/ASTM D2270/);
    // in grade after shear, with the stated assumption as its working
    await expect.poll(() => page.getByTestId('prop-shear').innerText()).toMatch(/^(yes|no), ν40 /);
    await page.getByLabel('show working for In grade after shear').click();
    await expect.poll(() => page.locator('#working-shear').innerText()).toMatch(/ISO 26422/);
    await screenshot(page, 'designer-working');
    expect(await axeSerious(page)).toEqual([]);
  });

  it('an impossible target shows the reason and a suggested fix', async () => {
    const { page } = s;
    await page.getByLabel('ISO viscosity grade', { exact: true }).selectOption('1000');
    await page.getByLabel(/^Maximum polymer/).fill('0');
    await page.getByLabel(/^Maximum polymer/).press('Enter');
    await page.getByText('Per-stock limits and exclusions').click();
    for (const code of ['BW-499']) await page.getByLabel(`Use ${code}`, { exact: true }).uncheck();
    await page.getByRole('button', { name: 'Solve', exact: true }).click();
    await page.getByText('No recipe meets these targets').waitFor();
    await expect.poll(() => page.getByTestId('infeasible-reason').innerText()).toMatch(/mm²\/s/);
    await expect.poll(() => page.getByText('Suggested fix:').isVisible()).toBe(true);
    await screenshot(page, 'designer-infeasible');
  });

  it('saves the recipe, which is still there after a reload', async () => {
    const { page } = s;
    await page.getByLabel('ISO viscosity grade', { exact: true }).selectOption('320');
    await page.getByRole('button', { name: 'Solve', exact: true }).click();
    await page.getByText('Solved', { exact: true }).waitFor();
    await page.getByLabel('Recipe name', { exact: true }).fill('Trial VG 320 least cost');
    await page.getByRole('button', { name: 'Save as new recipe' }).click();
    await expect.poll(async () => JSON.stringify(await stored(page, 'recipes'))).toContain('Trial VG 320 least cost');
    await page.reload();
    await page.getByRole('heading', { name: 'Recipe designer' }).waitFor();
    // the saved recipe is the active one: the designer opens it
    await expect.poll(() => page.getByLabel('Open', { exact: true }).locator('option:checked').innerText()).toMatch(/Trial VG 320 least cost/);
    await expect.poll(() => kvOf(page)).toBeGreaterThanOrEqual(288); // ISO 3448 VG 320 band (tests/reference/check-values.md G2)
    await expect.poll(() => kvOf(page)).toBeLessThanOrEqual(352);
    expect(s.errors).toEqual([]);
    expect(s.offHost).toEqual([]);
  });

  it('an edit followed at once by a reload is kept (the draft is written as the page leaves)', async () => {
    const { page } = s;
    const cell = page.getByTestId('recipe-lines').locator('.pct-input').first();
    const label = (await cell.getAttribute('aria-label')) ?? '';
    await cell.click();
    const field = page.getByLabel(label, { exact: true });
    await field.pressSequentially('7'); // replaces the selected share
    await field.press('Tab');
    await expect.poll(() => page.getByLabel(label, { exact: true }).innerText()).toBe('7.00');
    await page.reload(); // at once: no wait for the draft's save
    await page.getByRole('heading', { name: 'Recipe designer' }).waitFor();
    // The draft is back with the notice that says so (the tab's leave copy in sessionStorage is read at
    // the start, s23): the share is read once, not polled.
    await page.getByText(/Restored the draft from your last session/).waitFor();
    expect(await page.getByLabel(label, { exact: true }).innerText()).toBe('7.00');
    // Written through to IndexedDB, and the tab's copy removed.
    await expect
      .poll(async () => {
        const ws = (await stored(page, 'workspace')) as { state: { drafts: Record<string, { lines: Array<{ massFraction: number }> }> } };
        return Object.values(ws.state.drafts).some((d) => d.lines.some((l) => Math.abs(l.massFraction - 0.07) < 1e-9));
      })
      .toBe(true);
    expect(await page.evaluate(() => Object.keys(sessionStorage).filter((k) => k.startsWith('blendbench.unsaved.')))).toEqual([]);
    expect(s.errors).toEqual([]);
    expect(s.offHost).toEqual([]);
  });

  it('opening another recipe over unsaved edits asks first; the edits kept as a draft come back from the kept drafts (s22 item 2)', async () => {
    const { page } = s;
    const cell = page.getByTestId('recipe-lines').locator('.pct-input').first();
    const label = (await cell.getAttribute('aria-label')) ?? '';
    await expect.poll(() => page.getByLabel(label, { exact: true }).innerText()).toBe('7.00'); // the restored, unsaved edit
    await page.getByLabel('Open', { exact: true }).selectOption('demo-vg460');
    await page.getByRole('button', { name: 'Open', exact: true }).click();
    const question = page.getByRole('alertdialog', { name: /^Discard the unsaved edits to/ });
    await question.waitFor();
    await expect.poll(() => question.innerText()).toMatch(/Opening “Gear oil VG 460/);
    expect(await axeSerious(page)).toEqual([]);
    await screenshot(page, 'designer-open-over-unsaved-edits');
    await question.getByRole('button', { name: /^Keep my edits as a draft/ }).click();
    await expect.poll(() => page.getByLabel('Open', { exact: true }).locator('option:checked').innerText()).toMatch(/VG 460/);
    await page.getByText(/are kept as a draft: open them again from the kept drafts above/).waitFor();
    const kept = page.getByTestId('kept-drafts');
    await kept.getByRole('button', { name: /^Open the draft kept at/ }).click();
    await page.getByText(/Opened the draft kept at/).waitFor();
    await expect.poll(() => page.getByLabel(label, { exact: true }).innerText()).toBe('7.00');
    expect(s.errors).toEqual([]);
    expect(s.offHost).toEqual([]);
  });
});

describe('designer draft, two tabs and a reload (s20 defect 1)', () => {
  let s: Session;
  beforeAll(async () => {
    s = await launch();
  });
  afterAll(async () => {
    await s?.close();
  });

  it('a draft with unsaved edits, reloaded, does not overwrite the save another tab made since it began', async () => {
    const a = s.page;
    await a.goto(inject('baseURL') + '#/designer');
    await a.getByRole('heading', { name: 'Recipe designer' }).waitFor();
    await a.getByLabel('Recipe name', { exact: true }).fill('Two-tab trial');
    await a.getByRole('button', { name: 'Save as new recipe' }).click();
    await expect.poll(async () => JSON.stringify(await stored(a, 'recipes'))).toContain('Two-tab trial');
    // This tab edits the first share (not saved); the edit is kept as the draft is written.
    const cellA = a.getByTestId('recipe-lines').locator('.pct-input').first();
    const label = (await cellA.getAttribute('aria-label')) ?? '';
    await cellA.click();
    await a.getByLabel(label, { exact: true }).pressSequentially('7');
    await a.getByLabel(label, { exact: true }).press('Tab');
    await expect.poll(async () => JSON.stringify(await stored(a, 'workspace'))).toContain('"dirty":true');
    // Another tab then saves the same draft (its specification, on the Recipes screen).
    const b = await s.newPage();
    await b.goto(inject('baseURL') + '#/recipes');
    await b.getByRole('heading', { name: 'Recipes', level: 2 }).waitFor();
    await b.getByTestId('recipe-list').getByRole('row').filter({ hasText: 'Two-tab trial' }).getByRole('button').first().click();
    await b.getByLabel('Foaming (ASTM D892)').fill('Sequence I: 50/0 mL max (invented)');
    await b.getByLabel('Foaming (ASTM D892)').press('Tab');
    await b.getByRole('button', { name: 'Save specification' }).click();
    await expect.poll(async () => JSON.stringify(await stored(b, 'recipes'))).toContain('50/0 mL max');
    const theirs = JSON.stringify(await stored(b, 'recipes'));
    // This tab reloads mid-edit: the draft comes back, and knows it began before the other tab's save.
    await a.reload();
    await a.getByText(/Restored the draft from your last session/).waitFor();
    await a.getByText(/was changed and saved after this draft began/).waitFor();
    await expect.poll(() => a.getByLabel(label, { exact: true }).innerText()).toBe('7.00');
    await a.getByRole('button', { name: 'Save changes to draft “Two-tab trial”' }).click();
    await a.getByText(/Not saved: .*was changed and saved after this draft was opened/).waitFor();
    await screenshot(a, 'designer-two-tab-reload-refused');
    expect(JSON.stringify(await stored(a, 'recipes'))).toBe(theirs);
    expect(s.errors).toEqual([]);
    expect(s.offHost).toEqual([]);
  });
});

describe('designer drafts belong to the tab (s21 item 1)', () => {
  let s: Session;
  beforeAll(async () => {
    s = await launch();
  });
  afterAll(async () => {
    await s?.close();
  });

  /** Type a share (%) into the first line of a tab's draft, as a blender does (not saved). */
  async function share(page: Page, text: string): Promise<string> {
    const cell = page.getByTestId('recipe-lines').locator('.pct-input').first();
    const label = (await cell.getAttribute('aria-label')) ?? '';
    await cell.click();
    await page.getByLabel(label, { exact: true }).pressSequentially(text);
    await page.getByLabel(label, { exact: true }).press('Tab');
    return label;
  }
  type StoredDrafts = { state?: { drafts?: Record<string, { lines: { massFraction: number }[] }> } } | undefined;
  const draftsKept = async (page: Page) => Object.keys(((await stored(page, 'workspace')) as StoredDrafts)?.state?.drafts ?? {}).length;
  /** A tab's draft key (tab-draft.ts: held in the tab's sessionStorage). */
  const keyOf = (page: Page) => page.evaluate(() => sessionStorage.getItem('blendbench.draft-key'));
  /** The first share [%] of the draft stored under `key`, as the tabs' merged saves left it. */
  const firstShareKept = async (page: Page, key: string | null) => {
    const f = ((await stored(page, 'workspace')) as StoredDrafts)?.state?.drafts?.[key ?? '']?.lines[0]?.massFraction;
    return f === undefined ? null : Math.round(f * 1e4) / 100;
  };

  it('two tabs on the same recipe each get their own unsaved edit back on their own reload; a new tab offers the closed tab’s draft by name', async () => {
    const a = s.page;
    await a.goto(inject('baseURL') + '#/designer');
    await a.getByRole('heading', { name: 'Recipe designer' }).waitFor();
    const b = await s.newPage();
    await b.goto(inject('baseURL') + '#/designer');
    await b.getByRole('heading', { name: 'Recipe designer' }).waitFor();
    const label = await share(a, '7');
    await expect.poll(() => draftsKept(a)).toBe(1);
    await share(b, '9');
    await expect.poll(() => draftsKept(b)).toBe(2);
    await share(a, '6'); // tab A writes last
    // Both drafts written (300 ms after the last change) and merged in the stored copy.
    const [keyA, keyB] = [await keyOf(a), await keyOf(b)];
    await expect.poll(async () => [await firstShareKept(a, keyA), await firstShareKept(a, keyB)]).toEqual([6, 9]);
    // Tab B reloads: its own edit comes back, not tab A's later one.
    await b.reload();
    await b.getByText(/Restored the draft from your last session/).waitFor();
    await expect.poll(() => b.getByLabel(label, { exact: true }).innerText()).toBe('9.00');
    await a.reload();
    await a.getByText(/Restored the draft from your last session/).waitFor();
    await expect.poll(() => a.getByLabel(label, { exact: true }).innerText()).toBe('6.00');
    // Tab A is closed with its edit unsaved; a new tab offers it by name and time (tab B's is B's).
    await a.close();
    const c = await s.newPage();
    await c.goto(inject('baseURL') + '#/designer');
    const list = c.getByTestId('kept-drafts');
    await list.waitFor();
    await expect.poll(() => list.getByRole('listitem').count()).toBe(1);
    await expect.poll(() => list.innerText()).toMatch(/Open the draft kept at \d\d:\d\d — \d+ stocks, VG \d+/);
    await expect.poll(() => c.getByLabel(label, { exact: true }).innerText()).not.toBe('6.00'); // none picked silently
    await screenshot(c, 'designer-kept-drafts-offered');
    await list.getByRole('button', { name: /^Open the draft kept/ }).click();
    await c.getByText(/Opened the draft kept at/).waitFor();
    await expect.poll(() => c.getByLabel(label, { exact: true }).innerText()).toBe('6.00');
    expect(s.errors).toEqual([]);
    expect(s.offHost).toEqual([]);
  });
});
