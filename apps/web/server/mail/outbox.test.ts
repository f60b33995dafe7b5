import { eq } from '@reelwright/db';
import { migrate, openDb, type DbHandle } from '@reelwright/db/client';
import { emails } from '@reelwright/db/schema';
import { simpleParser, type ParsedMail } from 'mailparser';
import type { AddressInfo } from 'node:net';
import { SMTPServer } from 'smtp-server';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { deliverPending, queueEmail, retryDelayMs } from './outbox';
import { openingHoursHint, readyForPickupEmail } from './templates';

let handle: DbHandle;
let server: SMTPServer;
let smtpUrl: string;
const received: ParsedMail[] = [];
/** While set, the test SMTP server refuses every message with this reply. */
let refuse: string | null = null;

beforeAll(async () => {
  handle = await openDb({ dataDir: 'memory://' });
  await migrate(handle.db, handle.driver);
  server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    onData(stream, _session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', () => {
        if (refuse) return callback(Object.assign(new Error(refuse), { responseCode: 451 }));
        simpleParser(Buffer.concat(chunks))
          .then((mail) => {
            received.push(mail);
            callback();
          })
          .catch(callback);
      });
    },
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  smtpUrl = `smtp://127.0.0.1:${(server.server.address() as AddressInfo).port}`;
}, 30_000);

afterAll(async () => {
  await new Promise<void>((resolve) => server.close(() => resolve()));
  await handle.close();
});

beforeEach(async () => {
  received.length = 0;
  refuse = null;
  await handle.db.delete(emails);
});

const message = (to: string) => ({
  kind: 'job_ready' as const,
  to,
  subject: `Your reel is ready (${to})`,
  text: 'It is ready for pickup.',
  html: '<p>It is ready for pickup.</p>',
});

