// The plant's QC loop end to end (issue 12) in Chromium: solve VG 320 at 99 % in band in the designer,
// save it, print its blend sheet to PDF, enter an off-grade QC result, get the correction and print
// the correction sheet to PDF; both PDFs read back with poppler's pdftotext / pdfinfo.
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { join } from 'node:path';
import type { Locator, Page } from 'playwright-core';
import { cellValue, launch, screenshot, SCREEN_DIR, stored, type Session } from './support';

const pdfText = (path: string) => execFileSync('pdftotext', ['-layout', path, '-'], { encoding: 'utf8' });
const pdfPages = (path: string) => Number(/^Pages:\s+(\d+)/m.exec(execFileSync('pdfinfo', [path], { encoding: 'utf8' }))?.[1]);
/** A number as shown: grouping marks removed, the minus sign read. */
const num = (s: string) => Number(s.replace(/[\u202f\u00a0,]/g, '').replace('−', '-'));

async function printPdf(page: Page, name: string): Promise<string> {
  const path = join(SCREEN_DIR, `${name}.pdf`);
  await page.emulateMedia({ media: 'print' });
  await page.pdf({ path, format: 'A4', printBackground: true });
  await page.emulateMedia({ media: 'screen' });
  execFileSync('pdftoppm', ['-png', '-r', '80', path, join(SCREEN_DIR, name)]);
  return path;
}

async function enter(page: Page, label: RegExp, value: string): Promise<void> {
  const f = page.getByLabel(label);
  await f.fill(value);
  await f.press('Enter');
}

