import { defineConfig } from 'vitest/config';
import react from '@vitejs/plugin-react';
import { compileHints } from './scripts/compile-hints';

// Blendbench runs fully offline: no CDN, no web fonts, no runtime requests.
export default defineConfig({
  // The opening screen's chunks are compiled off the main thread (scripts/compile-hints.ts).
  plugins: [react(), compileHints(/[\\/]features[\\/]library[\\/]LibraryScreen\.tsx$/)],
  base: './',
  worker: { format: 'es' },
  build: { target: 'es2022', sourcemap: false, chunkSizeWarningLimit: 900 },
  test: {
    include: ['tests/**/*.test.ts', 'tests/**/*.test.tsx'],
    exclude: ['tests/e2e/**', 'node_modules/**'],
    environment: 'node',
    setupFiles: ['tests/setup/fast-check-seed.ts'],
    testTimeout: 60_000,
  },
});
