import { defineConfig } from 'vitest/config';
import react from '@vitejs/plugin-react';
import { compileHints, openingPreloads } from './scripts/compile-hints';

const OPENING_SCREEN = /[\\/]features[\\/]library[\\/]LibraryScreen\.tsx$/;
// The addresses that open it: the bare page and #/library (src/app/screens.ts).
const OPENING_IDS = ['', 'library'];

// Blendbench runs fully offline: no CDN, no web fonts, no runtime requests.
export default defineConfig({
  // The opening screen's chunks are compiled off the main thread (scripts/compile-hints.ts).
  // When the page opens on that screen, a small script of the page links them as modulepreload.
  plugins: [react(), compileHints(OPENING_SCREEN), openingPreloads(OPENING_SCREEN, OPENING_IDS)],
  base: './',
  worker: { format: 'es' },
  build: { target: 'es2022', sourcemap: false, chunkSizeWarningLimit: 900 },
  test: {
    include: ['tests/**/*.test.ts', 'tests/**/*.test.tsx'],
    exclude: ['tests/e2e/**', 'node_modules/**'],
    environment: 'node',
    setupFiles: ['tests/setup/fast-check-seed.ts'],
    testTimeout: 60_000,
    // A hook's work is a test's work (loading mathjs for °F conversions took over vitest's default 10 s
    // at load 15 on two cores); it waits for the load to finish either way, this only bounds it alike.
    hookTimeout: 60_000,
  },
});