describe('the plant’s QC loop', () => {
  let s: Session;
  beforeAll(async () => {
    s = await launch();
  });
  afterAll(async () => {
    await s?.close();
  });

  it('solves VG 320 at 99 %, prints its sheet, corrects an off-grade batch and prints the correction', async () => {
    const { page } = s;
    // 1. The designer: VG 320, least cost, at least 99 % of batches in the solve band.
    await page.goto(inject('baseURL'));
    await page.getByRole('link', { name: /Recipe designer/ }).click();
    await page.getByRole('heading', { name: 'Recipe designer' }).waitFor();
    await page.getByLabel('ISO viscosity grade', { exact: true }).selectOption('320');
    await enter(page, /Probability in the solve band, at least/, '99');
    await page.getByRole('button', { name: 'Solve', exact: true }).click();
    await page.getByText('Solved', { exact: true }).waitFor();
    // The condition asked for, recomputed by the core's lot-spread model (issue 12).
    expect(num((await page.getByTestId('prop-inBandPlant').innerText()).replace(/[^\d.,\u202f]/g, ''))).toBeGreaterThanOrEqual(99);
    await expect.poll(() => page.getByTestId('prop-inBandIso').innerText()).toMatch(/%/);
    // The premium over the nominal optimum, which sits on the band's edge (about half the batches in band).
    await page.getByText(/buys 99\.0 % instead of (49|50|51)\.\d % in the solve band/).first().waitFor();
    await screenshot(page, 'qc-designer-99');
    await page.getByLabel('Recipe name').fill('VG 320 at 99 % (invented)');
    await page.getByRole('button', { name: 'Save as new recipe' }).click();
    await page.getByText(/Saved as a new draft recipe: VG 320 at 99 % \(invented\)/).waitFor();
    type StoredRecipe = { id: string; name: string };
    const saved = async () => ((await stored(page, 'recipes')) as { state: { recipes: StoredRecipe[] } } | undefined)?.state.recipes.find((r) => r.name === 'VG 320 at 99 % (invented)');
    await expect.poll(async () => (await saved()) !== undefined).toBe(true);
    const id = (await saved())!.id;

    // 2. Its blend sheet: 10 000 kg, the probability in band stated, printed to one A4 page.
    await page.goto('about:blank');
    await page.goto(`${inject('baseURL')}#/blend-sheet/${id}`);
    await page.getByRole('heading', { name: 'Blend sheet', level: 2 }).waitFor();
    await page.getByLabel('Batch / lot no.').fill('L-QC-0001');
    await page.getByLabel('Vessel', { exact: true }).fill('Kettle 2');
    await page.getByLabel('Batch size', { exact: true }).fill('10000');
    await page.getByText(/^10,?\u202f?000\.0 kg/).first().waitFor();
    const onScreen = await page.getByTestId('sheet-in-band').innerText();
    const pScreen = /([\d.]+) % of batches of this recipe land in the release band/.exec(onScreen);
    expect(onScreen.startsWith('> 99.99 %') || (pScreen !== null && Number(pScreen[1]) >= 99)).toBe(true);
    const sheetPdf = await printPdf(page, 'qc-blend-sheet');
    expect(pdfPages(sheetPdf)).toBe(1);
    const sheet = pdfText(sheetPdf);
    expect(sheet).toMatch(/ISO VG 320/);
    expect(sheet).toMatch(/L-QC-0001/);
    const pPrinted = /lot spread \(model\): (>\s*)?([\d.]+) % of batches in the ν40 release band/.exec(sheet.replace(/\s+/g, ' '));
    expect(pPrinted, sheet).not.toBeNull();
    expect(Number(pPrinted![2])).toBeGreaterThanOrEqual(99);
    expect(sheet).toMatch(/Laboratory confirmation of every release property is required/);
    expect(sheet).toMatch(/safety data sheet/);
    expect(sheet).not.toMatch(/Batch correction sheet/);

    // 3. QC measures the batch off grade (290 mm²/s, below the 304–336 band); the vessel takes 12 000 kg.
    await page.getByText('QC result and batch correction', { exact: true }).click();
    await enter(page, /^Measured ν40 of the batch/, '290');
    await enter(page, /^Vessel holds at most/, '12000');
    const summary = await page.getByTestId('correction-summary').innerText();
    expect(summary).toMatch(/Add [\d.,\u202f]+ kg of BW-\d+/);
    await screenshot(page, 'qc-correction');

    // 4. The correction sheet through the sheet's print path (the dialog itself is stubbed; the PDF is
    // what Chromium prints with the print media the button selected).
    await page.evaluate(() => {
      window.print = () => undefined;
    });
    await page.getByRole('button', { name: 'Print correction sheet' }).click();
    const corrPdf = await printPdf(page, 'qc-correction-sheet');
    expect(pdfPages(corrPdf)).toBe(1);
    const corr = pdfText(corrPdf);
    const flat = corr.replace(/\s+/g, ' ');
    expect(corr).toMatch(/Batch correction sheet/i);
    expect(flat).toMatch(/290/); // the measured ν40 printed
    expect(flat).toMatch(/BW-\d+/);
    const predicted = /ν40 ([\d.]+) mm²\/s/.exec(flat.slice(flat.search(/predicted/i)));
    expect(predicted).not.toBeNull();
    // lands in the release band, 304–336 mm²/s (ISO 3448 ±5 % of 320; tests/reference/check-values.md G2)
    expect(Number(predicted![1])).toBeGreaterThanOrEqual(304 * (1 - 1e-4));
    expect(Number(predicted![1])).toBeLessThanOrEqual(336 * (1 + 1e-4));
    expect(flat).toMatch(/Predicted properties are estimates/);
    expect(flat).toMatch(/laboratory/i);
    // Aimed inside the release limits with a margin, and said so on paper (session 19, defect 3; the margin is common practice, no source).
    expect(flat).toMatch(/with a margin of at least 1 % of ν40 inside each limit/);
    expect(corr).not.toMatch(/L at 60 °C/); // only the correction prints, not the blend sheet

    expect(s.offHost).toEqual([]);
    expect(s.errors).toEqual([]);
  });

  it('prints a batch on a heel on one page: the heel line, the batch size with the heel in it, the held sheet when the heel cannot be used (plant loop defect hunt)', async () => {
    const { page } = s;
    await page.goto('about:blank');
    await page.goto(`${inject('baseURL')}#/blend-sheet/demo-vg460`);
    await page.getByRole('heading', { name: 'Blend sheet', level: 2 }).waitFor();
    await page.getByLabel('Batch size', { exact: true }).fill('10000');
    await page.getByText('Lots in the tanks, heel in the vessel and aim', { exact: false }).click();
    // 2 000 kg left from a previous batch of the invented demo VG 460 (its prediction fills the heel's values)
    await enter(page, /^Heel mass/, '2000');
    await page.getByLabel('Heel is a previous batch of').selectOption('demo-vg460');
    await page.getByTestId('heel-row').waitFor();
    const pdf = await printPdf(page, 'qc-heel-sheet');
    // a three-stock recipe fits one page (README: up to 12 components), its heel line and two share columns included
    expect(pdfPages(pdf)).toBe(1);
    const flat = pdfText(pdf).replace(/\s+/g, ' ');
    // heel 2 000 kg + additions 8 000 kg = the 10 000 kg batch (common practice (no source): the heel is part of the batch)
    expect(flat).toMatch(/10[\u202f ,]?000\.0 kg \([\d\u202f ,.]+ L at 15 °C\): heel 2000\.0 kg \+ additions 8000\.0 kg/);
    expect(flat).toMatch(/\b0 HEEL\b/);
    expect(flat).toMatch(/Heel already in the vessel/);
    expect(flat).not.toMatch(/NOT FOR RELEASE/i);
    // an aim these lots and this heel cannot reach: the sheet is held, naming the heel it would not count
    await enter(page, /^Aim ν40 of the batch/, '500');
    await page.getByTestId('adjust-reason').waitFor();
    const held = pdfText(await printPdf(page, 'qc-heel-held')).replace(/\s+/g, ' ');
    expect(held).toMatch(/HOLD — NOT FOR RELEASE/i);
    expect(held).toMatch(/without the heel of 2000\.0 kg already in the vessel/);
    expect(s.offHost).toEqual([]);
    expect(s.errors).toEqual([]);
  });
});

