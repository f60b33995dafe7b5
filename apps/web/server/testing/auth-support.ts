import { hash } from '@node-rs/argon2';
import type { Db } from '@reelwright/db';
import { regions, shops, users } from '@reelwright/db/schema';
import { encode, type JWT } from 'next-auth/jwt';
import { createRequire } from 'node:module';
import path from 'node:path';
import { env } from '~/env';

// Shared by the session and sign-in throttle tests: one shop with a lead whose password is known,
// and next-auth's own request handler, to see what a browser would get back.

export const PASSWORD = 'a-long-test-password';

export async function buildLead(db: Db) {
  const [region] = await db.insert(regions).values({ name: 'Test Coast', code: 'tc' }).returning();
  const [harbour, quay] = await db
    .insert(shops)
    .values(
      ['Harbour', 'Quay'].map((name) => ({
        regionId: region!.id,
        name: `${name} Test Shop`,
        slug: name.toLowerCase(),
        timeZone: 'America/New_York',
        openingHours: {},
        labourRateCents: 6000,
        royaltyRateBp: 600,
      })),
    )
    .returning();
  const [lead] = await db
    .insert(users)
    .values({
      email: 'lead@harbour.test',
      name: 'Harbour Lead',
      passwordHash: await hash(PASSWORD),
      role: 'shop_lead',
      shopId: harbour!.id,
    })
    .returning();
  return { region: region!, harbour: harbour!, quay: quay!, lead: lead! };
}

export interface CoreResponse {
  status?: number;
  body?: unknown;
  redirect?: string;
  cookies?: { name: string; value: string; options: Record<string, unknown> }[];
}

interface CoreRequest {
  action: string;
  method: 'GET' | 'POST';
  providerId?: string;
  cookies?: Record<string, string>;
  headers?: Record<string, string>;
  body?: Record<string, unknown>;
  query?: Record<string, string>;
}

type AuthHandler = (params: { options: unknown; req: CoreRequest }) => Promise<CoreResponse>;

// next-auth 4 exports its framework-free handler only internally; it is what the route handler
// and getServerSession call, so the tests drive it directly.
const require = createRequire(import.meta.url);
const core = require(path.join(path.dirname(require.resolve('next-auth')), 'core/index.js')) as {
  AuthHandler: AuthHandler;
};

export function nextAuth(options: unknown, req: CoreRequest): Promise<CoreResponse> {
  return core.AuthHandler({
    options,
    req: { headers: { host: '127.0.0.1:3000' }, cookies: {}, body: {}, query: {}, ...req },
  });
}

export const sessionCookie = (token: JWT) =>
  encode({ token, secret: env.NEXTAUTH_SECRET, maxAge: 12 * 60 * 60 });
