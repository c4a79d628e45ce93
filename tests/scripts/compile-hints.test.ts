import { describe, expect, it } from 'vitest';
import { chunksCalledOnLoad, openingPreloadHrefs, openingPreloadScript, withOpeningPreloadScript, type ChunkInfo } from '../../scripts/compile-hints';

const chunk = (fileName: string, imports: string[] = [], facadeModuleId: string | null = null, isEntry = false): ChunkInfo => ({ fileName, isEntry, facadeModuleId, imports });
const OPENING = /[\\/]features[\\/]library[\\/]LibraryScreen\.tsx$/;

describe('chunksCalledOnLoad', () => {
  it('marks the entry and the opening screen with their static imports, and nothing else', () => {
    const chunks = [
      chunk('index.js', ['runtime.js', 'library.js'], '/app/index.html', true),
      chunk('runtime.js'),
      chunk('library.js', ['model.js']),
      chunk('model.js'),
      chunk('LibraryScreen.js', ['fields.js', 'model.js'], '/app/src/features/library/LibraryScreen.tsx'),
      chunk('fields.js'),
      chunk('DesignerScreen.js', ['charts.js', 'fields.js'], '/app/src/features/designer/DesignerScreen.tsx'),
      chunk('charts.js'),
    ];
    expect([...chunksCalledOnLoad(chunks, OPENING)].sort()).toEqual(['LibraryScreen.js', 'fields.js', 'index.js', 'library.js', 'model.js', 'runtime.js']);
  });

  it('follows an import circle once and ignores imports of files not in the bundle', () => {
    const chunks = [chunk('a.js', ['b.js', 'gone.js'], null, true), chunk('b.js', ['a.js'])];
    expect([...chunksCalledOnLoad(chunks, OPENING)].sort()).toEqual(['a.js', 'b.js']);
  });
});

describe('openingPreloadHrefs', () => {
  it('names the opening screen and its chunks that the page does not load already, and nothing else', () => {
    const chunks = [
      chunk('assets/index.js', ['assets/runtime.js'], '/app/index.html', true),
      chunk('assets/runtime.js'),
      chunk('assets/LibraryScreen.js', ['assets/fields.js', 'assets/runtime.js'], '/app/src/features/library/LibraryScreen.tsx'),
      chunk('assets/fields.js'),
      chunk('assets/DesignerScreen.js', ['assets/charts.js'], '/app/src/features/designer/DesignerScreen.tsx'),
      chunk('assets/charts.js'),
    ];
    const html = '<script type="module" crossorigin src="./assets/index.js"></script>\n<link rel="modulepreload" crossorigin href="./assets/runtime.js">';
    expect(openingPreloadHrefs(html, chunks, OPENING, './')).toEqual(['./assets/LibraryScreen.js', './assets/fields.js']);
  });
});

describe('openingPreloadScript', () => {
  /** Runs the generated script on a page opened at `hash`; returns the hrefs it linked as modulepreload. */
  function linked(hash: string): string[] {
    const links: { rel: string; href: string; crossOrigin: string | null }[] = [];
    const document = {
      createElement: () => ({ rel: '', href: '', crossOrigin: null }),
      head: { append: (l: (typeof links)[number]) => links.push(l) },
    };
    new Function('location', 'document', openingPreloadScript(['./assets/LibraryScreen.js', './assets/fields.js'], ['', 'library']))({ hash }, document);
    for (const l of links) {
      expect(l.rel).toBe('modulepreload');
      expect(l.crossOrigin).toBe('');
    }
    return links.map((l) => l.href);
  }

  it('links the opening screen\'s chunks when the page opens on it: the bare page, #/library, #library', () => {
    for (const hash of ['', '#', '#/', '#/library', '#library', '#/library?x=1']) expect(linked(hash), hash).toEqual(['./assets/LibraryScreen.js', './assets/fields.js']);
  });

  it('links nothing when the page opens on another screen', () => {
    for (const hash of ['#/designer', '#/settings', '#/blend-sheet/print', '#/libraryx']) expect(linked(hash), hash).toEqual([]);
  });
});

describe('withOpeningPreloadScript', () => {
  it('puts the script (async, a file of its own) before the entry\'s module script', () => {
    const html = '<head>\n    <title>t</title>\n    <script type="module" crossorigin src="./assets/index.js"></script>\n    <link rel="modulepreload" crossorigin href="./assets/runtime.js">\n  </head>';
    const out = withOpeningPreloadScript(html, './assets/opening-preloads-0.js');
    expect(out).toContain('<script async src="./assets/opening-preloads-0.js"></script>\n    <script type="module" crossorigin src="./assets/index.js"></script>');
    expect(out.match(/<script\b/g)).toHaveLength(2);
  });
});
