import { eq } from '@reelwright/db';
import { customers, emails, reels, remindersSent, unsubscribeTokens } from '@reelwright/db/schema';
import { NextRequest } from 'next/server';
import nodemailer from 'nodemailer';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { closeMemoryDb, openMemoryDb, testState as state } from '~/server/testing/memory-db';
import { deliverPending } from '../mail/outbox';
import { buildMonthCloseNetwork } from '../month-close/test-network';
import { dueReminders } from './due';
import { getBatch, runBatch, startReminderBatch } from './send';
import { unsubscribe, unsubscribeStatus } from './unsubscribe';
import { GET as openPage, POST as oneClick } from '~/app/api/unsubscribe/[token]/route';

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));

// 20 February 2027 in New York; Dune's season runs 1 April – 15 November.
const NOW = new Date('2027-02-20T15:00:00Z');
const BASE_URL = 'https://reelwright.test';
let net: Awaited<ReturnType<typeof buildMonthCloseNetwork>>;
const reel: Record<string, number> = {};
const customer: Record<string, number> = {};

beforeAll(async () => {
  await openMemoryDb();
  net = await buildMonthCloseNetwork(state.handle!.db);
  const conn = state.handle!.db;
  const people = await conn
    .insert(customers)
    .values([
      {
        shopId: net.shops.dune.id,
        name: 'Ada Angler',
        email: 'ada@example.test',
        reminderConsent: true,
      },
      {
        shopId: net.shops.dune.id,
        name: 'Ben Boatman',
        email: 'ben@example.test',
        reminderConsent: false,
      },
      { shopId: net.shops.dune.id, name: 'Cy Caster', email: null, reminderConsent: true },
      {
        shopId: net.shops.dune.id,
        name: 'Dee Drifter',
        email: 'dee@example.test',
        reminderConsent: true,
      },
      {
        shopId: net.shops.reef.id,
        name: 'Eve Elsewhere',
        email: 'eve@example.test',
        reminderConsent: true,
      },
    ])
    .returning();
  for (const c of people) customer[c.name.split(' ')[0]!] = c.id;
  const r = (
    name: string,
    customerName: string,
    useProfile: 'light' | 'heavy',
    lastServicedOn: string | null,
  ) => ({
    name,
    row: {
      customerId: customer[customerName]!,
      kind: 'spinning' as const,
      maker: 'Tidewake',
      model: name,
      size: '3000',
      useProfile,
      lastServicedOn,
    },
  });
  const defs = [
    r('Light-due', 'Ada', 'light', '2026-03-01'), // due 2027-03-01: inside 4 weeks
    r('Heavy-april', 'Ada', 'heavy', '2026-11-15'), // due at season start 2027-04-01: 8 weeks, not 4
    r('No-consent', 'Ben', 'light', '2026-03-10'),
    r('No-email', 'Cy', 'light', '2026-03-05'),
    r('Overdue', 'Dee', 'light', '2026-02-10'), // due 2027-02-10: ten days overdue, still reminded
    r('Lapsed', 'Dee', 'light', '2025-03-04'), // due 2026-03-04, skipped: reminded for 2027-03-04
    r('Long-lapsed-heavy', 'Dee', 'heavy', '2025-06-01'), // season points lapsed: next is 2027-04-01
    r('Not-due', 'Dee', 'light', '2026-09-01'),
    r('Never-serviced', 'Dee', 'light', null),
    r('Other-shop', 'Eve', 'light', '2026-03-01'),
  ];
  const rows = await conn
    .insert(reels)
    .values(defs.map((d) => d.row))
    .returning();
  defs.forEach((d, i) => (reel[d.name] = rows[i]!.id));
}, 60_000);

afterAll(async () => {
  await closeMemoryDb();
});

