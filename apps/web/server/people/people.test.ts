import { eq } from '@reelwright/db';
import { accountLinks, emails, users } from '@reelwright/db/schema';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { inviteInput, passwordChange, passwordResetConfirm } from '~/lib/validators/people';
import { closeMemoryDb, openTargetDb, testState as state } from '~/server/testing/memory-db';
import { buildNetwork, type Network } from '../bench/fixture';
import { ApiError } from '../errors';
import {
  changeOwnPassword,
  getPerson,
  invitationAction,
  invitePerson,
  isCommonPassword,
  listPeople,
  requestPasswordReset,
  setPasswordFromLink,
  updatePerson,
} from './index';

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));

let net: Network;
const db = () => state.handle!.db;
const T0 = new Date('2026-12-01T12:00:00Z');
const later = (ms: number) => new Date(T0.getTime() + ms);
const HOUR = 3_600_000;

beforeAll(async () => {
  await openTargetDb();
  net = await buildNetwork(state.handle!.db);
}, 60_000);
afterAll(closeMemoryDb);

/** The token of the latest link e-mailed to an address, read from the outbox as a person would. */
async function linkIn(address: string): Promise<string> {
  const sent = await db().select().from(emails).where(eq(emails.toAddress, address));
  const body = sent.at(-1)!.textBody;
  return /set-password\?token=([A-Za-z0-9_-]{43})/.exec(body)![1]!;
}

const statusOf = async (error: Promise<unknown>) =>
  error.then(
    () => 200,
    (e: unknown) => (e instanceof ApiError ? e.status : 500),
  );

describe('people', () => {
  it('owner – invites a technician: no password yet, one e-mail with a link, then the link sets the password once', async () => {
    const person = await invitePerson(
      net.as.owner,
      inviteInput.parse({
        name: 'Wren Alderley',
        email: 'Wren@T.test',
        role: 'technician',
        shopId: net.shops.dune.id,
      }),
      { now: T0 },
    );
    expect(person).toMatchObject({
      email: 'wren@t.test',
      status: 'invited',
      shopName: 'Dune Test Shop',
      invitation: { state: 'pending' },
    });
    expect(person.history[0]).toMatchObject({ action: 'user.invite', by: 'Olive Owner' });
    const token = await linkIn('wren@t.test');
    const [stored] = await db()
      .select()
      .from(accountLinks)
      .where(eq(accountLinks.userId, person.id));
    expect(stored!.tokenHash).not.toContain(token);

    await expect(
      setPasswordFromLink({ token, password: 'spool-and-tidewater' }, { now: later(HOUR) }),
    ).resolves.toEqual({ email: 'wren@t.test' });
    expect(
      await statusOf(
        setPasswordFromLink({ token, password: 'another-long-one' }, { now: later(HOUR) }),
      ),
    ).toBe(410);
    expect((await getPerson(net.as.owner, person.id)).status).toBe('active');
  });

  it('owner – an invitation link past its 7 days no longer works; a resent one does, and the old one stops', async () => {
    const person = await invitePerson(
      net.as.owner,
      inviteInput.parse({
        name: 'Juno Pell',
        email: 'juno@t.test',
        role: 'technician',
        shopId: net.shops.kelp.id,
      }),
      { now: T0 },
    );
    const first = await linkIn('juno@t.test');
    expect(
      await statusOf(
        setPasswordFromLink(
          { token: first, password: 'spool-and-tidewater' },
          { now: later(7 * 24 * HOUR + 1) },
        ),
      ),
    ).toBe(410);
    await invitationAction(
      net.as.owner,
      person.id,
      { action: 'resend' },
      { now: later(8 * 24 * HOUR) },
    );
    const second = await linkIn('juno@t.test');
    expect(second).not.toBe(first);
    const at = later(8 * 24 * HOUR + HOUR);
    expect(
      await statusOf(
        setPasswordFromLink({ token: first, password: 'spool-and-tidewater' }, { now: at }),
      ),
    ).toBe(410);
    await expect(
      setPasswordFromLink({ token: second, password: 'spool-and-tidewater' }, { now: at }),
    ).resolves.toEqual({ email: 'juno@t.test' });
  });

  it('owner – a withdrawn invitation no longer works; an address with an account cannot be invited twice', async () => {
    const person = await invitePerson(
      net.as.owner,
      inviteInput.parse({
        name: 'Ona Brisk',
        email: 'ona@t.test',
        role: 'shop_lead',
        shopId: net.shops.kelp.id,
      }),
      { now: T0 },
    );
    const token = await linkIn('ona@t.test');
    const after = await invitationAction(
      net.as.owner,
      person.id,
      { action: 'withdraw' },
      { now: later(HOUR) },
    );
    expect(after.invitation).toMatchObject({ state: 'withdrawn' });
    expect(
      await statusOf(
        setPasswordFromLink({ token, password: 'spool-and-tidewater' }, { now: later(2 * HOUR) }),
      ),
    ).toBe(410);
    expect(
      await statusOf(
        invitePerson(
          net.as.owner,
          inviteInput.parse({ name: 'Ona', email: 'ona@t.test', role: 'auditor' }),
        ),
      ),
    ).toBe(409);
  });

  it('owner – the last active owner can be neither demoted nor deactivated (409)', async () => {
    const owner = net.as.owner;
    expect(await statusOf(updatePerson(owner, owner.id, { active: false }))).toBe(409);
    expect(await statusOf(updatePerson(owner, owner.id, { role: 'auditor' }))).toBe(409);
    const [row] = await db().select().from(users).where(eq(users.id, owner.id));
    expect(row).toMatchObject({ role: 'owner', active: true });
  });

  it('owner – moving a technician ends their sessions and is in their history; a role change drops the scope it has no use for', async () => {
    const techId = net.as.tech.id;
    const [before] = await db().select().from(users).where(eq(users.id, techId));
    const moved = await updatePerson(net.as.owner, techId, { shopId: net.shops.kelp.id });
    expect(moved.shopName).toBe('Kelp Test Shop');
    expect(moved.history[0]).toMatchObject({
      action: 'user.update',
      by: 'Olive Owner',
      before: { shopId: net.shops.dune.id },
      after: { shopId: net.shops.kelp.id },
    });
    const [after] = await db().select().from(users).where(eq(users.id, techId));
    expect(after!.sessionVersion).toBeGreaterThan(before!.sessionVersion);

    const manager = await updatePerson(net.as.owner, techId, {
      role: 'regional_manager',
      regionId: net.regions.north.id,
    });
    expect(manager).toMatchObject({
      role: 'regional_manager',
      shopId: null,
      regionName: 'Test North',
    });
    expect(await statusOf(updatePerson(net.as.owner, techId, { role: 'technician' }))).toBe(400);
    await updatePerson(net.as.owner, techId, { role: 'technician', shopId: net.shops.dune.id });
  });

  it('regional manager – lists only the people of their region’s shops and their own region', async () => {
    const seen = await listPeople(net.as.north);
    expect(seen.length).toBeGreaterThan(0);
    expect(seen.every((p) => p.shopName !== 'Reef Test Shop' && p.role !== 'owner')).toBe(true);
    const reefTech = (await listPeople(net.as.owner)).find((p) => p.shopName === 'Reef Test Shop');
    if (reefTech) expect(await statusOf(getPerson(net.as.north, reefTech.id))).toBe(404);
  });
});

