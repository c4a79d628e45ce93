// Whole-line plan end to end on the invented demo plant: the bright stock limited at a tonnage,
// VG 220–680 planned with demands, both plans and the marginal value shown, the plan adopted as new
// revisions, the one-page summary printed to PDF and read back with pdftotext.
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { join } from 'node:path';
import { launch, screenshot, SCREEN_DIR, stored, type Session } from './support';
import { axeSerious } from './axe';

const DEMANDS_T: [grade: number, tonnes: string][] = [
  [220, '300'],
  [320, '400'],
  [460, '250'],
  [680, '150'],
]; // invented demands

describe('whole-line plan', () => {
  let s: Session;
  beforeAll(async () => {
    s = await launch();
  });
  afterAll(async () => {
    await s?.close();
  });

  it('limits the bright stock, plans VG 220–680, adopts the plan and prints its summary', async () => {
    const { page } = s;
    await page.goto(`${inject('baseURL')}#/line-plan`);
    await page.getByRole('heading', { name: 'Whole-line plan', level: 2 }).waitFor();
    const enter = async (label: string | RegExp, value: string) => {
      const f = page.getByLabel(label);
      await f.fill(value);
      await f.press('Enter');
    };
    for (const [grade, t] of DEMANDS_T) await enter(new RegExp(`^Demand of “Gear oil VG ${grade}`), t);
    // The bright stock, limited in the demo library, at 250 t over the period.
    const bsRow = page.locator('tr', { has: page.getByLabel('Supply of BW-190') });
    await expect.poll(() => bsRow.innerText()).toContain('in the library');
    await enter('Supply of BW-190', '250');
    // A bad entry is refused at the field, in words, and not saved.
    await enter('Supply of BW-160', '-3');
    await expect.poll(() => page.getByRole('alert').filter({ hasText: 'Supply of BW-160' }).innerText()).toMatch(/at least 0 t/);
    await page.getByLabel('Supply of BW-160').press('Escape');

    await page.getByRole('button', { name: 'Plan the line' }).click();
    const results = page.getByTestId('plan-results');
    await results.waitFor();
    await page.locator('[data-chart="allocation"] .recharts-bar-rectangle').first().waitFor();
    const headline = await page.getByTestId('plan-headline').innerText();
    expect(headline).toMatch(/The withdrawal of BW-160, BW-161, BW-190 costs the line €[\s\u202f][\d\u202f\u00a0,]+ over the period/);
    const marginal = await page.getByTestId('marginal-values').innerText();
    expect(marginal).toMatch(/One more tonne of BW-190 would save about €[\s\u202f][\d\u202f\u00a0,]+ over the period\./);
    const afterRecipes = await page.getByTestId('plan-after').locator('.lp-grade-table').innerText();
    expect(afterRecipes).not.toContain('BW-190');
    await expect.poll(() => page.getByTestId('plan-after').innerText()).toMatch(/No longer needed:.*BW-190/);
    const lasting = await page.getByTestId('plan-lasting').innerText();
    for (const [grade] of DEMANDS_T) expect(lasting).toContain(`VG ${grade}`);
    const allocation = await page.getByTestId('allocation-table').innerText();
    expect(allocation).toMatch(/BW-190[\s\S]*250/);
    expect(await axeSerious(page)).toEqual([]);
    await screenshot(page, 'lineplan-demo');

    // Adopt the plan while the limited stocks last: new revisions of the four recipes, one step.
    await page.getByTestId('plan-lasting').getByRole('button', { name: 'Adopt these recipes…' }).click();
    await page.getByRole('button', { name: 'Save the new revisions' }).click();
    await expect.poll(() => page.getByTestId('adopted-lasting').innerText()).toMatch(/VG 220 revision 2, VG 320 revision 2, VG 460 revision 2, VG 680 revision 2/);
    // Saved as draft revisions that supersede the recipes made now, one undo step.
    type StoredRecipe = { id: string; revision: number; status: string; supersedes: string | null };
    const drafts = async () =>
      ((await stored(page, 'recipes')) as { state: { recipes: StoredRecipe[] } } | undefined)?.state.recipes.filter(
        (r) => r.revision === 2 && r.status === 'draft',
      ) ?? [];
    await expect.poll(async () => (await drafts()).map((r) => r.supersedes).sort()).toEqual(['demo-vg220', 'demo-vg320', 'demo-vg460', 'demo-vg680']);
    const vg320rev2 = (await drafts()).find((r) => r.supersedes === 'demo-vg320')!.id;

    // The one-page summary, printed to PDF through the shared print path and read back.
    await page.getByTestId('plan-summary').waitFor();
    const totalOnScreen = (await page.getByTestId('total-lasting').innerText()).trim();
    const costOnScreen = (await page.getByTestId('withdrawal-cost').innerText()).trim();
    const pdf = join(SCREEN_DIR, 'lineplan-summary.pdf');
    await page.emulateMedia({ media: 'print' });
    await page.pdf({ path: pdf, format: 'A4', printBackground: true });
    await page.emulateMedia({ media: 'screen' });
    const info = execFileSync('pdfinfo', [pdf], { encoding: 'utf8' });
    expect(/^Pages:\s+(\d+)/m.exec(info)?.[1]).toBe('1');
    const text = execFileSync('pdftotext', ['-layout', pdf, '-'], { encoding: 'utf8' });
    expect(text).toContain('WHOLE-LINE PLAN — SUMMARY');
    expect(text).toContain('While the limited stocks last');
    expect(text).toMatch(/VG 220\s+VG 320\s+VG 460\s+VG 680/);
    expect(text).toMatch(/BW-190 Group I bright stock/);
    expect(text).toMatch(/Demand \[t\]\s+300\.0\s+400\.0\s+250\.0\s+150\.0\s+1[\s,\u202f]?100\.0/);
    const flat = text.replace(/[\u202f\u00a0]/g, ' ');
    expect(flat).toContain(totalOnScreen.replace(/[\u202f\u00a0]/g, ' '));
    expect(flat).toContain(costOnScreen.replace(/[\u202f\u00a0]/g, ' '));
    expect(text).toMatch(/laboratory\s+confirmation/);
    expect(text).toMatch(/Plan only — not for batching or release/);
    expect(text).not.toContain('Plan the line'); // nothing of the app around it
    execFileSync('pdftoppm', ['-png', '-r', '80', pdf, join(SCREEN_DIR, 'lineplan-summary')]);

    // Quantities in kg: the same plan (not out of date), every quantity on screen and on paper in kg
    // (the demands above, 1 t = 1000 kg; total 1100 t).
    await page.getByLabel('kg', { exact: true }).check();
    await expect.poll(() => page.getByTestId('allocation-table').innerText()).toMatch(/Supply \[kg\][\s\S]*BW-190[\s\S]*250[\u202f\s]000/);
    expect(await page.getByTestId('marginal-values').innerText()).toMatch(/Another 1000 kg of BW-190 would save about €[\s\u202f][\d\u202f\u00a0,]+ over the period\./);
    const pdfKg = join(SCREEN_DIR, 'lineplan-summary-kg.pdf');
    await page.emulateMedia({ media: 'print' });
    await page.pdf({ path: pdfKg, format: 'A4', printBackground: true });
    await page.emulateMedia({ media: 'screen' });
    const textKg = execFileSync('pdftotext', ['-layout', pdfKg, '-'], { encoding: 'utf8' }).replace(/[\u202f\u00a0]/g, ' ');
    expect(textKg).toMatch(/Demand \[kg\]\s+300 000\s+400 000\s+250 000\s+150 000\s+1 100 000/);
    expect(textKg).toMatch(/Use \[kg\]/);
    expect(textKg).not.toMatch(/\[t\]|Out of date/);

    // Saved: the plan's inputs (and their unit) come back after a reload, and the blend sheet prints revision 2.
    await page.reload();
    await page.getByRole('heading', { name: 'Whole-line plan', level: 2 }).waitFor();
    await expect.poll(() => page.getByLabel(/^Demand of “Gear oil VG 320/).inputValue()).toBe('400000');
    await expect.poll(() => page.getByLabel('Supply of BW-190').inputValue()).toBe('250000');
    await page.goto('about:blank');
    await page.goto(`${inject('baseURL')}#/blend-sheet/${vg320rev2}`);
    await page.getByRole('heading', { name: 'Blend sheet', level: 2 }).waitFor();
    const sheet = await page.locator('.blend-sheet').innerText();
    expect(sheet).toMatch(/Recipe revision\s*2/i);
    expect(sheet).toContain('BW-280'); // the planned VG 320 (screen above) uses the Group II heavy stock

    expect(s.offHost).toEqual([]);
    expect(s.errors).toEqual([]);
  });
});
