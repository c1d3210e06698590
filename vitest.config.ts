import { defineConfig } from 'vitest/config';
import path from 'node:path';

export default defineConfig({
  resolve: {
    alias: {
      '@': path.resolve(import.meta.dirname),
      'server-only': path.resolve(import.meta.dirname, 'tests/fixtures/server-only.ts'),
    },
  },
  test: {
    // Playwright specs live in tests/e2e and are run by Playwright only.
    include: ['tests/unit/**/*.test.ts', 'tests/reference/**/*.test.ts', 'tests/routes/**/*.test.ts'],
    environment: 'node',
    testTimeout: 60_000,
    hookTimeout: 120_000,
    // Route tests share one PostgreSQL database; run test files one after another.
    fileParallelism: false,
  },
});
