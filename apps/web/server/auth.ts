import { hash, verify } from '@node-rs/argon2';
import { eq } from '@reelwright/db';
import { users } from '@reelwright/db/schema';
import type { NextAuthOptions } from 'next-auth';
import CredentialsProvider from 'next-auth/providers/credentials';
import { env } from '~/env';
import { ROLES, type Role } from '~/lib/permissions';
import { signInSchema } from '~/lib/validators/auth';
import { db } from './db';

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
}

export async function checkCredentials(input: unknown): Promise<SessionUser | null> {
  const parsed = signInSchema.safeParse(input);
  if (!parsed.success) return null;
  const { email, password } = parsed.data;
  const [user] = await (await db()).select().from(users).where(eq(users.email, email)).limit(1);
  if (!user || !user.active) {
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
  };
}

export const authOptions: NextAuthOptions = {
  secret: env.NEXTAUTH_SECRET,
  session: { strategy: 'jwt', maxAge: 12 * 60 * 60 },
  pages: { signIn: '/sign-in', error: '/sign-in' },
  providers: [
    CredentialsProvider({
      name: 'Email and password',
      credentials: {
        email: { label: 'E-mail', type: 'email' },
        password: { label: 'Password', type: 'password' },
      },
      async authorize(credentials) {
        const user = await checkCredentials(credentials);
        return user ? { ...user, id: String(user.id) } : null;
      },
    }),
  ],
  callbacks: {
    jwt({ token, user }) {
      if (user) {
        const u = user as unknown as SessionUser & { id: string };
        token.uid = Number(u.id);
        token.role = u.role;
        token.shopId = u.shopId;
        token.regionId = u.regionId;
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
        });
      }
      return session;
    },
  },
};
