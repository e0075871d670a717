import { defineConfig } from 'vitest/config';
import { fileURLToPath } from 'node:url';
import path from 'node:path';

// Unit and API tests; the browser tests have their own config (tests/e2e/vitest.config.ts)
// because they need the built app and a running server.
export default defineConfig({
  resolve: { alias: { '@': path.dirname(fileURLToPath(import.meta.url)) } },
  test: {
    include: ['tests/**/*.test.ts'],
    exclude: ['tests/e2e/**', 'node_modules/**'],
    environment: 'node',
    testTimeout: 30_000,
    hookTimeout: 60_000,
    // Each API test file makes its own database on the throwaway server (tests/server/helpers/test-db.ts),
    // so files may run in parallel.
  },
});
