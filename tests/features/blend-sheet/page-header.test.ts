// The running head of every printed page of a blend sheet (s20 defect 3): product, grade, lot / batch
// and "Page n of m". Wording and escaping are common practice (no source); CSS string escapes per
// CSS Syntax Level 3 §4.3.5 (a backslash escapes a quote or a backslash).
import { describe, expect, it } from 'vitest';
import { cssString, longClass, NOT_PRINTED_HEAD, NOT_PRINTED_PAGE, pageHeadText, pageRule } from '../../../src/features/blend-sheet/page-header';

const head = { product: 'Gear oil VG 320 — trial (invented)', grade: 320, lot: 'L-2026-118', batch: '10 000 kg (11 312 L at 15 °C)' };

describe('blend sheet running head', () => {
  it('names the product, grade, lot and batch', () => {
    expect(pageHeadText(head)).toBe('Gear oil VG 320 — trial (invented) · ISO VG 320 · Batch / lot L-2026-118 · 10 000 kg (11 312 L at 15 °C)');
  });

  it('leaves a blank to fill in when no lot is given, as page 1 does', () => {
    expect(pageHeadText({ ...head, lot: '  ' })).toMatch(/Batch \/ lot ________/);
  });

  it('puts the head at the top left and "Page n of m" at the top right of every page, with the paper size', () => {
    const rule = pageRule('letter', head);
    expect(rule).toMatch(/^@page \{ size: letter portrait; margin: 8mm 10mm 6mm; /);
    expect(rule).toContain('@top-left { content: "Gear oil VG 320 — trial (invented) · ISO VG 320 · Batch / lot L-2026-118');
    expect(rule).toContain('@top-right { content: "Page " counter(page) " of " counter(pages);');
  });

  it('escapes quotes, backslashes and line breaks so a name cannot end the rule early', () => {
    expect(cssString('A "quoted" \\ name\nnext')).toBe('"A \\"quoted\\" \\\\ name next"');
    const rule = pageRule('a4', { ...head, product: 'X"; } body { display: none; } @page { x: "' });
    // Exactly one @page rule with its two boxes: the name stays inside its string.
    expect(rule.match(/(?<!\\)"/g)!.length % 2).toBe(0);
    expect(rule).toContain('content: "X\\"; } body { display: none; } @page { x: \\" · ISO VG 320');
  });

  it('shortens a very long product name with "…" (the full name is on page 1)', () => {
    const text = pageHeadText({ ...head, product: 'N'.repeat(200) });
    expect(text.startsWith(`${'N'.repeat(59)}… · ISO VG 320`)).toBe(true);
  });

  it('lets the head wrap to a second line rather than run into "Page n of m" (s24)', () => {
    expect(pageRule('a4', head)).toMatch(/@top-left \{[^}]*white-space: normal;/);
  });

  it('gives the page printed instead of a sheet under a refused entry a head without batch, lot or batch size (s24)', () => {
    const rule = pageRule('a4', head);
    const named = rule.slice(rule.indexOf(`@page ${NOT_PRINTED_PAGE} {`));
    // After the sheet's own rule: Chromium lets the later of two @page rules set a margin box.
    expect(rule.indexOf(`@page ${NOT_PRINTED_PAGE} {`)).toBeGreaterThan(rule.indexOf('@top-right'));
    expect(named).toContain(`@top-left { content: ${cssString(NOT_PRINTED_HEAD)};`);
    expect(named).toContain('@top-right { content: none; }');
    expect(named).not.toContain('L-2026-118');
    expect(named).not.toContain('10 000 kg');
  });

  it('marks a header value longer than its place as long (printed whole in a smaller size)', () => {
    expect(longClass('L-2026-118', 36)).toBeUndefined();
    expect(longClass('7'.repeat(37), 36)).toBe('bs-long');
    expect(longClass(`  ${'7'.repeat(36)}  `, 36)).toBeUndefined();
  });
});