describe('passwords', () => {
  it('anyone – a reset for a missing address queues nothing; for an account, one link that works once', async () => {
    await expect(requestPasswordReset('nobody@t.test', { now: T0 })).resolves.toEqual({
      queued: false,
    });
    await expect(requestPasswordReset('tech2.dune@t.test', { now: T0 })).resolves.toEqual({
      queued: true,
    });
    const token = await linkIn('tech2.dune@t.test');
    // The reset link lasts an hour.
    expect(
      await statusOf(
        setPasswordFromLink({ token, password: 'spool-and-tidewater' }, { now: later(HOUR + 1) }),
      ),
    ).toBe(410);
    await requestPasswordReset('tech2.dune@t.test', { now: later(2 * HOUR) });
    const fresh = await linkIn('tech2.dune@t.test');
    await setPasswordFromLink(
      { token: fresh, password: 'spool-and-tidewater' },
      { now: later(2 * HOUR) },
    );
    expect(
      await statusOf(
        setPasswordFromLink(
          { token: fresh, password: 'spool-and-tidewater' },
          { now: later(2 * HOUR) },
        ),
      ),
    ).toBe(410);
  });

  it('anyone – at most three reset e-mails an hour to one account', async () => {
    const at = later(10 * HOUR);
    const answers = [];
    for (let i = 0; i < 4; i += 1)
      answers.push((await requestPasswordReset('lead.dune@t.test', { now: at })).queued);
    expect(answers).toEqual([true, true, true, false]);
  });

  it('validators – a short password, a listed one and an unknown token shape are refused', async () => {
    expect(
      passwordResetConfirm.safeParse({ token: 'a'.repeat(43), password: 'short' }).success,
    ).toBe(false);
    expect(
      passwordResetConfirm.safeParse({ token: 'a'.repeat(42), password: 'long-enough-pass' })
        .success,
    ).toBe(false);
    // "password1234" and "qwertyuiop123" are on zxcvbn-ts's common-password list.
    expect(isCommonPassword('Password1234')).toBe(true);
    expect(isCommonPassword('spool-and-tidewater')).toBe(false);
    const token = 'b'.repeat(43);
    expect(await statusOf(setPasswordFromLink({ token, password: 'password1234' }))).toBe(400);
    expect(
      passwordChange.safeParse({
        currentPassword: 'same-long-password',
        newPassword: 'same-long-password',
      }).success,
    ).toBe(false);
  });

  it('signed-in person – changes their own password only with the current one', async () => {
    await requestPasswordReset('tech.kelp@t.test', { now: later(20 * HOUR) });
    await setPasswordFromLink(
      { token: await linkIn('tech.kelp@t.test'), password: 'first-long-password' },
      { now: later(20 * HOUR) },
    );
    const kit = (await listPeople(net.as.owner)).find((p) => p.email === 'tech.kelp@t.test')!;
    const who = { ...net.as.tech, id: kit.id, email: kit.email };
    expect(
      await statusOf(
        changeOwnPassword(who, {
          currentPassword: 'not-the-password',
          newPassword: 'second-long-password',
        }),
      ),
    ).toBe(400);
    await expect(
      changeOwnPassword(who, {
        currentPassword: 'first-long-password',
        newPassword: 'second-long-password',
      }),
    ).resolves.toEqual({ changed: true });
  });
});
