import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

// Browser tests: node environment driving Debian's Chromium (playwright-core) against the BUILT
// app served by `vite preview` from globalSetup. One file at a time (one browser, two cores).
export default defineConfig({
  root: fileURLToPath(new URL('../..', import.meta.url)),
  test: {
    include: ['test/browser/**/*.test.ts'],
    environment: 'node',
    globalSetup: ['test/browser/globalSetup.ts'],
    fileParallelism: false,
    testTimeout: 90_000,
    hookTimeout: 90_000,
  },
});