describe('e-mail outbox', () => {
  it('queues inside the caller’s transaction: a rolled-back change leaves no message', async () => {
    await handle.db
      .transaction(async (tx) => {
        await queueEmail(tx, message('rollback@example.test'));
        throw new Error('the state change failed');
      })
      .catch(() => undefined);
    expect(await handle.db.select().from(emails)).toHaveLength(0);
  });

  it('delivers a queued message through SMTP and records it as sent', async () => {
    const id = await queueEmail(handle.db, message('angler@example.test'));
    const result = await deliverPending({ db: handle.db, smtpUrl });
    expect(result).toEqual({ sent: 1, failed: 0 });
    expect(received).toHaveLength(1);
    expect(received[0]!.subject).toBe('Your reel is ready (angler@example.test)');
    expect(received[0]!.text?.trim()).toBe('It is ready for pickup.');
    expect((received[0]!.to as { text: string }).text).toBe('angler@example.test');
    const [row] = await handle.db.select().from(emails).where(eq(emails.id, id));
    expect(row).toMatchObject({ status: 'sent', attempts: 1, lastError: null });
    expect(row!.sentAt).toBeInstanceOf(Date);
    expect(row!.messageId).toBeTruthy();
    // Already sent: a second call sends nothing again.
    expect(await deliverPending({ db: handle.db, smtpUrl })).toEqual({ sent: 0, failed: 0 });
    expect(received).toHaveLength(1);
  });

  it('customer – a reminder carries List-Unsubscribe and List-Unsubscribe-Post (RFC 8058 §3.1); a pickup notice does not', async () => {
    const url = 'https://reelwright.test/api/unsubscribe/abcdefghijklmnop';
    await queueEmail(handle.db, {
      ...message('reminded@example.test'),
      kind: 'service_reminder',
      listUnsubscribeUrl: url,
    });
    await queueEmail(handle.db, message('pickup@example.test'));
    expect(await deliverPending({ db: handle.db, smtpUrl })).toEqual({ sent: 2, failed: 0 });
    const headerLines = (to: string) =>
      received
        .find((m) => (m.to as { text: string }).text === to)!
        // Unfolded (RFC 5322 §2.2.3): a long header may continue on the next line.
        .headerLines.map((h) => h.line.replace(/\r\n[ \t]+/g, ' '));
    // RFC 8058 §3.1: List-Unsubscribe holds an https URI in angle brackets, and the POST header
    // the exact value "List-Unsubscribe=One-Click".
    const reminder = headerLines('reminded@example.test');
    expect(reminder).toContain(`List-Unsubscribe: <${url}>`);
    expect(reminder).toContain('List-Unsubscribe-Post: List-Unsubscribe=One-Click');
    const pickup = headerLines('pickup@example.test');
    expect(pickup.filter((line) => /^list-/i.test(line))).toEqual([]);
  });

  it('records a refused message as failed, counts the attempt, and retries after the backoff', async () => {
    const id = await queueEmail(handle.db, message('later@example.test'));
    refuse = 'Mailbox temporarily unavailable';
    const t0 = new Date();
    expect(await deliverPending({ db: handle.db, smtpUrl, now: t0 })).toEqual({
      sent: 0,
      failed: 1,
    });
    let [row] = await handle.db.select().from(emails).where(eq(emails.id, id));
    expect(row).toMatchObject({ status: 'failed', attempts: 1 });
    expect(row!.lastError).toContain('Mailbox temporarily unavailable');
    expect(row!.nextAttemptAt.getTime()).toBe(t0.getTime() + retryDelayMs(1));

    // Before the backoff has passed nothing is attempted.
    refuse = null;
    const early = new Date(t0.getTime() + retryDelayMs(1) - 1_000);
    expect(await deliverPending({ db: handle.db, smtpUrl, now: early })).toEqual({
      sent: 0,
      failed: 0,
    });
    // After it, the message goes out on the next call.
    const later = new Date(t0.getTime() + retryDelayMs(1) + 1_000);
    expect(await deliverPending({ db: handle.db, smtpUrl, now: later })).toEqual({
      sent: 1,
      failed: 0,
    });
    [row] = await handle.db.select().from(emails).where(eq(emails.id, id));
    expect(row).toMatchObject({ status: 'sent', attempts: 2, lastError: null });
    expect(received.map((m) => m.subject)).toEqual(['Your reel is ready (later@example.test)']);
  });

  it('never throws when the SMTP server is unreachable; the message stays due for a retry', async () => {
    await queueEmail(handle.db, message('nobody@example.test'));
    const result = await deliverPending({ db: handle.db, smtpUrl: 'smtp://127.0.0.1:9' });
    expect(result).toEqual({ sent: 0, failed: 1 });
    const [row] = await handle.db.select().from(emails);
    expect(row).toMatchObject({ status: 'failed', attempts: 1 });
    expect(row!.lastError).toMatch(/ECONNREFUSED|connect/i);
  });

  it('sends each message once when two deliveries overlap', async () => {
    for (let i = 0; i < 5; i += 1) await queueEmail(handle.db, message(`n${i}@example.test`));
    const [a, b] = await Promise.all([
      deliverPending({ db: handle.db, smtpUrl }),
      deliverPending({ db: handle.db, smtpUrl }),
    ]);
    expect(a!.sent + b!.sent).toBe(5);
    expect(received.map((m) => m.subject).sort()).toHaveLength(5);
    expect(new Set(received.map((m) => m.subject)).size).toBe(5);
  });

  it('backs off 1, 2, 4 … minutes, at most 6 hours', () => {
    expect([1, 2, 3, 4].map(retryDelayMs)).toEqual([60_000, 120_000, 240_000, 480_000]);
    expect(retryDelayMs(20)).toBe(6 * 3_600_000);
  });
});

describe('ready-for-pickup message', () => {
  const hours = {
    mon: [{ open: '09:00', close: '17:30' }],
    tue: [{ open: '09:00', close: '17:30' }],
    wed: [{ open: '09:00', close: '17:30' }],
    thu: [{ open: '09:00', close: '17:30' }],
    fri: [{ open: '09:00', close: '19:00' }],
    sat: [
      { open: '08:00', close: '12:00' },
      { open: '13:00', close: '15:00' },
    ],
  };

  it('sums up opening hours with neighbouring days merged and closed days named', () => {
    expect(openingHoursHint(hours)).toBe(
      'Mon–Thu 09:00–17:30, Fri 09:00–19:00, Sat 08:00–12:00 and 13:00–15:00; closed Sun',
    );
    expect(openingHoursHint({})).toBe('Please call the shop for opening hours.');
  });

  it('names the shop, the reel and the job number, and escapes HTML', () => {
    const mail = readyForPickupEmail({
      shopName: 'Marram Point',
      customerName: 'Ada <Quill>',
      reel: 'Tidewake Seaspin 4000',
      jobId: 4172,
      openingHours: hours,
      shopPhone: '555-0100',
    });
    expect(mail.subject).toBe('Your Tidewake Seaspin 4000 is ready for pickup at Marram Point');
    expect(mail.text).toContain('job #4172');
    expect(mail.text).toContain('Opening hours: Mon–Thu 09:00–17:30');
    expect(mail.text).toContain('555-0100');
    expect(mail.html).toContain('Ada &lt;Quill&gt;');
    expect(mail.html).not.toContain('<Quill>');
  });
});
