import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { buildLead, nextAuth, sessionCookie } from './testing/auth-support';
import { closeMemoryDb, openMemoryDb, testState } from './testing/memory-db';

// The public URL is https, as behind a proxy that ends TLS: env.ts reads it when first imported.
vi.hoisted(() => vi.stubEnv('NEXTAUTH_URL', 'https://reelwright.example'));
vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));
const { authOptions } = await import('./auth');

let lead: Awaited<ReturnType<typeof buildLead>>['lead'];
beforeAll(async () => {
  await openMemoryDb();
  lead = (await buildLead(testState.handle!.db)).lead;
});
afterAll(closeMemoryDb);

// The app itself sees plain http from the proxy.
const proxied = { host: 'reelwright.example', 'x-forwarded-proto': 'http' };

describe('cookies with an https public URL', () => {
  it('the csrf cookie is __Host-, Secure, httpOnly and SameSite=Lax though the app sees http', async () => {
    const res = await nextAuth(authOptions, { action: 'csrf', method: 'GET', headers: proxied });
    const csrf = res.cookies?.find((c) => c.name.endsWith('next-auth.csrf-token'));
    expect(csrf?.name).toBe('__Host-next-auth.csrf-token');
    expect(csrf?.options).toMatchObject({
      secure: true,
      httpOnly: true,
      sameSite: 'lax',
      path: '/',
    });
  });

  it('the session cookie is __Secure-, Secure, httpOnly and SameSite=Lax', async () => {
    const token = { uid: lead.id, sv: lead.sessionVersion, role: lead.role };
    const res = await nextAuth(authOptions, {
      action: 'session',
      method: 'GET',
      headers: proxied,
      cookies: { '__Secure-next-auth.session-token': await sessionCookie(token) },
    });
    expect(res.body).toMatchObject({ user: { id: lead.id } });
    const session = res.cookies?.find((c) => c.name.endsWith('next-auth.session-token'));
    expect(session?.name).toBe('__Secure-next-auth.session-token');
    expect(session?.options).toMatchObject({ secure: true, httpOnly: true, sameSite: 'lax' });
  });

  it('a cookie without the __Secure- prefix is not read', async () => {
    const token = { uid: lead.id, sv: lead.sessionVersion, role: lead.role };
    const res = await nextAuth(authOptions, {
      action: 'session',
      method: 'GET',
      headers: proxied,
      cookies: { 'next-auth.session-token': await sessionCookie(token) },
    });
    expect(res.body).toEqual({});
  });
});