/**
 * Commit typed fields (Enter) of several tabs at one wall-clock instant, each in its own page, so that
 * no tab hears of another's save before making its own entry (Playwright's key presses, one tab after
 * the other, leave time for the first save to reach the second tab).
 */
async function commitTogether(fields: Locator[]): Promise<void> {
  const at = Date.now() + 1000;
  await Promise.all(
    fields.map((f) =>
      f.evaluate(
        (el, t) =>
          new Promise<void>((resolve) =>
            setTimeout(() => {
              el.dispatchEvent(new KeyboardEvent('keydown', { key: 'Enter', bubbles: true, cancelable: true }));
              resolve();
            }, Math.max(0, t - Date.now())),
          ),
        at,
      ),
    ),
  );
}

describe('two tabs typing results of one batch at once (s21 item 2, s22 item 3)', () => {
  let s: Session;
  beforeAll(async () => {
    s = await launch();
  });
  afterAll(async () => {
    await s?.close();
  });

  type StoredQc = { state: { qc: Record<string, { lots: Record<string, { kv40: number | null; kv100: number | null; density15: number | null }> }> } };
  const lotOf = async (page: Page) => ((await stored(page, 'recipes')) as StoredQc | undefined)?.state.qc['demo-vg460']?.lots['demo-bw-190'] ?? null;

  async function openQc(page: Page): Promise<void> {
    await page.goto(`${inject('baseURL')}#/blend-sheet/demo-vg460`);
    await page.getByRole('heading', { name: 'Blend sheet', level: 2 }).waitFor();
    await page.getByText('Lots in the tanks, heel in the vessel and aim', { exact: false }).click();
    await page.getByLabel(/^Lot ν40 of BW-190/).waitFor();
  }

  it('the first two results of one lot, typed in two tabs at the same moment, are both kept in both tabs and after a reload', async () => {
    const a = s.page;
    await openQc(a);
    // The first start's demo is saved before the second tab opens (else both would start fresh).
    await expect.poll(async () => (await stored(a, 'recipes')) != null).toBe(true);
    const b = await s.newPage();
    await openQc(b);
    // Invented lab results of the lot of BW-190 in the tank: ν40 in tab A, ν100 in tab B, each the
    // first entry of the recipe's QC loop in its tab (each makes the lot, its other values blank).
    const typed = [a.getByLabel(/^Lot ν40 of BW-190/), b.getByLabel(/^Lot ν100 of BW-190/)];
    await typed[0]!.fill('480');
    await typed[1]!.fill('31.5');
    await commitTogether(typed);
    await expect.poll(() => lotOf(a)).toEqual({ kv40: 480, kv100: 31.5, density15: null });
    // Each tab shows the other's result too.
    await expect.poll(() => cellValue(a, /^Lot ν100 of BW-190/)).toBe('31.5');
    await expect.poll(() => cellValue(b, /^Lot ν40 of BW-190/)).toBe('480');
    await a.reload();
    await a.getByRole('heading', { name: 'Blend sheet', level: 2 }).waitFor();
    // (the lots' block opens by itself once it holds an entry)
    expect([await cellValue(a, /^Lot ν40 of BW-190/), await cellValue(a, /^Lot ν100 of BW-190/)]).toEqual(['480', '31.5']);
    expect(s.offHost).toEqual([]);
    expect(s.errors).toEqual([]);
  });
});
