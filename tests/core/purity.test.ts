/**
 * Enforces that src/core is pure TypeScript domain code: it imports no UI, state or storage library,
 * and touches no DOM, storage, clock or randomness (team brief, "Code shape"; style note §1).
 * The check reads the source text of every file under src/core (comments and string contents removed
 * before looking for globals, so documentation may mention them).
 */
import { readFileSync, readdirSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { describe, expect, it } from 'vitest';

const CORE = join(__dirname, '..', '..', 'src', 'core');

function listTs(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name);
    if (statSync(p).isDirectory()) return listTs(p);
    return /\.(ts|tsx|mts|cts)$/.test(name) ? [p] : [];
  });
}

/**
 * Remove comments; with `blankStrings`, also blank the contents of string and template literals.
 * A small scanner, enough for this code base (no regex literals containing quotes or slashes pairs).
 */
function stripSource(src: string, blankStrings: boolean): string {
  let out = '';
  let i = 0;
  while (i < src.length) {
    const c = src[i]!;
    const n = src[i + 1];
    if (c === '/' && n === '/') {
      while (i < src.length && src[i] !== '\n') i++;
    } else if (c === '/' && n === '*') {
      i += 2;
      while (i < src.length && !(src[i] === '*' && src[i + 1] === '/')) i++;
      i += 2;
      out += ' ';
    } else if (c === '"' || c === "'" || c === '`') {
      out += c;
      i++;
      while (i < src.length && src[i] !== c) {
        if (src[i] === '\\') {
          if (!blankStrings) out += src[i]! + (src[i + 1] ?? '');
          i += 2;
          continue;
        }
        if (!blankStrings) out += src[i]!;
        i++;
      }
      out += c;
      i++;
    } else {
      out += c;
      i++;
    }
  }
  return out;
}

const FORBIDDEN_MODULES = /^(react|react-dom|zustand|idb-keyval|zundo|recharts|papaparse|fake-indexeddb)(\/.*)?$/;
/** Pure libraries the core may use; anything else must be added here deliberately. */
const ALLOWED_PACKAGES = new Set(['mathjs', 'yalps', 'zod']);

const FORBIDDEN_GLOBALS: [RegExp, string][] = [
  [/\bwindow\b/, 'window'],
  [/\bdocument\b/, 'document'],
  [/\blocalStorage\b/, 'localStorage'],
  [/\bsessionStorage\b/, 'sessionStorage'],
  [/\bindexedDB\b/, 'indexedDB'],
  [/\bnavigator\b/, 'navigator'],
  [/\bfetch\s*\(/, 'fetch('],
  [/\bXMLHttpRequest\b/, 'XMLHttpRequest'],
  [/\bDate\s*\.\s*now\b/, 'Date.now'],
  [/\bnew\s+Date\s*\(\s*\)/, 'new Date() (the clock)'],
  [/\bperformance\s*\.\s*now\b/, 'performance.now'],
  [/\bMath\s*\.\s*random\b/, 'Math.random'],
  [/\bcrypto\s*\.\s*(getRandomValues|randomUUID)\b/, 'crypto randomness'],
];

function importSpecifiers(code: string): string[] {
  const specs: string[] = [];
  const re = /\b(?:import|export)\b[^'"`;]*?\bfrom\s*['"]([^'"]+)['"]|\bimport\s*\(\s*['"]([^'"]+)['"]\s*\)|\bimport\s+['"]([^'"]+)['"]|\brequire\s*\(\s*['"]([^'"]+)['"]\s*\)/g;
  for (const m of code.matchAll(re)) specs.push((m[1] ?? m[2] ?? m[3] ?? m[4])!);
  return specs;
}

const files = listTs(CORE);

describe('src/core purity', () => {
  it('finds the core sources', () => {
    expect(files.length).toBeGreaterThan(10);
  });

  it('the scanner sees through comments and strings but not code', () => {
    const sample = "// window.x\n/* Date.now() */ const s = 'document'; import { a } from 'react';\nMath.random();";
    const code = stripSource(sample, true);
    expect(code).not.toMatch(/window|Date|document/);
    expect(code).toMatch(/Math\.random/);
    expect(importSpecifiers(stripSource(sample, false))).toEqual(['react']);
  });

  it.each(files.map((f) => [relative(CORE, f), f]))('%s imports no UI, state or storage library', (_rel, file) => {
    const code = stripSource(readFileSync(file, 'utf8'), false);
    for (const spec of importSpecifiers(code)) {
      if (spec.startsWith('.')) continue;
      expect(FORBIDDEN_MODULES.test(spec), `${_rel} imports '${spec}'`).toBe(false);
      const pkg = spec.startsWith('@') ? spec.split('/').slice(0, 2).join('/') : spec.split('/')[0]!;
      expect(ALLOWED_PACKAGES.has(pkg), `${_rel} imports '${spec}', not on the core's allow-list`).toBe(true);
    }
  });

  it.each(files.map((f) => [relative(CORE, f), f]))('%s uses no DOM, storage, clock or randomness', (_rel, file) => {
    const code = stripSource(readFileSync(file, 'utf8'), true);
    for (const [re, what] of FORBIDDEN_GLOBALS) {
      expect(re.test(code), `${_rel} uses ${what}`).toBe(false);
    }
  });
});
