import { defineConfig } from 'vitest/config';

export default defineConfig({
  // Property tests walk minute by minute through reference calendars: slow on a busy machine.
  test: { include: ['src/**/*.test.ts'], environment: 'node', testTimeout: 60_000 },
});
