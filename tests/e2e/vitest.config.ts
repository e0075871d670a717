import { defineConfig } from 'vitest/config';

// Browser tests: run by `npm test` after it has built the app and started a server (ROTALOOM_E2E_URL).
export default defineConfig({
  test: {
    include: ['tests/e2e/**/*.test.ts'],
    environment: 'node',
    testTimeout: 60_000,
    hookTimeout: 60_000,
    // One Chromium at a time: the machine has two cores and the server shares them.
    fileParallelism: false,
  },
});
