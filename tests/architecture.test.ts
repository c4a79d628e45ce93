/**
 * The shape of the code (team brief, "Shape of the code"): imports flow core → state → features → app,
 * features do not import each other, and no module imports itself through a circle of others.
 * Reads the import lines of every source file under src/ (type-only imports included: a circle of
 * types is still a circle a reader has to untangle).
 */
import { readFileSync, readdirSync, statSync, existsSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';

const SRC = resolve(__dirname, '..', 'src');

function listTs(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name);
    if (statSync(p).isDirectory()) return listTs(p);
    return /\.(ts|tsx)$/.test(name) ? [p] : [];
  });
}

const IMPORT_RE = /^\s*(?:import|export)\b[^'"`;]*?\bfrom\s*['"](\.[^'"]+)['"]|\bimport\s*\(\s*['"](\.[^'"]+)['"]\s*\)|new URL\(\s*['"](\.[^'"]+)['"]/gm;

function resolveImport(from: string, spec: string): string | null {
  const base = resolve(dirname(from), spec);
  for (const cand of [base, `${base}.ts`, `${base}.tsx`, join(base, 'index.ts'), join(base, 'index.tsx')]) {
    if (existsSync(cand) && statSync(cand).isFile()) return cand;
  }
  return null;
}

const files = listTs(SRC);
const graph = new Map<string, string[]>(
  files.map((f) => {
    const code = readFileSync(f, 'utf8');
    const targets: string[] = [];
    for (const m of code.matchAll(IMPORT_RE)) {
      const spec = (m[1] ?? m[2] ?? m[3])!;
      const t = resolveImport(f, spec);
      if (t && /\.(ts|tsx)$/.test(t)) targets.push(t);
    }
    return [f, targets];
  }),
);

/** Layer of a file: 'core' | 'state' | 'components' | 'features/<name>' | 'app' | 'entry'. */
function layerOf(file: string): string {
  const parts = relative(SRC, file).split(/[\\/]/);
  if (parts[0] === 'features') return `features/${parts[1]}`;
  if (parts.length === 1) return 'entry';
  return parts[0]!;
}

/** Which layers each layer may import (besides itself). */
function allowed(from: string, to: string): boolean {
  if (from === to) return true;
  const rank: Record<string, number> = { core: 0, state: 1, components: 2, features: 3, app: 4, entry: 5 };
  const rf = rank[from.split('/')[0]!]!;
  const rt = rank[to.split('/')[0]!]!;
  if (from.startsWith('features/') && to.startsWith('features/')) return false;
  return rt < rf;
}

describe('architecture', () => {
  it('finds the sources', () => {
    expect(files.length).toBeGreaterThan(50);
  });

  it('imports flow core → state → components → features → app, and features do not import each other', () => {
    const wrong: string[] = [];
    for (const [f, targets] of graph) {
      for (const t of targets) {
        if (!allowed(layerOf(f), layerOf(t))) wrong.push(`${relative(SRC, f)} → ${relative(SRC, t)}`);
      }
    }
    expect(wrong).toEqual([]);
  });

  it('no module imports itself through a circle of others', () => {
    const state = new Map<string, 'open' | 'done'>();
    const circles: string[] = [];
    const stack: string[] = [];
    const visit = (f: string): void => {
      state.set(f, 'open');
      stack.push(f);
      for (const t of graph.get(f) ?? []) {
        if (state.get(t) === 'open') {
          circles.push(stack.slice(stack.indexOf(t)).concat(t).map((x) => relative(SRC, x)).join(' → '));
        } else if (!state.has(t)) visit(t);
      }
      stack.pop();
      state.set(f, 'done');
    };
    for (const f of files) if (!state.has(f)) visit(f);
    expect(circles).toEqual([]);
  });

  it('src/core is grouped by domain: no loose modules beside the index, errors and units', () => {
    const loose = readdirSync(join(SRC, 'core')).filter((n) => /\.ts$/.test(n));
    expect(loose.sort()).toEqual(['errors.ts', 'index.ts', 'units.ts']);
  });
});
