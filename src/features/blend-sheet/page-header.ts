/**
 * The running head of every printed page of a blend sheet (and of its correction sheet): product,
 * grade, lot / batch and "Page n of m", printed in the page margins through CSS page-margin boxes, so a
 * sheet that runs past one page (very long instructions) still names its batch on page 2 and after.
 */

/** Longest product name printed in the running head [characters]; the full name is on page 1. */
const HEAD_NAME_CHARS = 60;
/** Longest lot number printed in the running head [characters]. */
const HEAD_LOT_CHARS = 40;

/** A CSS string literal of `text`: quotes and backslashes escaped, control characters as spaces. */
export function cssString(text: string): string {
  return `"${text.replace(/\\/g, '\\\\').replace(/"/g, '\\"').replace(/[\u0000-\u001f\u007f]/g, ' ')}"`;
}

const clipped = (text: string, max: number) => (text.length > max ? `${text.slice(0, max - 1)}…` : text);

export interface PageHeadFields {
  product: string;
  grade: number;
  /** '' → not yet given (a blank to fill in, as on page 1). */
  lot: string;
  /** The batch as printed on page 1 (e.g. "10 000 kg (11 312 L at 15 °C)"); '' → none. */
  batch: string;
}

/** The page name of the notice printed instead of a sheet while a field holds a refused entry. */
export const NOT_PRINTED_PAGE = 'bs-not-printed';
/** The top margin of that page: no batch, lot or batch size (they may not be what the fields show). */
export const NOT_PRINTED_HEAD = 'Blend sheet not printed: a field holds an entry that was not saved';

/** The words of the running head, as printed at the top left of every page. */
export function pageHeadText(f: PageHeadFields): string {
  const parts = [clipped(f.product.trim() || 'Recipe without a name', HEAD_NAME_CHARS), `ISO VG ${f.grade}`, `Batch / lot ${f.lot.trim() ? clipped(f.lot.trim(), HEAD_LOT_CHARS) : '________'}`];
  if (f.batch) parts.push(f.batch);
  return parts.join(' · ');
}

/**
 * The sheet's @page rule: paper size and margins, the running head at the top of every page and
 * "Page n of m" at its right (CSS Paged Media page-margin boxes, `counter(page)` / `counter(pages)`).
 */
export function pageRule(paper: 'a4' | 'letter', head: PageHeadFields): string {
  const font = "font: 7pt 'Liberation Sans', Arial, Helvetica, sans-serif; color: #1b1b1b; vertical-align: bottom; padding-bottom: 1.5mm;";
  return (
    `@page { size: ${paper === 'a4' ? 'A4' : 'letter'} portrait; margin: 8mm 10mm 6mm; ` +
    // The head may take two lines (a long product, lot and a batch on a heel); it never runs into "Page n of m".
    `@top-left { content: ${cssString(pageHeadText(head))}; ${font} white-space: normal; overflow-wrap: anywhere; } ` +
    `@top-right { content: "Page " counter(page) " of " counter(pages); ${font} white-space: nowrap; } } ` +
    // The page that says nothing was printed (a field holds a refused entry; blend-sheet.css gives the
    // notice this page name) names no batch, lot or batch size: the head above would show the last saved
    // ones, not what the field shows. After the rule above: Chromium lets the later of two @page rules win.
    `@page ${NOT_PRINTED_PAGE} { @top-left { content: ${cssString(NOT_PRINTED_HEAD)}; ${font} } @top-right { content: none; } }`
  );
}

/**
 * The class of a printed header value that is long for its place on the sheet (`bs-long`: printed
 * whole in a smaller size, 8 pt or 9.5 pt for the company), or undefined. `room` is how many characters
 * the place holds on about two lines at the normal size.
 */
export function longClass(text: string, room: number): 'bs-long' | undefined {
  return text.trim().length > room ? 'bs-long' : undefined;
}
