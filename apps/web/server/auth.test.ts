import { eq } from '@reelwright/db';
import { users } from '@reelwright/db/schema';
import type { JWT } from 'next-auth/jwt';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { authOptions, authorizeSignIn, SessionEndedError, type SessionUser } from './auth';
import { buildLead, nextAuth, PASSWORD, sessionCookie } from './testing/auth-support';
import { closeMemoryDb, openMemoryDb, testState } from './testing/memory-db';

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));

type Lead = Awaited<ReturnType<typeof buildLead>>;
let lead: Lead;
const db = () => testState.handle!.db;

beforeAll(async () => {
  await openMemoryDb();
  lead = await buildLead(db());
});
afterAll(closeMemoryDb);

const jwt = authOptions.callbacks!.jwt!;
const signOut = authOptions.events!.signOut!;
const headers = { 'x-forwarded-for': '198.51.100.7' };

/** Signs the lead in as next-auth does: authorize, then the jwt callback with the user. */
async function signIn(): Promise<JWT> {
  const user = (await authorizeSignIn({ email: lead.lead.email, password: PASSWORD }, headers))!;
  expect(user).not.toBeNull();
  const asAuthUser = { ...user, id: String(user.id) } as unknown as SessionUser & { id: string };
  return jwt({ token: {}, user: asAuthUser, account: null } as never) as Promise<JWT>;
}

/** What the cookie's next use does: resolves to the token while current, else rejects. */
const use = (token: JWT) => jwt({ token } as never);

const update = (values: Partial<typeof users.$inferInsert>) =>
  db().update(users).set(values).where(eq(users.id, lead.lead.id));

describe('sessions that end', () => {
  it('shop lead – the session works until they sign out, then the same cookie is refused', async () => {
    const token = await signIn();
    await expect(use(token)).resolves.toMatchObject({ uid: lead.lead.id });
    await signOut({ token } as never);
    await expect(use(token)).rejects.toBeInstanceOf(SessionEndedError);
    // Signing in again gives a session at the new version.
    const next = await signIn();
    await expect(use(next)).resolves.toMatchObject({ uid: lead.lead.id });
  });

  it('shop lead – signing out ends their other sessions too, and a stale cookie cannot end newer ones', async () => {
    const laptop = await signIn();
    const phone = await signIn();
    await signOut({ token: laptop } as never);
    await expect(use(phone)).rejects.toBeInstanceOf(SessionEndedError);
    const fresh = await signIn();
    await signOut({ token: laptop } as never);
    await expect(use(fresh)).resolves.toMatchObject({ uid: lead.lead.id });
  });

  it.each([
    ['a role change', { role: 'technician' as const }],
    ['a move to another shop', () => ({ shopId: lead.quay.id })],
    ['a password change', { passwordHash: 'x' }],
    ['deactivation', { active: false }],
  ])('owner – %s ends the person’s sessions', async (_, change) => {
    await update({
      role: 'shop_lead',
      shopId: lead.harbour.id,
      passwordHash: lead.lead.passwordHash,
      active: true,
    });
    const token = await signIn();
    await update(typeof change === 'function' ? change() : change);
    await expect(use(token)).rejects.toBeInstanceOf(SessionEndedError);
  });

  it('owner – renaming a person keeps their session', async () => {
    await update({
      role: 'shop_lead',
      shopId: lead.harbour.id,
      passwordHash: lead.lead.passwordHash,
      active: true,
    });
    const token = await signIn();
    await update({ name: 'Harbour Lead Renamed' });
    await expect(use(token)).resolves.toMatchObject({ uid: lead.lead.id });
  });

  it('a cookie issued before session versions existed is refused', async () => {
    const token = await signIn();
    delete token.sv;
    await expect(use(token)).rejects.toBeInstanceOf(SessionEndedError);
  });

  it('GET /api/auth/session with an ended session answers an empty session and clears the cookie', async () => {
    const token = await signIn();
    const cookies = { 'next-auth.session-token': await sessionCookie(token) };
    const live = await nextAuth(authOptions, { action: 'session', method: 'GET', cookies });
    expect(live.body).toMatchObject({ user: { id: lead.lead.id, role: 'shop_lead' } });
    expect(live.cookies?.find((c) => c.name === 'next-auth.session-token')?.value).toBeTruthy();

    await signOut({ token } as never);
    const replay = await nextAuth(authOptions, { action: 'session', method: 'GET', cookies });
    expect(replay.body).toEqual({});
    const cleared = replay.cookies?.filter((c) => c.name.startsWith('next-auth.session-token'));
    expect(cleared?.length).toBeGreaterThan(0);
    for (const c of cleared ?? []) {
      expect(c.value).toBe('');
      expect(c.options.maxAge).toBe(0);
    }
  });

  it('POST /api/auth/signout through next-auth bumps the version once', async () => {
    const token = await signIn();
    const before = (await db().select().from(users).where(eq(users.id, lead.lead.id)))[0]!;
    const csrf = await nextAuth(authOptions, { action: 'csrf', method: 'GET' });
    const csrfCookie = csrf.cookies!.find((c) => c.name === 'next-auth.csrf-token')!;
    const csrfToken = (csrf.body as { csrfToken: string }).csrfToken;
    const out = await nextAuth(authOptions, {
      action: 'signout',
      method: 'POST',
      cookies: {
        'next-auth.session-token': await sessionCookie(token),
        'next-auth.csrf-token': csrfCookie.value,
      },
      body: { csrfToken },
    });
    expect(out.cookies?.find((c) => c.name === 'next-auth.session-token')?.value).toBe('');
    const after = (await db().select().from(users).where(eq(users.id, lead.lead.id)))[0]!;
    expect(after.sessionVersion).toBe(before.sessionVersion + 1);
    await expect(use(token)).rejects.toBeInstanceOf(SessionEndedError);
  });
});
