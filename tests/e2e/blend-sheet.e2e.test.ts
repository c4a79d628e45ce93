// Blend sheet end to end: open a demo recipe's sheet, print it to PDF in Chromium, read the PDF back
// with poppler's pdftotext / pdfinfo, and check what the plant relies on.
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { launch, screenshot, SCREEN_DIR, stored, type Session } from './support';
import { editSaved, seededRecipe, TWELVE } from './seed';

const OUT = SCREEN_DIR; // git-ignored (test-output/screens)
const AXE = createRequire(import.meta.url).resolve('axe-core/axe.min.js');

function pdfText(path: string): string {
  return execFileSync('pdftotext', ['-layout', path, '-'], { encoding: 'utf8' });
}
function pdfPages(path: string): number {
  const info = execFileSync('pdfinfo', [path], { encoding: 'utf8' });
  const m = /^Pages:\s+(\d+)/m.exec(info);
  if (!m) throw new Error(`pdfinfo gave no page count:\n${info}`);
  return Number(m[1]);
}
function toPng(pdf: string, prefix: string): void {
  execFileSync('pdftoppm', ['-png', '-r', '80', pdf, join(OUT, prefix)]);
}

/** A number as printed: grouping marks (narrow no-break space, no-break space, comma) removed. */
const num = (s: string) => Number(s.replace(/[\u202f\u00a0,]/g, '').replace('−', '-'));
/** The numeric tokens of a line (tokens are separated by ordinary spaces in pdftotext's layout). */
const numbers = (line: string) =>
  line
    .split(/ +/)
    .filter((t) => /^−?\d[\d\u202f\u00a0,]*(?:\.\d+)?$/.test(t))
    .map(num);

/**
 * The component rows read back from the PDF text: for each stock code, the last five numbers on its
 * line are mass %, volume %, kg, litres and running kg (the initials cell is empty).
 */
function componentRows(text: string, codes: readonly string[]) {
  const lines = text.split('\n');
  return codes.map((code) => {
    const line = lines.find((l) => new RegExp(`^\\s*\\d+\\s+${code}\\s`).test(l));
    if (!line) throw new Error(`no PDF line for ${code}:\n${text}`);
    const nums = numbers(line.slice(line.indexOf(code) + code.length));
    // mass %, vol. %, kg, L at 15 °C, L at the metering temperature (60 °C by default), running kg
    const [massPct, volPct, kg, litres, litresHot, running] = nums.slice(-6) as [number, number, number, number, number, number];
    return { code, massPct, volPct, kg, litres, litresHot, running };
  });
}

async function openSheet(page: Page, recipeId: string): Promise<string[]> {
  // A fresh document each time (a hash change alone would keep the old data); the header fields are
  // saved per recipe, so they come back.
  await page.goto('about:blank');
  await page.goto(`${inject('baseURL')}#/blend-sheet/${recipeId}`);
  await page.getByRole('heading', { name: 'Blend sheet', level: 2 }).waitFor();
  const table = page.getByRole('table', { name: /Components, in charging order/ });
  await table.waitFor();
  return table.locator('tbody th[scope="row"]').allTextContents();
}

async function printPdf(page: Page, name: string, format: 'A4' | 'Letter' = 'A4'): Promise<string> {
  const path = join(OUT, `${name}.pdf`);
  await page.emulateMedia({ media: 'print' });
  await page.pdf({ path, format, printBackground: true });
  await page.emulateMedia({ media: 'screen' });
  return path;
}

