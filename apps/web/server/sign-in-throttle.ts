import { desc, eq, type Db } from '@reelwright/db';
import { activityLog } from '@reelwright/db/schema';
import { pgStyleClient } from '@reelwright/db/sql-client';
import { RateLimiterPostgres } from 'rate-limiter-flexible';
import { env } from '~/env';
import { db } from './db';

/**
 * Failed sign-ins allowed per window before a block, and the blocks that follow. A block lasts
 * FIRST_BLOCK, then doubles for each further block of the same key within LOCKOUT_MEMORY, up to
 * MAX_BLOCK; a successful sign-in forgets the account's failures and blocks.
 */
export const SIGN_IN_LIMITS = {
  account: { failures: 5, windowSeconds: 15 * 60 },
  address: { failures: 20, windowSeconds: 15 * 60 },
  firstBlockSeconds: 15 * 60,
  maxBlockSeconds: 24 * 60 * 60,
  lockoutMemorySeconds: 24 * 60 * 60,
} as const;

type Kind = 'account' | 'address';

interface Limiters {
  failures: Record<Kind, RateLimiterPostgres>;
  lockouts: Record<Kind, RateLimiterPostgres>;
}

// The counters live in the database (table sign_in_throttle, created by migration 0004), so every
// instance of the app shares them.
const byDb = new WeakMap<Db, Limiters>();

function limiters(conn: Db): Limiters {
  const existing = byDb.get(conn);
  if (existing) return existing;
  const make = (keyPrefix: string, points: number, duration: number) =>
    new RateLimiterPostgres({
      storeClient: pgStyleClient(conn),
      storeType: 'client',
      tableName: 'sign_in_throttle',
      tableCreated: true,
      keyPrefix,
      points,
      duration,
    });
  const L = SIGN_IN_LIMITS;
  const made: Limiters = {
    failures: {
      account: make('signin_account', L.account.failures, L.account.windowSeconds),
      address: make('signin_address', L.address.failures, L.address.windowSeconds),
    },
    lockouts: {
      account: make('signin_account_lockouts', 1_000_000, L.lockoutMemorySeconds),
      address: make('signin_address_lockouts', 1_000_000, L.lockoutMemorySeconds),
    },
  };
  byDb.set(conn, made);
  return made;
}

/** The key of the account an attempt names: its e-mail as the sign-in form sends it, lower-cased. */
export function accountKey(email: unknown): string | null {
  if (typeof email !== 'string') return null;
  const key = email.trim().toLowerCase().slice(0, 200);
  return key || null;
}

/**
 * The caller's address. Route handlers see headers only; Next.js fills X-Forwarded-For with the
 * socket's address when the request has none. Behind TRUSTED_PROXY_HOPS proxies that each append
 * to it, the client is that many entries from the right; entries further left are the client's own
 * claims and never trusted.
 */
export function clientAddress(
  headers: Record<string, string | string[] | undefined> | undefined,
  trustedHops: number = env.TRUSTED_PROXY_HOPS,
): string {
  const raw = headers?.['x-forwarded-for'];
  const list = (Array.isArray(raw) ? raw.join(',') : (raw ?? ''))
    .split(',')
    .map((s) => s.trim())
    .filter(Boolean);
  if (list.length === 0) return 'unknown';
  const index = trustedHops > 0 ? Math.max(0, list.length - trustedHops) : list.length - 1;
  return list[index]!.slice(0, 100);
}

interface Attempt {
  email: string | null;
  address: string;
}

const keysOf = (attempt: Attempt): [Kind, string][] =>
  attempt.email
    ? [
        ['account', attempt.email],
        ['address', attempt.address],
      ]
    : [['address', attempt.address]];

/** Seconds the attempt must still wait (its account or its address is blocked), or 0. */
export async function blockedFor(attempt: Attempt): Promise<number> {
  const { failures } = limiters(await db());
  const waits = await Promise.all(
    keysOf(attempt).map(async ([kind, key]) => {
      const res = await failures[kind].get(key);
      const blocked = res && res.consumedPoints > SIGN_IN_LIMITS[kind].failures;
      return blocked ? Math.max(res.msBeforeNext, 0) / 1000 : 0;
    }),
  );
  return Math.max(0, ...waits);
}

/**
 * Counts a failed attempt against its account and its address, for unknown e-mails as for known
 * ones; returns the seconds of a block it started, or 0.
 */
export async function recordFailure(attempt: Attempt): Promise<number> {
  const conn = await db();
  const { failures, lockouts } = limiters(conn);
  const blocks = await Promise.all(
    keysOf(attempt).map(async ([kind, key]) => {
      const res = await failures[kind].penalty(key);
      // Exactly one request sees the count reach the limit: the upsert is atomic.
      if (res.consumedPoints !== SIGN_IN_LIMITS[kind].failures) return 0;
      const n = (await lockouts[kind].penalty(key)).consumedPoints;
      const seconds = Math.min(
        SIGN_IN_LIMITS.firstBlockSeconds * 2 ** (n - 1),
        SIGN_IN_LIMITS.maxBlockSeconds,
      );
      await failures[kind].block(key, seconds);
      await logLockout(conn, { kind, attempt, seconds, lockout: n });
      return seconds;
    }),
  );
  return Math.max(0, ...blocks);
}

/** A successful sign-in forgets the account's failures and past blocks (not the address's). */
export async function recordSuccess(email: string): Promise<void> {
  const { failures, lockouts } = limiters(await db());
  await Promise.all([failures.account.delete(email), lockouts.account.delete(email)]);
}

async function logLockout(
  conn: Db,
  entry: { kind: Kind; attempt: Attempt; seconds: number; lockout: number },
) {
  const { kind, attempt, seconds, lockout } = entry;
  const until = new Date(Date.now() + seconds * 1000);
  console.warn(
    `[sign-in] blocked ${kind} ${kind === 'account' ? attempt.email : attempt.address}` +
      ` for ${seconds} s (block ${lockout} in 24 h; e-mail ${attempt.email ?? '-'}, address ${attempt.address})`,
  );
  await conn.insert(activityLog).values({
    userId: null,
    action: 'sign_in.blocked',
    entityType: 'sign_in',
    after: {
      blocked: kind,
      email: attempt.email,
      address: attempt.address,
      seconds,
      until: until.toISOString(),
      lockout,
    },
  });
}

export interface SignInBlock {
  at: Date;
  blocked: Kind;
  email: string | null;
  address: string;
  seconds: number;
}

/** The latest sign-in blocks, newest first: the owner's view of the activity log's entries. */
export async function recentSignInBlocks(limit = 20): Promise<SignInBlock[]> {
  const rows = await (
    await db()
  )
    .select({ at: activityLog.at, after: activityLog.after })
    .from(activityLog)
    .where(eq(activityLog.action, 'sign_in.blocked'))
    .orderBy(desc(activityLog.at), desc(activityLog.id))
    .limit(limit);
  return rows.map(({ at, after }) => {
    const a = (after ?? {}) as Partial<SignInBlock>;
    return {
      at,
      blocked: a.blocked === 'address' ? 'address' : 'account',
      email: a.email ?? null,
      address: a.address ?? 'unknown',
      seconds: Number(a.seconds ?? 0),
    };
  });
}
