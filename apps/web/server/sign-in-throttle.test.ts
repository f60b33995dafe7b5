import { eq } from '@reelwright/db';
import { activityLog, signInThrottle } from '@reelwright/db/schema';
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it, vi } from 'vitest';
import { signInErrorMessage, WRONG_CREDENTIALS } from '~/lib/sign-in-errors';
import { authorizeSignIn } from './auth';
import { clientAddress, SIGN_IN_LIMITS } from './sign-in-throttle';
import { buildLead, PASSWORD } from './testing/auth-support';
import { closeMemoryDb, openMemoryDb, testState } from './testing/memory-db';

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));

let email: string;
const db = () => testState.handle!.db;
beforeAll(async () => {
  await openMemoryDb();
  email = (await buildLead(db())).lead.email;
});
afterAll(closeMemoryDb);
beforeEach(async () => {
  await db().delete(signInThrottle);
  await db().delete(activityLog);
});
afterEach(() => vi.useRealTimers());

let addressCounter = 0;
const freshAddress = () => `203.0.113.${++addressCounter}`;

/** One sign-in attempt: the message the sign-in page would show, or 'signed in'. */
async function attempt(who: string, password: string, address: string): Promise<string> {
  try {
    const user = await authorizeSignIn({ email: who, password }, { 'x-forwarded-for': address });
    return user ? 'signed in' : WRONG_CREDENTIALS;
  } catch (error) {
    return signInErrorMessage((error as Error).message) ?? 'no message';
  }
}

const blockedFor15 = 'Too many failed sign-ins. Wait 15 minutes, then try again.';

describe('sign-in throttle', () => {
  it('anyone – five wrong passwords block the account, and then the right one is refused too', async () => {
    const address = freshAddress();
    const answers = [];
    for (let i = 0; i < 6; i++) answers.push(await attempt(email, 'wrong', address));
    expect(answers).toEqual([...Array(4).fill(WRONG_CREDENTIALS), blockedFor15, blockedFor15]);
    expect(await attempt(email, PASSWORD, address)).toBe(blockedFor15);
    // From another address as well: the block is the account's.
    expect(await attempt(email, PASSWORD, freshAddress())).toBe(blockedFor15);
  });

  it('anyone – an unknown e-mail gets exactly the same answers', async () => {
    const address = freshAddress();
    const answers = [];
    for (let i = 0; i < 6; i++) {
      answers.push(await attempt('nobody@harbour.test', 'wrong', address));
    }
    expect(answers).toEqual([...Array(4).fill(WRONG_CREDENTIALS), blockedFor15, blockedFor15]);
  });

  it('shop lead – signing in forgets earlier failures', async () => {
    const address = freshAddress();
    for (let i = 0; i < 4; i++) await attempt(email, 'wrong', address);
    expect(await attempt(email, PASSWORD, address)).toBe('signed in');
    for (let i = 0; i < 4; i++)
      expect(await attempt(email, 'wrong', address)).toBe(WRONG_CREDENTIALS);
    expect(await attempt(email, PASSWORD, address)).toBe('signed in');
  });

  it('anyone – twenty failures from one address block it for every account, not other addresses', async () => {
    const address = freshAddress();
    const answers = [];
    for (let i = 0; i < 20; i++) {
      answers.push(await attempt(`guess${i}@harbour.test`, 'wrong', address));
    }
    expect(answers.slice(0, 19).every((a) => a === WRONG_CREDENTIALS)).toBe(true);
    expect(answers[19]).toBe(blockedFor15);
    expect(await attempt(email, PASSWORD, address)).toBe(blockedFor15);
    expect(await attempt(email, PASSWORD, freshAddress())).toBe('signed in');
  });

  it('anyone – each further block of an account within a day lasts twice as long', async () => {
    vi.useFakeTimers({ toFake: ['Date'] });
    const start = new Date('2026-03-02T09:00:00Z').getTime();
    vi.setSystemTime(start);
    const lockOut = async () => {
      for (let i = 0; i < 5; i++) await attempt(email, 'wrong', freshAddress());
    };
    await lockOut();
    vi.setSystemTime(start + 16 * 60_000);
    await lockOut();
    expect(await attempt(email, PASSWORD, freshAddress())).toBe(
      'Too many failed sign-ins. Wait 30 minutes, then try again.',
    );
    vi.setSystemTime(start + (16 + 31) * 60_000);
    expect(await attempt(email, PASSWORD, freshAddress())).toBe('signed in');
  });

  it('owner – each block is in the activity log with the e-mail and the address', async () => {
    const address = freshAddress();
    for (let i = 0; i < 5; i++) await attempt('Nobody@Harbour.test', 'wrong', address);
    const rows = await db()
      .select()
      .from(activityLog)
      .where(eq(activityLog.action, 'sign_in.blocked'));
    expect(rows.map((r) => r.after)).toEqual([
      expect.objectContaining({
        blocked: 'account',
        email: 'nobody@harbour.test',
        address,
        seconds: SIGN_IN_LIMITS.firstBlockSeconds,
      }),
    ]);
  });
});

describe('client address', () => {
  it('without a trusted proxy, the address Next.js recorded (the last entry)', () => {
    expect(clientAddress({ 'x-forwarded-for': '10.0.0.9' }, 0)).toBe('10.0.0.9');
    expect(clientAddress({}, 0)).toBe('unknown');
  });
  it('behind one proxy, the entry it appended, never the client’s own claim', () => {
    expect(clientAddress({ 'x-forwarded-for': '1.2.3.4, 198.51.100.20' }, 1)).toBe('198.51.100.20');
    expect(clientAddress({ 'x-forwarded-for': '1.2.3.4, 198.51.100.20, 10.0.0.2' }, 2)).toBe(
      '198.51.100.20',
    );
  });
});
