/**
 * Build step: mark the chunks the opening screen runs with V8's explicit compile hint, the magic
 * comment `//# allFunctionsCalledOnLoad` as a file's first line. Chromium (136 and later) then
 * compiles every function of such a file on the background thread that streams the script, instead
 * of lazily on the main thread the first time each function is called; other browsers read a comment.
 *
 * Marked: the entry chunk and every chunk it imports statically (React, the stores, the shell: all
 * run before the first paint), and the Stocks screen — the page's default opening screen — with its
 * static imports. Not marked: other screens, charts, workers, import/export and the unit library,
 * whose functions are mostly not called when they load (eager compilation would be wasted there).
 *
 * The same chunks are named in the page as `<link rel="modulepreload">` ({@link openingPreloads}):
 * the browser's preload scanner fetches them as the page is parsed, and the opening screen's dynamic
 * import finds its chunks linked already (no link elements made and inserted by script then).
 */
import type { Plugin } from 'vite';

export const COMPILE_HINT = '//# allFunctionsCalledOnLoad';

/** The parts of a built chunk the choice reads. */
export interface ChunkInfo {
  fileName: string;
  isEntry: boolean;
  facadeModuleId: string | null;
  imports: readonly string[];
}

/**
 * The file names of the chunks to mark: each entry chunk and each chunk whose facade module matches
 * `opening`, with the chunks they import statically (transitively).
 */
export function chunksCalledOnLoad(chunks: readonly ChunkInfo[], opening: RegExp): Set<string> {
  const byName = new Map(chunks.map((c) => [c.fileName, c]));
  const out = new Set<string>();
  const visit = (name: string) => {
    if (out.has(name)) return;
    const c = byName.get(name);
    if (!c) return;
    out.add(name);
    for (const i of c.imports) visit(i);
  };
  for (const c of chunks) if (c.isEntry || (c.facadeModuleId !== null && opening.test(c.facadeModuleId))) visit(c.fileName);
  return out;
}

/** The Vite plugin: prepends the hint to the chosen chunks (after every other plugin) and shifts their source maps by one line. */
export function compileHints(opening: RegExp): Plugin {
  return {
    name: 'blendbench-compile-hints',
    apply: 'build',
    generateBundle: {
      order: 'post',
      handler(_options, bundle) {
        const chunks = Object.values(bundle).flatMap((c) => (c.type === 'chunk' ? [c] : []));
        for (const name of chunksCalledOnLoad(chunks, opening)) {
          const c = bundle[name];
          if (c?.type !== 'chunk' || c.code.startsWith(COMPILE_HINT)) continue;
          c.code = `${COMPILE_HINT}\n${c.code}`;
          // One more line at the top: every mapping moves down one line.
          const map = bundle[`${name}.map`];
          if (map?.type === 'asset' && typeof map.source === 'string') {
            const m = JSON.parse(map.source) as { mappings: string };
            m.mappings = `;${m.mappings}`;
            map.source = JSON.stringify(m);
          }
        }
      },
    },
  };
}

/**
 * The `<link rel="modulepreload">` tags to add to the page: each chunk the opening screen runs
 * ({@link chunksCalledOnLoad}) that the page does not load already (the entry's script and the
 * modulepreload links the build writes for the entry's own imports). `base` is the build's base ('./').
 */
export function openingPreloadTags(html: string, chunks: readonly ChunkInfo[], opening: RegExp, base: string): { tag: 'link'; attrs: Record<string, string | boolean>; injectTo: 'head' }[] {
  const linked = (name: string) => html.includes(`"${base}${name}"`);
  return [...chunksCalledOnLoad(chunks, opening)]
    .filter((name) => name.endsWith('.js') && !linked(name))
    .sort()
    .map((name) => ({ tag: 'link', attrs: { rel: 'modulepreload', crossorigin: true, href: `${base}${name}` }, injectTo: 'head' }));
}

/** The Vite plugin: the opening screen's chunks linked as modulepreload in the built page. */
export function openingPreloads(opening: RegExp): Plugin {
  let base = './';
  return {
    name: 'blendbench-opening-preloads',
    apply: 'build',
    configResolved(config) {
      base = config.base;
    },
    transformIndexHtml: {
      order: 'post',
      handler(html, ctx) {
        if (!ctx.bundle) return html;
        const chunks = Object.values(ctx.bundle).flatMap((c) => (c.type === 'chunk' ? [c] : []));
        return { html, tags: openingPreloadTags(html, chunks, opening, base) };
      },
    },
  };
}