describe('blend sheet', () => {
  let s: Session;
  beforeAll(async () => {
    s = await launch();
  });
  afterAll(async () => {
    await s?.close();
  });

  it('prints a demo recipe on one A4 page with the grade, quantities summing to the batch and the cautions', async () => {
    const { page } = s;
    const codes = await openSheet(page, 'demo-vg320');
    expect(codes.length).toBeGreaterThan(1);
    await page.getByLabel('Batch / lot no.').fill('L-2025-0142');
    await page.getByLabel('Vessel', { exact: true }).fill('Kettle 3');
    await page.getByLabel('Batch size', { exact: true }).fill('5000');
    await page.getByText(/^5,?\u202f?000\.0 kg/).first().waitFor();
    await screenshot(page, 'blend-sheet-vg320');

    const pdf = await printPdf(page, 'blend-sheet-vg320');
    toPng(pdf, 'blend-sheet-vg320');
    const text = pdfText(pdf);
    expect(pdfPages(pdf)).toBe(1);
    expect(text).toMatch(/ISO VG 320/);
    expect(text).toMatch(/L-2025-0142/);
    expect(text).toMatch(/Kettle 3/);
    expect(text).toMatch(/Laboratory confirmation of every release property is required/);
    expect(text).toMatch(/safety data sheet/);
    expect(text).toMatch(/ASTM D445/);
    expect(text).toMatch(/Plant copy/);
    expect(text).not.toMatch(/Price\/kg/);

    const rows = componentRows(text, codes);
    // Displayed kg sum exactly to the 5000.0 kg batch (largest-remainder rounding; common practice (no source)).
    expect(Math.round(rows.reduce((a, r) => a + r.kg, 0) * 10)).toBe(50000);
    expect(Math.round(rows.reduce((a, r) => a + r.massPct, 0) * 100)).toBe(10000);
    // litres at 60 °C (ASTM D1250-80 Table 54D) exceed litres at 15 °C for every line
    for (const r of rows) expect(r.litresHot).toBeGreaterThan(r.litres);
    expect(text).toMatch(/L at 60 °C/);
    expect(rows.at(-1)!.running).toBe(5000);
    const total = text.split('\n').find((l) => /^\s*Total\s/.test(l));
    expect(total).toBeDefined();
    expect(numbers(total!)).toContain(5000);
    // The additive package is charged last (common practice, domain notes).
    expect(codes.at(-1)).toBe('BW-901');
    // The header fields are saved (the next test opens the sheet anew and finds them).
    type StoredSheets = { state: { sheets: Record<string, { lot: string; vessel: string; batchSize: string }> } } | undefined;
    await expect
      .poll(async () => {
        const sheet = ((await stored(page, 'recipes')) as StoredSheets)?.state.sheets['demo-vg320'];
        return sheet && [sheet.lot, sheet.vessel, sheet.batchSize];
      })
      .toEqual(['L-2025-0142', 'Kettle 3', '5000']);
    expect(s.errors).toEqual([]);
    expect(s.offHost).toEqual([]);
  });

  it('shows prices only on the costing copy and exports the component table as CSV', async () => {
    const { page } = s;
    const codes = await openSheet(page, 'demo-vg320');
    // The header fields typed in the previous test are remembered for this recipe across the reload.
    await expect.poll(() => page.getByLabel('Batch / lot no.').inputValue()).toBe('L-2025-0142');
    await expect.poll(() => page.getByLabel('Vessel', { exact: true }).inputValue()).toBe('Kettle 3');
    await expect.poll(() => page.getByLabel('Batch size', { exact: true }).inputValue()).toBe('5000');
    await page.getByLabel('Batch size', { exact: true }).fill('1000');
    await page.getByLabel('Costing copy').check();
    await page.getByText(/per batch/).waitFor();
    const pdf = await printPdf(page, 'blend-sheet-vg320-costing');
    const text = pdfText(pdf);
    expect(pdfPages(pdf)).toBe(1);
    expect(text).toMatch(/Costing copy/);
    expect(text).toMatch(/Price\/kg/);
    expect(text).toMatch(/per batch/);

    const [download] = await Promise.all([
      page.waitForEvent('download'),
      page.getByRole('button', { name: /Export component table/ }).click(),
    ]);
    const csv = readFileSync(await download.path(), 'utf8').replace(/^\uFEFF/, '');
    const lines = csv.trim().split(/\r\n/);
    expect(lines[0]).toMatch(/^Charge order,Code,Name,Category,Mass %,Volume %,kg,Litres at 15 °C,Litres at 60 °C \(metering\),Running total kg,Price per kg/);
    expect(lines).toHaveLength(codes.length + 2);
    expect(lines.at(-1)).toMatch(/^,TOTAL,,,100\.00,100\.00,1000\.0,/);
    await page.getByLabel('Plant copy (no prices)').check();

    // Accessible markup: no serious or critical axe-core findings inside the sheet screen.
    // Evaluated through the DevTools protocol: the app's CSP (rightly) refuses an injected <script>.
    await page.evaluate(readFileSync(AXE, 'utf8'));
    const violations = await page.evaluate(async () => {
      const axe = (window as unknown as { axe: { run: (ctx: unknown) => Promise<{ violations: { id: string; impact: string; nodes: unknown[] }[] }> } }).axe;
      const res = await axe.run({ include: [['.bs-screen']] });
      return res.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical').map((v) => `${v.id} (${v.nodes.length})`);
    });
    expect(violations).toEqual([]);
    expect(s.errors).toEqual([]);
    expect(s.offHost).toEqual([]);
  });

  it('fits a 12-component recipe on one page, A4 and US Letter', async () => {
    const { page } = s;
    await page.goto(inject('baseURL'));
    await page.getByRole('navigation').waitFor();
    // Seed a 12-component recipe straight into the saved recipes (IndexedDB), then reload. Long-named
    // stocks ("…, second source") on purpose: the worst case for wrapping.
    await editSaved<{ recipes: { state: { recipes: unknown[] } } }>(page, ['recipes'], ({ recipes }) => {
      recipes.state.recipes.push(seededRecipe({ id: 'e2e-twelve', name: 'Twelve-component test blend VG 320 (invented)', grade: 320, ...TWELVE }));
    });
    const codes = await openSheet(page, 'e2e-twelve');
    expect(codes).toHaveLength(12);
    await page.getByLabel('Batch / lot no.').fill('L-2025-0999');
    await page.getByLabel('Vessel', { exact: true }).fill('Blend tank 12');
    await screenshot(page, 'blend-sheet-12');

    const pdf = await printPdf(page, 'blend-sheet-12-a4');
    toPng(pdf, 'blend-sheet-12-a4');
    expect(pdfPages(pdf)).toBe(1);
    const text = pdfText(pdf);
    const rows = componentRows(text, codes);
    // 1000.0 kg batch: displayed kg and % columns sum exactly (largest remainder; common practice (no source))
    expect(Math.round(rows.reduce((a, r) => a + r.kg, 0) * 10)).toBe(10000);
    expect(Math.round(rows.reduce((a, r) => a + r.volPct, 0) * 100)).toBe(10000);
    expect(rows.at(-1)!.running).toBe(1000);
    expect(text).toMatch(/ISO VG 320/);
    expect(text).toMatch(/Released by/);
    expect(text).toMatch(/hydrogen sulfide/);
    expect(text).not.toMatch(/HOLD — not for release/);

    // US Letter: choose it on the sheet, print with the page size the sheet asks for.
    await page.getByLabel('Paper').selectOption('letter');
    await page.getByLabel('Costing copy').check();
    await page.emulateMedia({ media: 'print' });
    const letter = join(OUT, 'blend-sheet-12-letter-costing.pdf');
    await page.pdf({ path: letter, preferCSSPageSize: true, printBackground: true });
    await page.emulateMedia({ media: 'screen' });
    toPng(letter, 'blend-sheet-12-letter-costing');
    expect(pdfPages(letter)).toBe(1);
    const size = execFileSync('pdfinfo', [letter], { encoding: 'utf8' });
    expect(size).toMatch(/Page size:\s+612 x 792 pts/); // US Letter = 8.5 × 11 in = 612 × 792 pt (definition)
    expect(s.errors).toEqual([]);
    expect(s.offHost).toEqual([]);
  });

  it('prints a 40-character stock code, a 200-character name and long header fields on one page, inside the page (s19 defect hunt)', async () => {
    const { page } = s;
    // The app's own backup, with the longest values the field rules allow (invented text), imported back.
    await page.goto(`${inject('baseURL')}#/settings`);
    await page.getByRole('heading', { name: 'Settings' }).waitFor();
    const download = page.waitForEvent('download');
    await page.getByRole('button', { name: 'Export everything (backup file)' }).click();
    type Backup = {
      sections: {
        library: { data: { components: { code: string; name: string }[] } };
        recipes: { data: { recipes: { id: string; name: string }[] } };
        settings: { data: { settings: { companyName: string } } };
      };
    };
    const backup = JSON.parse(readFileSync((await (await download).path())!, 'utf8')) as Backup;
    const code = 'BW-190-HEAVYBRIGHTSTOCKLOT2026NOV00000AB'; // 40 characters, no space: the stock code limit
    const bs = backup.sections.library.data.components.find((c) => c.code === 'BW-190')!;
    bs.code = code;
    bs.name = `Group I bright stock of an invented refinery, ${'vacuum residue, solvent extracted and dewaxed, '.repeat(4)}`.slice(0, 200);
    backup.sections.recipes.data.recipes.find((r) => r.id === 'demo-vg320')!.name = `Gear oil VG 320 for enclosed industrial gear drives, ${'heavy-duty EP, invented demo, '.repeat(6)}`.slice(0, 200);
    backup.sections.settings.data.settings.companyName = `Invented Blending Works, ${'Plant Three, Industrial Estate Road, '.repeat(5)}`.slice(0, 200);
    await page.getByLabel(/^Import a backup/).setInputFiles({ name: 'long.json', mimeType: 'application/json', buffer: Buffer.from(JSON.stringify(backup)) });
    await page.getByRole('button', { name: 'Replace everything with this backup' }).click();
    await page.getByText(/^Restored long\.json/).waitFor();
    // The restored work is saved a moment later: leave the page only then.
    const restored = async () => [
      ((await stored(page, 'library')) as { state: Backup['sections']['library']['data'] } | undefined)?.state.components.some((c) => c.code === code),
      ((await stored(page, 'recipes')) as { state: Backup['sections']['recipes']['data'] } | undefined)?.state.recipes.find((r) => r.id === 'demo-vg320')?.name.startsWith('Gear oil VG 320 for enclosed'),
      ((await stored(page, 'settings')) as { state: Backup['sections']['settings']['data'] } | undefined)?.state.settings.companyName.startsWith('Invented Blending Works, Plant Three'),
    ];
    await expect.poll(restored).toEqual([true, true, true]);

    const codes = await openSheet(page, 'demo-vg320');
    expect(codes.map((c) => c.replace(/\s/g, ''))).toContain(code);
    await page.getByLabel('Batch / lot no.').fill('L-2025-0142-A-LOT-NUMBER-WITHOUT-ANY-SPACE-0000000000');
    await page.getByLabel('Vessel', { exact: true }).fill('Kettle-3-by-the-north-wall-next-to-the-pump-house');
    const pdf = await printPdf(page, 'blend-sheet-long-fields');
    toPng(pdf, 'blend-sheet-long-fields');
    // One page: the sign-off does not stand alone on a second page with nothing to say which batch it is.
    expect(pdfPages(pdf)).toBe(1);
    // Every word inside the page (A4 = 595.92 × 842.88 pt; pdftotext -bbox gives each word's box).
    const boxes = execFileSync('pdftotext', ['-bbox', pdf, '-'], { encoding: 'utf8' });
    const words = [...boxes.matchAll(/<word xMin="([\d.]+)" yMin="([\d.]+)" xMax="([\d.]+)" yMax="([\d.]+)">/g)].map((m) => m.slice(1).map(Number));
    expect(words.length).toBeGreaterThan(100);
    expect(words.filter(([x0, y0, x1, y1]) => x0! < 0 || y0! < 0 || x1! > 595.92 || y1! > 842.88)).toEqual([]);
    const text = pdfText(pdf).replace(/\s+/g, '');
    expect(text).toContain(code);
    expect(text).toContain('Laboratoryconfirmationofeveryreleasepropertyisrequired');
    expect(s.errors).toEqual([]);
  });

  it('prints a 200-character stock name without a space and 120-character lot and vessel inside the page, every quantity column kept, A4 and US Letter (s23 defect hunt)', async () => {
    const { page } = s;
    await page.goto(`${inject('baseURL')}#/settings`);
    await page.getByRole('heading', { name: 'Settings' }).waitFor();
    const download = page.waitForEvent('download');
    await page.getByRole('button', { name: 'Export everything (backup file)' }).click();
    type Backup = { sections: { library: { data: { components: { id: string; code: string; name: string }[] } } } };
    const backup = JSON.parse(readFileSync((await (await download).path())!, 'utf8')) as Backup;
    const stock = (id: string) => backup.sections.library.data.components.find((c) => c.id === id)!;
    // The demo's short codes (a case above gives BW-190 a 40-character code, which wraps in its column).
    stock('demo-bw-190').code = 'BW-190';
    // The longest name the field rules allow, with no space to break at (invented text).
    const name = 'Heavyneutralbasestockofaninventedrefinery'.repeat(5).slice(0, 200);
    stock('demo-bw-160').name = name;
    await page.getByLabel(/^Import a backup/).setInputFiles({ name: 'unbroken.json', mimeType: 'application/json', buffer: Buffer.from(JSON.stringify(backup)) });
    await page.getByRole('button', { name: 'Replace everything with this backup' }).click();
    await page.getByText(/^Restored unbroken\.json/).waitFor();
    type Lib = { state: { components: { code: string; name: string }[] } } | undefined;
    await expect.poll(async () => ((await stored(page, 'library')) as Lib)?.state.components.find((c) => c.code === 'BW-160')?.name).toBe(name);

    const codes = await openSheet(page, 'demo-vg460');
    await page.getByLabel('Batch / lot no.').fill(`L${'7'.repeat(119)}`);
    await page.getByLabel('Vessel', { exact: true }).fill(`K${'3'.repeat(119)}`);
    await page.getByLabel('Batch size', { exact: true }).fill('5000');
    await page.getByText(/^5,?\u202f?000\.0 kg/).first().waitFor();
    for (const [paper, format, width, height] of [
      ['a4', 'A4', 595.92, 842.88], // A4 = 210 × 297 mm (ISO 216)
      ['letter', 'Letter', 612, 792], // US Letter = 8.5 × 11 in = 612 × 792 pt (definition)
    ] as const) {
      await page.getByLabel('Paper').selectOption(paper);
      const pdf = await printPdf(page, `blend-sheet-unbroken-name-${paper}`, format);
      toPng(pdf, `blend-sheet-unbroken-name-${paper}`);
      const boxes = execFileSync('pdftotext', ['-bbox', pdf, '-'], { encoding: 'utf8' });
      const words = [...boxes.matchAll(/<word xMin="([\d.]+)" yMin="([\d.]+)" xMax="([\d.]+)" yMax="([\d.]+)">/g)].map((m) => m.slice(1).map(Number));
      expect(words.length).toBeGreaterThan(100);
      expect(words.filter(([x0, y0, x1, y1]) => x0! < 0 || y0! < 0 || x1! > width || y1! > height)).toEqual([]);
      // Every quantity column is printed: the kg sum to the 5000.0 kg batch (largest remainder; common practice (no source)).
      const rows = componentRows(pdfText(pdf), codes);
      expect(Math.round(rows.reduce((a, r) => a + r.kg, 0) * 10)).toBe(50000);
      expect(rows.at(-1)!.running).toBe(5000);
      // The name wraps inside its column (pdftotext's layout interleaves it with the columns beside it).
      expect(pdfText(pdf)).toContain(name.slice(0, 20));
    }
    expect(s.errors).toEqual([]);
  });

  it('prints temperatures in °F when the settings say so, with the unit', async () => {
    const { page } = s;
    await page.goto(`${inject('baseURL')}#/settings`);
    await page.getByRole('heading', { name: 'Settings' }).waitFor();
    await page.getByLabel('Temperatures in').selectOption('F');
    // Within the app (no reload), so the setting need not be saved first.
    await page.getByRole('link', { name: /Blend sheet/ }).click();
    await page.getByRole('combobox', { name: /^Recipe/ }).selectOption('demo-vg680');
    // t_F = 9/5·t_C + 32 (common practice, no source): heat to 50–65 °C → 122–149 °F.
    await page.getByText(/^Heat to 122–149 °F with agitation/).waitFor();
    const qc = page.getByRole('table', { name: /Predicted properties and QC release/ });
    await expect.poll(() => qc.getByRole('row', { name: /Flash point/ }).textContent()).toMatch(/°F/);
    await expect.poll(() => qc.getByRole('row', { name: /Pour point/ }).textContent()).toMatch(/°F/);
    await expect.poll(() => qc.getByRole('row', { name: /Viscosity at \d+ °F \(calculated\)/ }).count()).toBe(1);
    await screenshot(page, 'blend-sheet-vg680-fahrenheit');
    const pdf = await printPdf(page, 'blend-sheet-vg680-fahrenheit');
    toPng(pdf, 'blend-sheet-vg680-fahrenheit');
    expect(pdfPages(pdf)).toBe(1);
    expect(pdfText(pdf)).toMatch(/Heat to 122–149 °F/);
    await page.getByRole('link', { name: /Settings/ }).click();
    await page.getByLabel('Temperatures in').selectOption('C');
    expect(s.errors).toEqual([]);
    expect(s.offHost).toEqual([]);
  });
});

