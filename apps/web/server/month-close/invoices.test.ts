import { eq } from '@reelwright/db';
import { paymentEvents, royaltyInvoices, shops } from '@reelwright/db/schema';
import { NextRequest } from 'next/server';
import { spawn, type ChildProcess } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import Stripe from 'stripe';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { POST as webhookRoute } from '~/app/api/webhooks/payments/route';
import { env } from '~/env';
import { closeMemoryDb, openMemoryDb, testState as state } from '~/server/testing/memory-db';
import { createStripe } from '../payments/stripe';
import { getMonthClose } from '../queries/month-close';
import { closeMonth } from './close';
import { invoiceKey, issueRoyaltyInvoices } from './invoices';
import { buildMonthCloseNetwork } from './test-network';

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));

const MONTH = '2026-11';
const WEBHOOK_SECRET = 'whsec_reelwright_unit_tests';
let net: Awaited<ReturnType<typeof buildMonthCloseNetwork>>;
let fake: ChildProcess;
let fakeUrl: string;
let stripe: Stripe;

interface FakeState {
  customers: { id: string; metadata: Record<string, string> }[];
  invoices: { id: string; customer: string; status: string; total: number }[];
  invoiceitems: { id: string; invoice: string; amount: number; customer: string }[];
}
const fakeState = async () => (await (await fetch(`${fakeUrl}/_fake/state`)).json()) as FakeState;

beforeAll(async () => {
  const script = fileURLToPath(new URL('../../scripts/fake-stripe.mjs', import.meta.url));
  fake = spawn(process.execPath, [script, '--port=0'], { stdio: ['ignore', 'pipe', 'inherit'] });
  fakeUrl = await new Promise<string>((resolve, reject) => {
    fake.once('error', reject);
    fake.stdout!.on('data', (chunk: Buffer) => {
      const match = /listening on (\S+)/.exec(chunk.toString());
      if (match) resolve(match[1]!);
    });
  });
  stripe = createStripe({ apiBase: fakeUrl, secretKey: 'sk_test_unit' });
  await openMemoryDb();
  net = await buildMonthCloseNetwork(state.handle!.db);
  env.STRIPE_WEBHOOK_SECRET = WEBHOOK_SECRET;
}, 60_000);

afterAll(async () => {
  fake?.kill();
  await closeMemoryDb();
});

describe('royalty invoices', () => {
  it('owner – cannot invoice a month that is not closed', async () => {
    await expect(issueRoyaltyInvoices(net.owner, MONTH, { stripe })).rejects.toMatchObject({
      status: 409,
    });
    expect((await fakeState()).invoices).toHaveLength(0);
  });

  it('owner – issuing twice (even at once) bills each shop once', async () => {
    await closeMonth(net.owner, MONTH, { now: new Date('2026-12-02T12:00:00Z') });
    const [first, racing] = await Promise.all([
      issueRoyaltyInvoices(net.owner, MONTH, { stripe }),
      issueRoyaltyInvoices(net.owner, MONTH, { stripe }),
    ]);
    expect(first.failed + racing.failed).toBe(0);
    const again = await issueRoyaltyInvoices(net.owner, MONTH, { stripe });
    expect(again).toMatchObject({ issued: 0, alreadyIssued: 3, failed: 0 });

    const remote = await fakeState();
    expect(remote.customers).toHaveLength(3);
    expect(remote.invoices).toHaveLength(3);
    expect(remote.invoiceitems).toHaveLength(3);
    expect(remote.invoices.every((i) => i.status === 'open')).toBe(true);
    // The royalties checked by hand in month-close.test.ts: 16.94, 6.10 and 0.45.
    expect(remote.invoiceitems.map((i) => i.amount).sort((a, b) => a - b)).toEqual([45, 610, 1694]);

    const conn = state.handle!.db;
    const rows = await conn.select().from(royaltyInvoices);
    expect(rows).toHaveLength(3);
    for (const row of rows) {
      expect(row.status).toBe('open');
      expect(row.idempotencyKey).toBe(invoiceKey(MONTH, row.shopId));
      expect(remote.invoices.map((i) => i.id)).toContain(row.stripeInvoiceId);
      const [shop] = await conn.select().from(shops).where(eq(shops.id, row.shopId));
      expect(shop!.stripeCustomerId).toBe(row.stripeCustomerId);
    }
    const report = await getMonthClose(net.owner, MONTH);
    expect(report.shops.map((r) => r.invoice?.status)).toEqual(['open', 'open', 'open']);
  });
});

