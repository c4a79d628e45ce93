// axe-core in the built app: serious and critical violations only, described for a readable failure.
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import type { Page } from 'playwright-core';

// Evaluated through the DevTools protocol: `page.addScriptTag` would add an inline script, which
// the app's Content-Security-Policy (rightly) blocks.
const AXE_SOURCE = readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8');

interface AxeViolation {
  id: string;
  impact: string | null;
  help: string;
  nodes: { target: string[]; html: string; failureSummary?: string }[];
}

/** Serious and critical axe-core violations on the page as it is now (empty when none). */
export async function axeSerious(page: Page): Promise<string[]> {
  if (!(await page.evaluate(() => 'axe' in window))) await page.evaluate(AXE_SOURCE);
  const violations = (await page.evaluate(async () => {
    const axe = (window as unknown as { axe: { run: (ctx: unknown, opts: unknown) => Promise<{ violations: unknown[] }> } }).axe;
    return (await axe.run(document, { resultTypes: ['violations'] })).violations;
  })) as AxeViolation[];
  return violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map((v) => `${v.impact} ${v.id} (${v.help}): ${v.nodes.slice(0, 3).map((n) => `${n.html.slice(0, 160)} — ${n.failureSummary ?? ''}`).join(' | ')}`);
}
