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
  // Reverse proxies in front of the app that append the client's address to X-Forwarded-For
  // (0: none, the app is reached directly). The sign-in throttle counts failures per address.
  TRUSTED_PROXY_HOPS: z.coerce.number().int().min(0).max(10).default(0),
  // Object storage for photos. With S3_ENDPOINT set (the local fake, MinIO, …) requests go there
  // path-style; without it the AWS endpoint of S3_REGION is used with the given credentials.
  S3_ENDPOINT: z.url().optional(),
  S3_REGION: z.string().min(1).default('us-east-1'),
  S3_BUCKET: z.string().min(3).default('reelwright-photos'),
  S3_ACCESS_KEY_ID: z.string().min(1).optional(),
  S3_SECRET_ACCESS_KEY: z.string().min(1).optional(),
  // Outgoing mail: smtp:// or smtps:// with credentials in the URL; unset means mail stays queued.
  SMTP_URL: z
    .string()
    .regex(/^smtps?:\/\//, 'SMTP_URL must be an smtp:// or smtps:// URL')
    .optional(),
  MAIL_FROM: z.string().min(3).default('Reelwright <no-reply@reelwright.test>'),
  // The local SMTP catcher's HTTP side (scripts/fakes.ts); /dev/mail shows what it caught.
  MAIL_CATCHER_URL: z.url().optional(),
  // Royalty invoices. With STRIPE_API_BASE set (the local fake, scripts/fake-stripe.mjs) the SDK
  // talks to that server over plain HTTP; otherwise a real STRIPE_SECRET_KEY talks to Stripe.
  STRIPE_SECRET_KEY: z.string().min(8).optional(),
  STRIPE_WEBHOOK_SECRET: z.string().min(8).optional(),
  STRIPE_API_BASE: z.url().optional(),
  // Public address of the app for links in e-mail (unsubscribe); default NEXTAUTH_URL.
  APP_BASE_URL: z.url().optional(),
  // The app's clock at start-up, an ISO instant with its offset (server/clock.ts); unset: the
  // wall clock. The end-to-end tests set it to the seed's "today".
  REELWRIGHT_NOW: z.iso
    .datetime({ offset: true })
    .refine((v) => {
      const [y, m, d] = v.slice(0, 10).split('-').map(Number) as [number, number, number];
      return new Date(Date.UTC(y, m - 1, d)).getUTCDate() === d;
    }, 'REELWRIGHT_NOW must be a real calendar date')
    .optional(),
  // Tests: generated requests per route in the route fuzz tests (default 1,000 under CI, else 100).
  CI: z.string().optional(),
  FUZZ_RUNS: z.coerce.number().int().min(1).max(100_000).optional(),
});

const isBuild = process.env.NEXT_PHASE === 'phase-production-build';

function load() {
  const parsed = schema.safeParse({
    NODE_ENV: process.env.NODE_ENV,
    DATABASE_URL: process.env.DATABASE_URL || undefined,
    PGLITE_DATA_DIR: process.env.PGLITE_DATA_DIR || undefined,
    NEXTAUTH_SECRET: process.env.NEXTAUTH_SECRET || undefined,
    NEXTAUTH_URL: process.env.NEXTAUTH_URL || undefined,
    TRUSTED_PROXY_HOPS: process.env.TRUSTED_PROXY_HOPS || undefined,
    S3_ENDPOINT: process.env.S3_ENDPOINT || undefined,
    S3_REGION: process.env.S3_REGION || undefined,
    S3_BUCKET: process.env.S3_BUCKET || undefined,
    S3_ACCESS_KEY_ID: process.env.S3_ACCESS_KEY_ID || undefined,
    S3_SECRET_ACCESS_KEY: process.env.S3_SECRET_ACCESS_KEY || undefined,
    SMTP_URL: process.env.SMTP_URL || undefined,
    MAIL_FROM: process.env.MAIL_FROM || undefined,
    MAIL_CATCHER_URL: process.env.MAIL_CATCHER_URL || undefined,
    STRIPE_SECRET_KEY: process.env.STRIPE_SECRET_KEY || undefined,
    STRIPE_WEBHOOK_SECRET: process.env.STRIPE_WEBHOOK_SECRET || undefined,
    STRIPE_API_BASE: process.env.STRIPE_API_BASE || undefined,
    APP_BASE_URL: process.env.APP_BASE_URL || undefined,
    REELWRIGHT_NOW: process.env.REELWRIGHT_NOW || undefined,
    CI: process.env.CI || undefined,
    FUZZ_RUNS: process.env.FUZZ_RUNS || undefined,
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
