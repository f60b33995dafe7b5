import { defineConfig } from 'drizzle-kit';

// Only `generate` is used: migrations are committed SQL, applied by src/client.ts at start-up.
export default defineConfig({
  dialect: 'postgresql',
  schema: './src/schema/index.ts',
  out: './drizzle',
  strict: true,
  verbose: true,
});