describe('blend sheet past one page (s20 defect 3)', () => {
  let s: Session;
  beforeAll(async () => {
    s = await launch();
  });
  afterAll(async () => {
    await s?.close();
  });

  it('every printed page carries the product, grade, lot / batch and "Page n of m"', async () => {
    const { page } = s;
    await openSheet(page, 'demo-vg460');
    await page.getByLabel('Batch / lot no.').fill('L-2026-0777');
    await page.getByLabel('Batch size', { exact: true }).fill('8000');
    // Very long instructions (invented steps) run the sheet past one page.
    await page.getByRole('button', { name: 'Edit instructions' }).click();
    const steps = Array.from({ length: 90 }, (_, i) => `Invented step ${i + 1}: check the vessel temperature and record it on the log.`).join('\n');
    await page.getByLabel('Instructions, one step per line').fill(steps);
    await page.getByRole('button', { name: 'Done editing' }).click();
    const pdf = await printPdf(page, 'blend-sheet-long-instructions');
    toPng(pdf, 'blend-sheet-long-instructions');
    const pages = pdfPages(pdf);
    expect(pages).toBeGreaterThanOrEqual(2);
    const name = (await page.getByRole('article', { name: 'Printable blend sheet' }).locator('.bs-fields dd').first().innerText()).trim();
    // pdftotext may drop the spaces of a justified line: compare without white space.
    const squash = (t: string) => t.replace(/\s+/g, '');
    for (let n = 1; n <= pages; n++) {
      const text = squash(execFileSync('pdftotext', ['-layout', '-f', String(n), '-l', String(n), pdf, '-'], { encoding: 'utf8' }));
      expect(text).toContain(squash(name));
      expect(text).toContain('ISOVG460');
      expect(text).toContain('L-2026-0777');
      expect(text).toMatch(/8\D?000\.0kg/);
      expect(text).toContain(`Page${n}of${pages}`);
    }
    expect(s.errors).toEqual([]);
  });
});
