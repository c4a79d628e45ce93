import { defineConfig } from 'vitest/config';

// End-to-end tests: build once, serve with `vite preview` on 127.0.0.1, drive Debian's chromium.
export default defineConfig({
  test: {
    include: ['tests/e2e/**/*.e2e.test.ts'],
    environment: 'node',
    testTimeout: 120_000,
    hookTimeout: 180_000,
    fileParallelism: false,
    // expect.poll waits for what the app does asynchronously (a save, a debounced draft, another tab's
    // merge): 1 s (vitest's default) is too short on a loaded 2-core machine. A poll that is met ends at once.
    expect: { poll: { timeout: 20_000, interval: 100 } },
    globalSetup: ['tests/e2e/global-setup.ts'],
  },
});
