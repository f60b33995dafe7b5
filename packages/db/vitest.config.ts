import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['src/**/*.test.ts'],
    environment: 'node',
    // Separate processes: each test file owns its PGlite instances and lock files.
    pool: 'forks',
    testTimeout: 120_000,
    hookTimeout: 180_000,
  },
});
