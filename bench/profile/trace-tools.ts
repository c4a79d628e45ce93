/**
 * Shared by the diagnostic trace scripts in bench/profile: medians printed as a table, and a V8 CPU
 * profile's self and inclusive time per function, mapped to the source through the build's source maps.
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { SourceMapConsumer } from 'source-map-js';
import { median as benchMedian } from '../first-render.bench';

export const median = (xs: number[]): number => (xs.length === 0 ? 0 : benchMedian(xs));

/** A URL without its origin, and an asset without its folder. */
export function short(url: string | undefined): string {
  if (!url) return '';
  return url.replace(/^.*\/assets\//, '').replace(/^https?:\/\/[^/]+\//, '/');
}

/** Prints, largest first, the median of each key over `runs` (keys under `min` left out). */
export function printMedians(title: string, runs: Map<string, number>[], min = 0.5, digits = 1): void {
  const keys = new Set(runs.flatMap((r) => [...r.keys()]));
  const rows = [...keys].map((k) => [k, median(runs.map((r) => r.get(k) ?? 0))] as const).filter(([, v]) => v >= min);
  rows.sort((a, b) => b[1] - a[1]);
  console.log(`\n== ${title} (median of ${runs.length}, ms) ==`);
  for (const [k, v] of rows) console.log(`${v.toFixed(digits).padStart(7)}  ${k}`);
}

interface ProfileNode {
  id: number;
  callFrame: { functionName: string; url: string; lineNumber: number; columnNumber: number };
  children?: number[];
}

/** A V8 CPU profile as `Profiler.stop` returns it. */
export interface CpuProfile {
  nodes: ProfileNode[];
  samples: number[];
  timeDeltas: number[];
}

/**
 * Self time per source file and per function, and inclusive time per function (counted once per
 * stack) [ms], with the built app's frames mapped to their sources through `dir/assets/*.map`.
 * `maps` caches the parsed source maps between calls; `scale` divides every time (e.g. per edit).
 */
export function profileTimes(
  profile: CpuProfile,
  dir: string,
  maps: Map<string, SourceMapConsumer | null>,
  scale = 1,
): { byFile: Map<string, number>; byFn: Map<string, number>; incl: Map<string, number> } {
  const nodes = new Map(profile.nodes.map((n) => [n.id, n]));
  const selfUs = new Map<number, number>();
  profile.samples.forEach((id, i) => selfUs.set(id, (selfUs.get(id) ?? 0) + (profile.timeDeltas[i + 1] ?? 0)));
  const parent = new Map<number, number>();
  for (const n of profile.nodes) for (const c of n.children ?? []) parent.set(c, n.id);
  const resolve = (cf: ProfileNode['callFrame']): { file: string; fn: string } => {
    let file = cf.url ? short(cf.url) : `(${cf.functionName || 'program'})`;
    let fn = cf.functionName || '(anonymous)';
    if (cf.url.includes('/assets/')) {
      const asset = cf.url.replace(/^.*\/assets\//, '');
      if (!maps.has(asset)) {
        const p = join(dir, 'assets', `${asset}.map`);
        maps.set(asset, existsSync(p) ? new SourceMapConsumer(JSON.parse(readFileSync(p, 'utf8'))) : null);
      }
      const m = maps.get(asset);
      if (m) {
        const pos = m.originalPositionFor({ line: cf.lineNumber + 1, column: cf.columnNumber });
        if (pos.source) {
          file = pos.source.replace(/^.*node_modules\//, 'nm:').replace(/^(\.\.\/)+/, '');
          fn = `${pos.name ?? fn} ${file}:${pos.line}`;
        }
      }
    }
    return { file, fn };
  };
  const nameOf = new Map<number, string>();
  for (const n of profile.nodes) nameOf.set(n.id, resolve(n.callFrame).fn);
  const incl = new Map<string, number>();
  const byFile = new Map<string, number>();
  const byFn = new Map<string, number>();
  for (const [id, us] of selfUs) {
    const ms = us / 1000 / scale;
    const seen = new Set<string>();
    for (let a: number | undefined = id; a !== undefined; a = parent.get(a)) {
      const f = nameOf.get(a)!;
      if (seen.has(f)) continue;
      seen.add(f);
      incl.set(f, (incl.get(f) ?? 0) + ms);
    }
    const { file, fn } = resolve(nodes.get(id)!.callFrame);
    byFile.set(file, (byFile.get(file) ?? 0) + ms);
    byFn.set(fn, (byFn.get(fn) ?? 0) + ms);
  }
  return { byFile, byFn, incl };
}
