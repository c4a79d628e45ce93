/**
 * Bench: initial JavaScript of the production build, gzip-compressed (goal ≤ 300 kB).
 *
 * "Initial" = what the browser must fetch before the app can run: every script named in
 * dist/index.html (the entry, and the small script that preloads the opening screen's chunks when the
 * page opens on it) plus every `<link rel="modulepreload">` it lists (Vite emits one per statically
 * imported chunk). Lazily loaded screens and charts are not counted (the opening screen's are in
 * `bench/first-render.bench.ts`). Each file is gzip-compressed
 * with node:zlib at level 9 (what a static server would send) and the sizes are added.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { buildAppOnce } from './app-build';
import type { BenchLine } from './types';


/** Script files the page loads at start, as paths relative to the build folder. */
export function initialScripts(indexHtml: string): string[] {
  const files: string[] = [];
  const attr = (tag: string, name: string) => new RegExp(`\\s${name}\\s*=\\s*["']([^"']+)["']`, 'i').exec(tag)?.[1];
  for (const m of indexHtml.matchAll(/<script\b[^>]*>/gi)) {
    const tag = m[0];
    const src = attr(tag, 'src');
    if (src) files.push(src);
  }
  for (const m of indexHtml.matchAll(/<link\b[^>]*>/gi)) {
    const tag = m[0];
    if (attr(tag, 'rel')?.toLowerCase() === 'modulepreload') {
      const href = attr(tag, 'href');
      if (href) files.push(href);
    }
  }
  return [...new Set(files.map((f) => f.replace(/^\.?\//, '')))];
}

export async function run(): Promise<BenchLine[]> {
  const dir = buildAppOnce();
  const html = readFileSync(join(dir, 'index.html'), 'utf8');
  const files = initialScripts(html);
  if (files.length === 0) throw new Error('bundle bench: no entry script found in the built index.html');
  let raw = 0;
  let gz = 0;
  for (const f of files) {
    const buf = readFileSync(join(dir, f));
    raw += buf.length;
    gz += gzipSync(buf, { level: 9 }).length;
  }
  return [
    {
      name: 'initial JavaScript of the production build, gzip',
      measured: gz / 1000,
      unit: 'kB',
      op: '<=',
      goal: 300,
      note: `${files.length} file(s), ${(raw / 1000).toFixed(0)} kB uncompressed`,
    },
  ];
}
