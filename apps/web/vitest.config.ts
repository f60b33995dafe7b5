import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

export default defineConfig({
  resolve: { alias: { '~': fileURLToPath(new URL('./', import.meta.url)) } },
  test: {
    include: ['**/*.test.ts'],
    exclude: ['node_modules/**', '.next/**', '.next-*/**'],
    environment: 'node',
    // Query tests start in-memory PGlite databases and seed them: allow for a busy machine.
    testTimeout: 60_000,
    hookTimeout: 120_000,
  },
});
