import { describe, expect, it } from 'vitest';
import { chunksCalledOnLoad, openingPreloadTags, type ChunkInfo } from '../../scripts/compile-hints';

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

describe('openingPreloadTags', () => {
  it('links the opening screen and its chunks that the page does not load already, and nothing else', () => {
    const chunks = [
      chunk('assets/index.js', ['assets/runtime.js'], '/app/index.html', true),
      chunk('assets/runtime.js'),
      chunk('assets/LibraryScreen.js', ['assets/fields.js', 'assets/runtime.js'], '/app/src/features/library/LibraryScreen.tsx'),
      chunk('assets/fields.js'),
      chunk('assets/DesignerScreen.js', ['assets/charts.js'], '/app/src/features/designer/DesignerScreen.tsx'),
      chunk('assets/charts.js'),
    ];
    const html = '<script type="module" crossorigin src="./assets/index.js"></script>\n<link rel="modulepreload" crossorigin href="./assets/runtime.js">';
    expect(openingPreloadTags(html, chunks, OPENING, './').map((t) => t.attrs)).toEqual([
      { rel: 'modulepreload', crossorigin: true, href: './assets/LibraryScreen.js' },
      { rel: 'modulepreload', crossorigin: true, href: './assets/fields.js' },
    ]);
  });
});
