// The running head of every printed page of a blend sheet (s20 defect 3): product, grade, lot / batch
// and "Page n of m". Wording and escaping are common practice (no source); CSS string escapes per
// CSS Syntax Level 3 §4.3.5 (a backslash escapes a quote or a backslash).
import { describe, expect, it } from 'vitest';
import { cssString, pageHeadText, pageRule } from '../../../src/features/blend-sheet/page-header';

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
    expect(rule).toMatch(/^@page \{ size: letter portrait; margin: 8mm 10mm; /);
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
    expect(text.startsWith(`${'N'.repeat(69)}… · ISO VG 320`)).toBe(true);
  });
});