describe('service reminders', () => {
  it('shop lead – lists the reels due in the coming weeks with who will get a reminder', async () => {
    const report = await dueReminders(net.leadDune, net.shops.dune.id, 4, { now: NOW });
    expect(report.today).toBe('2027-02-20');
    expect(report.horizon).toBe('2027-03-20');
    expect(report.reels.map((r) => [r.reel, r.dueOn, r.reminder, r.overdue])).toEqual([
      ['Tidewake Overdue 3000', '2027-02-10', 'to_send', true],
      ['Tidewake Light-due 3000', '2027-03-01', 'to_send', false],
      ['Tidewake Lapsed 3000', '2027-03-04', 'to_send', false],
      ['Tidewake No-email 3000', '2027-03-05', 'no_email', false],
      ['Tidewake No-consent 3000', '2027-03-10', 'no_consent', false],
    ]);
    expect(report.counts).toEqual({ due: 5, to_send: 3, sent: 0, no_consent: 1, no_email: 1 });
    const eight = await dueReminders(net.leadDune, net.shops.dune.id, 8, { now: NOW });
    expect(eight.reels.find((r) => r.reelId === reel['Heavy-april'])?.dueOn).toBe('2027-04-01');
    expect(eight.reels.find((r) => r.reelId === reel['Long-lapsed-heavy'])?.dueOn).toBe(
      '2027-04-01',
    );
  });

  it('shop lead – another shop is not found', async () => {
    await expect(
      dueReminders(net.leadDune, net.shops.reef.id, 4, { now: NOW }),
    ).rejects.toMatchObject({ status: 404 });
  });

  it('shop lead – reminders sent twice go out once', async () => {
    const first = await startReminderBatch(
      net.leadDune,
      { shopId: net.shops.dune.id, weeks: 4 },
      { now: NOW },
    );
    expect(first.batch).toMatchObject({ status: 'running', total: 3, sent: 0 });
    // A second click while the first batch runs gets the same batch back.
    const clicked = await startReminderBatch(
      net.leadDune,
      { shopId: net.shops.dune.id, weeks: 4 },
      { now: NOW },
    );
    expect(clicked).toMatchObject({ alreadyRunning: true, batch: { id: first.batch.id } });
    // Even running the same batch twice at once claims each (reel, due date) once.
    await Promise.all([
      runBatch(first, { baseUrl: BASE_URL, now: NOW }),
      runBatch({ ...first }, { baseUrl: BASE_URL, now: NOW }),
    ]);
    const done = await getBatch(net.leadDune, first.batch.id);
    expect(done.status).toBe('done');
    expect(done.sent + done.skipped).toBe(6);
    expect(done.sent).toBe(3);

    const later = await startReminderBatch(
      net.leadDune,
      { shopId: net.shops.dune.id, weeks: 4 },
      { now: new Date('2027-02-21T15:00:00Z') },
    );
    expect(later.batch).toMatchObject({ status: 'done', total: 0 });
    await runBatch(later, { baseUrl: BASE_URL });

    const conn = state.handle!.db;
    const queued = await conn.select().from(emails).where(eq(emails.kind, 'service_reminder'));
    expect(queued.map((e) => e.toAddress).sort()).toEqual([
      'ada@example.test',
      'dee@example.test',
      'dee@example.test',
    ]);
    const sent = await conn.select().from(remindersSent);
    expect(sent.map((s) => [s.reelId, s.dueOn]).sort()).toEqual(
      [
        [reel['Light-due'], '2027-03-01'],
        [reel['Lapsed'], '2027-03-04'],
        [reel['Overdue'], '2027-02-10'],
      ].sort(),
    );
    expect(sent.every((s) => s.emailId !== null && s.batchId === first.batch.id)).toBe(true);

    const transport = nodemailer.createTransport({ jsonTransport: true });
    expect(await deliverPending({ db: conn, transport })).toEqual({ sent: 3, failed: 0 });
    expect(await deliverPending({ db: conn, transport })).toEqual({ sent: 0, failed: 0 });

    const after = await dueReminders(net.leadDune, net.shops.dune.id, 4, { now: NOW });
    expect(after.counts).toMatchObject({ to_send: 0, sent: 3 });
  });

  it('customer – the unsubscribe link asks first, then records the opt-out, no sign-in', async () => {
    const conn = state.handle!.db;
    const [mail] = await conn.select().from(emails).where(eq(emails.toAddress, 'ada@example.test'));
    expect(mail!.subject).toBe(
      'Your Tidewake Light-due 3000 is due for a service at Dune Test Shop',
    );
    expect(mail!.textBody).toContain('next service is due around 1 March 2027');
    const link = /https:\/\/reelwright\.test\/unsubscribe\/([A-Za-z0-9_-]+)/.exec(mail!.textBody);
    expect(link).not.toBeNull();
    expect(mail!.htmlBody).toContain(`href="${link![0]}"`);
    expect(mail!.listUnsubscribeUrl).toBe(`${BASE_URL}/api/unsubscribe/${link![1]}`);

    // Opening the link only reads: the customer is still subscribed until they confirm.
    expect(await unsubscribeStatus(link![1]!)).toEqual({
      shopName: 'Dune Test Shop',
      subscribed: true,
    });
    const [before] = await conn.select().from(customers).where(eq(customers.id, customer.Ada!));
    expect(before!.reminderConsent).toBe(true);
    expect(await unsubscribe(link![1]!)).toEqual({ shopName: 'Dune Test Shop', changed: true });
    expect(await unsubscribeStatus(link![1]!)).toMatchObject({ subscribed: false });
    const [ada] = await conn.select().from(customers).where(eq(customers.id, customer.Ada!));
    expect(ada!.reminderConsent).toBe(false);
    const [token] = await conn
      .select()
      .from(unsubscribeTokens)
      .where(eq(unsubscribeTokens.token, link![1]!));
    expect(token!.usedAt).not.toBeNull();
    expect(await unsubscribe(link![1]!)).toEqual({ shopName: 'Dune Test Shop', changed: false });
    expect(await unsubscribe('not-a-real-token-at-all')).toBeNull();
    expect(await unsubscribeStatus('not-a-real-token-at-all')).toBeNull();

    const eight = await dueReminders(net.leadDune, net.shops.dune.id, 8, { now: NOW });
    expect(eight.reels.find((r) => r.reelId === reel['Heavy-april'])?.reminder).toBe('no_consent');
  });

  it("customer – the mail client's one-click button (RFC 8058) opts out with a form POST", async () => {
    const conn = state.handle!.db;
    const [mail] = await conn.select().from(emails).where(eq(emails.toAddress, 'dee@example.test'));
    const url = mail!.listUnsubscribeUrl!;
    const token = url.split('/').at(-1)!;
    const post = (body: BodyInit, headers: Record<string, string>, t = token) =>
      oneClick(
        new NextRequest(`${BASE_URL}/api/unsubscribe/${t}`, { method: 'POST', headers, body }),
        { params: Promise.resolve({ token: t }) },
      );
    const form = { 'content-type': 'application/x-www-form-urlencoded' };
    const consent = async () =>
      (await conn.select().from(customers).where(eq(customers.id, customer.Dee!)))[0]!
        .reminderConsent;

    // Anything but the exact one-click body, or from a browser on another site, changes nothing.
    expect((await post('List-Unsubscribe=Maybe', form)).status).toBe(400);
    expect(
      (await post('{"List-Unsubscribe":"One-Click"}', { 'content-type': 'application/json' }))
        .status,
    ).toBe(415);
    expect(
      (await post('List-Unsubscribe=One-Click', { ...form, origin: 'http://evil.example' })).status,
    ).toBe(403);
    expect((await post('List-Unsubscribe=One-Click', form, 'no-such-token-0000')).status).toBe(404);
    expect(await consent()).toBe(true);

    // RFC 8058 §3.2: the mail server's POST carries no cookie and no Origin.
    const done = await post('List-Unsubscribe=One-Click', form);
    expect(done.status).toBe(200);
    expect(await done.json()).toEqual({
      unsubscribed: true,
      shop: 'Dune Test Shop',
      changed: true,
    });
    expect(await consent()).toBe(false);
    const multipart = new FormData();
    multipart.set('List-Unsubscribe', 'One-Click');
    const again = await post(multipart, {});
    expect(await again.json()).toMatchObject({ changed: false });

    // Opening the header's link in a browser shows the page that asks first.
    const page = await openPage(new NextRequest(url), { params: Promise.resolve({ token }) });
    expect(page.status).toBe(303);
    expect(page.headers.get('location')).toBe(`${BASE_URL}/unsubscribe/${token}`);
  });
});
