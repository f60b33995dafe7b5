import { z } from 'zod';

// The one place that reads process.env: everything else imports `env`.
const schema = z.object({
  NODE_ENV: z.enum(['development', 'test', 'production']).default('development'),
  DATABASE_URL: z
    .string()
    .regex(/^postgres(ql)?:\/\//, 'DATABASE_URL must be a postgres:// URL')
    .optional(),
  PGLITE_DATA_DIR: z.string().min(1).optional(),
  NEXTAUTH_SECRET: z.string().min(16, 'NEXTAUTH_SECRET must be at least 16 characters').optional(),
  NEXTAUTH_URL: z.url().optional(),
});

const isBuild = process.env.NEXT_PHASE === 'phase-production-build';

function load() {
  const parsed = schema.safeParse({
    NODE_ENV: process.env.NODE_ENV,
    DATABASE_URL: process.env.DATABASE_URL || undefined,
    PGLITE_DATA_DIR: process.env.PGLITE_DATA_DIR || undefined,
    NEXTAUTH_SECRET: process.env.NEXTAUTH_SECRET || undefined,
    NEXTAUTH_URL: process.env.NEXTAUTH_URL || undefined,
  });
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`Reelwright: invalid environment\n${lines.join('\n')}`);
  }
  const value = parsed.data;
  if (value.NODE_ENV === 'production' && !isBuild && !value.NEXTAUTH_SECRET) {
    throw new Error(
      'Reelwright refuses to start in production without NEXTAUTH_SECRET: it signs every session. ' +
        'Set it to a long random string (for example `openssl rand -base64 32`); `npm run demo` writes one to apps/web/.env.demo.',
    );
  }
  return {
    ...value,
    // Development and tests get a fixed secret so sessions survive restarts; production never does.
    NEXTAUTH_SECRET: value.NEXTAUTH_SECRET ?? 'reelwright-development-only-secret',
  };
}

export const env = load();