function signedRequest(payload: string, signature: string) {
  return new NextRequest('http://127.0.0.1/api/webhooks/payments', {
    method: 'POST',
    body: payload,
    headers: { 'content-type': 'application/json', 'stripe-signature': signature },
  });
}

function invoiceEvent(
  id: string,
  type: 'invoice.paid' | 'invoice.payment_failed',
  invoiceId: string,
) {
  return JSON.stringify({
    id,
    object: 'event',
    type,
    created: Math.floor(Date.parse('2026-12-10T12:00:00Z') / 1000),
    data: {
      object: {
        id: invoiceId,
        object: 'invoice',
        status: type === 'invoice.paid' ? 'paid' : 'open',
      },
    },
  });
}

describe('payment webhook', () => {
  async function duneInvoice() {
    const [row] = await state
      .handle!.db.select()
      .from(royaltyInvoices)
      .where(eq(royaltyInvoices.shopId, net.shops.dune.id));
    return row!;
  }

  it('provider – a forged signature is refused with 400 and changes nothing', async () => {
    const invoice = await duneInvoice();
    const payload = invoiceEvent('evt_forged', 'invoice.paid', invoice.stripeInvoiceId!);
    const forged = Stripe.webhooks.generateTestHeaderString({
      payload,
      secret: 'whsec_someone_else',
    });
    const response = await webhookRoute(signedRequest(payload, forged));
    expect(response.status).toBe(400);
    expect(response.headers.get('content-type')).toContain('application/problem+json');
    // A genuine header over a different body does not verify either.
    const genuine = Stripe.webhooks.generateTestHeaderString({
      payload: '{"id":"evt_other"}',
      secret: WEBHOOK_SECRET,
    });
    expect((await webhookRoute(signedRequest(payload, genuine))).status).toBe(400);
    expect((await webhookRoute(signedRequest(payload, ''))).status).toBe(400);
    expect(await state.handle!.db.select().from(paymentEvents)).toHaveLength(0);
    expect((await duneInvoice()).status).toBe('open');
  });

  it('provider – a signed invoice.paid marks the invoice paid, once', async () => {
    const invoice = await duneInvoice();
    const payload = invoiceEvent('evt_paid_1', 'invoice.paid', invoice.stripeInvoiceId!);
    const header = Stripe.webhooks.generateTestHeaderString({ payload, secret: WEBHOOK_SECRET });
    const response = await webhookRoute(signedRequest(payload, header));
    expect(response.status).toBe(200);
    expect(await response.json()).toMatchObject({
      type: 'invoice.paid',
      recorded: true,
      royaltyInvoiceId: invoice.id,
    });
    const paid = await duneInvoice();
    expect(paid.status).toBe('paid');
    expect(paid.paidAt?.toISOString()).toBe('2026-12-10T12:00:00.000Z');
    // Redelivered: recorded once.
    const again = await webhookRoute(signedRequest(payload, header));
    expect(await again.json()).toMatchObject({ recorded: false });
    const events = await state.handle!.db.select().from(paymentEvents);
    expect(events.map((e) => [e.providerEventId, e.royaltyInvoiceId])).toEqual([
      ['evt_paid_1', invoice.id],
    ]);
    const report = await getMonthClose(net.owner, MONTH);
    expect(report.shops.find((r) => r.shop.id === net.shops.dune.id)!.invoice?.status).toBe('paid');
  });

  it('provider – a failed payment is recorded, and never undoes a payment', async () => {
    const [reef] = await state
      .handle!.db.select()
      .from(royaltyInvoices)
      .where(eq(royaltyInvoices.shopId, net.shops.reef.id));
    const failed = invoiceEvent('evt_failed_1', 'invoice.payment_failed', reef!.stripeInvoiceId!);
    await webhookRoute(
      signedRequest(
        failed,
        Stripe.webhooks.generateTestHeaderString({ payload: failed, secret: WEBHOOK_SECRET }),
      ),
    );
    const [after] = await state
      .handle!.db.select()
      .from(royaltyInvoices)
      .where(eq(royaltyInvoices.id, reef!.id));
    expect(after!.status).toBe('failed');

    const dune = await duneInvoice();
    const late = invoiceEvent('evt_failed_late', 'invoice.payment_failed', dune.stripeInvoiceId!);
    await webhookRoute(
      signedRequest(
        late,
        Stripe.webhooks.generateTestHeaderString({ payload: late, secret: WEBHOOK_SECRET }),
      ),
    );
    expect((await duneInvoice()).status).toBe('paid');
    expect(await state.handle!.db.select().from(paymentEvents)).toHaveLength(3);
  });
});
