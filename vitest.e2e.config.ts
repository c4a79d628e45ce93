import { defineConfig } from 'vitest/config';

// End-to-end tests: build once, serve with `vite preview` on 127.0.0.1, drive Debian's chromium.
export default defineConfig({
  test: {
    include: ['tests/e2e/**/*.e2e.test.ts'],
    environment: 'node',
    testTimeout: 120_000,
    hookTimeout: 180_000,
    fileParallelism: false,
    globalSetup: ['tests/e2e/global-setup.ts'],
  },
});
