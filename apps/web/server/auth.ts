import { hash, verify } from '@node-rs/argon2';
import { and, eq, sql } from '@reelwright/db';
import { users } from '@reelwright/db/schema';
import type { NextAuthOptions } from 'next-auth';
import type { JWT } from 'next-auth/jwt';
import CredentialsProvider from 'next-auth/providers/credentials';
import { cache } from 'react';
import { env } from '~/env';
import { ROLES, type Role } from '~/lib/permissions';
import { signInErrorMessage, throttledError, WRONG_CREDENTIALS } from '~/lib/sign-in-errors';
import { signInSchema } from '~/lib/validators/auth';
import { db } from './db';
import {
  accountKey,
  blockedFor,
  clientAddress,
  recordFailure,
  recordSuccess,
} from './sign-in-throttle';

/** The password every seeded demo account shares; refused for any account that is not demo data. */
export const DEMO_PASSWORD = 'reelwright-demo';

// Verifying against a throwaway hash when the e-mail is unknown keeps response times alike.
let decoyHash: Promise<string> | undefined;
const decoy = () => (decoyHash ??= hash('reelwright-decoy-password'));

export interface SessionUser {
  id: number;
  name: string;
  email: string;
  role: Role;
  shopId: number | null;
  regionId: number | null;
  sessionVersion: number;
}

export async function checkCredentials(input: unknown): Promise<SessionUser | null> {
  const parsed = signInSchema.safeParse(input);
  if (!parsed.success) return null;
  const { email, password } = parsed.data;
  const [user] = await (await db()).select().from(users).where(eq(users.email, email)).limit(1);
  // An invited person who has not chosen a password yet cannot sign in either.
  if (!user || !user.active || !user.passwordHash) {
    await verify(await decoy(), password).catch(() => false);
    return null;
  }
  const ok = await verify(user.passwordHash, password).catch(() => false);
  if (!ok) return null;
  if (password === DEMO_PASSWORD && !user.isDemo) return null;
  return {
    id: user.id,
    name: user.name,
    email: user.email,
    role: user.role,
    shopId: user.shopId,
    regionId: user.regionId,
    sessionVersion: user.sessionVersion,
  };
}

/** The user row a session names, read once per request (the jwt callback and getPrincipal share it). */
export const sessionUser = cache(async (id: number) => {
  const [user] = await (await db()).select().from(users).where(eq(users.id, id)).limit(1);
  return user ?? null;
});

/** A session is current while its user is active and still at the version it was issued with. */
export function isCurrent(
  user: { active: boolean; sessionVersion: number } | null,
  version: unknown,
): boolean {
  return !!user && user.active && user.sessionVersion === version;
}

/** Ends every session of the user issued at `version` (a stale session cannot end newer ones). */
export async function endSessions(userId: number, version: number): Promise<void> {
  await (
    await db()
  )
    .update(users)
    .set({ sessionVersion: sql`${users.sessionVersion} + 1` })
    .where(and(eq(users.id, userId), eq(users.sessionVersion, version)));
}

/** Thrown by the jwt callback for an ended session: next-auth then clears the cookie. */
export class SessionEndedError extends Error {
  override name = 'SessionEndedError';
  constructor() {
    super('The session has ended (signed out, or the account changed).');
  }
}

/**
 * The credentials check behind the throttle: a blocked account or address is refused before the
 * password is looked at; a failure counts whether or not the e-mail has an account.
 */
export async function authorizeSignIn(
  credentials: unknown,
  headers: Record<string, string | string[] | undefined> | undefined,
): Promise<SessionUser | null> {
  const email = accountKey((credentials as { email?: unknown } | undefined)?.email);
  const attempt = { email, address: clientAddress(headers) };
  const wait = await blockedFor(attempt);
  if (wait > 0) throw new Error(throttledError(wait));
  const user = await checkCredentials(credentials);
  if (!user) {
    const blocked = await recordFailure(attempt);
    if (blocked > 0) throw new Error(throttledError(blocked));
    return null;
  }
  await recordSuccess(user.email);
  return user;
}

const secureCookies = env.NEXTAUTH_URL?.startsWith('https://') ?? false;

export const authOptions: NextAuthOptions = {
  secret: env.NEXTAUTH_SECRET,
  session: { strategy: 'jwt', maxAge: 12 * 60 * 60 },
  // Secure (and __Secure-/__Host- prefixed) cookies whenever the public URL is https, also behind
  // a proxy that ends TLS and forwards plain http; httpOnly and SameSite=Lax are next-auth's defaults.
  useSecureCookies: secureCookies,
  pages: { signIn: '/sign-in', error: '/sign-in' },
  providers: [
    CredentialsProvider({
      name: 'Email and password',
      credentials: {
        email: { label: 'E-mail', type: 'email' },
        password: { label: 'Password', type: 'password' },
      },
      async authorize(credentials, req) {
        try {
          const user = await authorizeSignIn(credentials, req.headers);
          return user ? { ...user, id: String(user.id) } : null;
        } catch (error) {
          // The message reaches the sign-in page's URL: only the throttle's own text may pass.
          if (error instanceof Error && signInErrorMessage(error.message) !== WRONG_CREDENTIALS) {
            throw error;
          }
          console.error('[sign-in] failed', error);
          throw new Error('CredentialsSignin');
        }
      },
    }),
  ],
  events: {
    async signOut({ token }: { token: JWT | null }) {
      if (typeof token?.uid === 'number' && typeof token.sv === 'number') {
        await endSessions(token.uid, token.sv);
      }
    },
  },
  logger: {
    error(code, metadata) {
      // An ended session is the expected answer to a replayed cookie, not a server fault.
      if (metadata instanceof SessionEndedError) return;
      console.error(`[next-auth][error][${code}]`, metadata);
    },
    warn(code) {
      console.warn(`[next-auth][warn][${code}]`);
    },
    debug() {},
  },
  callbacks: {
    async jwt({ token, user }) {
      if (user) {
        const u = user as unknown as SessionUser & { id: string };
        token.uid = Number(u.id);
        token.sv = u.sessionVersion;
        token.role = u.role;
        token.shopId = u.shopId;
        token.regionId = u.regionId;
        return token;
      }
      // Every later use of the cookie (getServerSession, GET /api/auth/session) checks it is current.
      const uid = token.uid;
      if (typeof uid !== 'number' || !isCurrent(await sessionUser(uid), token.sv)) {
        throw new SessionEndedError();
      }
      return token;
    },
    session({ session, token }) {
      const role = ROLES.includes(token.role as Role) ? (token.role as Role) : undefined;
      if (session.user && typeof token.uid === 'number' && role) {
        Object.assign(session.user, {
          id: token.uid,
          role,
          shopId: (token.shopId as number | null) ?? null,
          regionId: (token.regionId as number | null) ?? null,
          sessionVersion: token.sv,
        });
      }
      return session;
    },
  },
};
