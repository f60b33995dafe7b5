import { paymentEvents } from '@reelwright/db/schema';
import { NextRequest } from 'next/server';
import { spawn } from 'node:child_process';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { fileURLToPath } from 'node:url';
import Stripe from 'stripe';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { POST as webhookRoute } from '~/app/api/webhooks/payments/route';
import { env } from '~/env';
import { createStripe } from '~/server/payments/stripe';
import { closeMemoryDb, openMemoryDb, testState as state } from '~/server/testing/memory-db';

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));

const SECRET = 'whsec_reelwright_webhook_unit_tests';

beforeAll(async () => {
  await openMemoryDb();
  env.STRIPE_WEBHOOK_SECRET = SECRET;
}, 120_000);

afterAll(async () => {
  await closeMemoryDb();
});

let counter = 0;
/** An invoice.paid event for an invoice Reelwright never issued (recorded, matched to nothing). */
function event() {
  counter += 1;
  return JSON.stringify({
    id: `evt_unit_${counter}`,
    object: 'event',
    type: 'invoice.paid',
    created: Math.floor(Date.now() / 1000),
    data: { object: { id: `in_unit_${counter}`, object: 'invoice', status: 'paid' } },
  });
}

/** A Stripe-Signature header stamped `offsetSeconds` from now. */
const sign = (payload: string, offsetSeconds = 0, secret = SECRET) =>
  Stripe.webhooks.generateTestHeaderString({
    payload,
    secret,
    timestamp: Math.floor(Date.now() / 1000) + offsetSeconds,
  });

function post(body: BodyInit, signature: string, headers: Record<string, string> = {}) {
  return webhookRoute(
    new NextRequest('http://127.0.0.1/api/webhooks/payments', {
      method: 'POST',
      body,
      headers: { 'content-type': 'application/json', 'stripe-signature': signature, ...headers },
      duplex: 'half',
    } as ConstructorParameters<typeof NextRequest>[1]),
  );
}

const recorded = async () => (await state.handle!.db.select().from(paymentEvents)).length;

async function expectProblem(response: Response, status: number) {
  expect(response.status).toBe(status);
  expect(response.headers.get('content-type')).toBe('application/problem+json');
  return (await response.json()) as { status: number; detail: string };
}

describe('payment webhook', () => {
  it('provider – a validly signed event is accepted and recorded', async () => {
    const payload = event();
    const response = await post(payload, sign(payload));
    expect(response.status).toBe(200);
    expect(await response.json()).toMatchObject({ type: 'invoice.paid', recorded: true });
  });

  it('provider – an event stamped 10 minutes in the future is refused and not recorded', async () => {
    const before = await recorded();
    const payload = event();
    const problem = await expectProblem(await post(payload, sign(payload, 600)), 400);
    expect(problem.detail).toContain('ahead of this server’s clock');
    expect(await recorded()).toBe(before);
    // Just inside the tolerance is still fine: clocks differ a little.
    const near = event();
    expect((await post(near, sign(near, 60))).status).toBe(200);
  });

  it('provider – an event stamped 10 minutes ago is refused', async () => {
    const before = await recorded();
    const payload = event();
    await expectProblem(await post(payload, sign(payload, -600)), 400);
    expect(await recorded()).toBe(before);
  });

  it('provider – a bad signature is refused', async () => {
    const before = await recorded();
    const payload = event();
    await expectProblem(await post(payload, sign(payload, 0, 'whsec_someone_else')), 400);
    await expectProblem(await post(payload, sign('{"id":"evt_other"}')), 400);
    await expectProblem(await post(payload, ''), 400);
    expect(await recorded()).toBe(before);
  });

  it('provider – a 5 MB body is a 413 whether or not its length is declared', async () => {
    const big = 'x'.repeat(5 * 1024 * 1024);
    const declared = await expectProblem(
      await post(big, sign(big), { 'content-length': String(big.length) }),
      413,
    );
    expect(declared.detail).toBe('A webhook body may be at most 64 kB.');

    // Streamed without a length: refused once the limit is passed, not after reading it all.
    const chunk = new Uint8Array(64 * 1024).fill(0x78);
    let pulled = 0;
    const stream = new ReadableStream<Uint8Array>({
      pull(controller) {
        pulled += 1;
        if (pulled > 80) controller.close();
        else controller.enqueue(chunk);
      },
    });
    await expectProblem(await post(stream, sign(big)), 413);
    expect(pulled).toBeLessThan(5);
  });
});

describe('the payment fake', () => {
  it('provider – signs the invoice.paid it sends with the demo’s secret, and the app accepts it', async () => {
    // Stands in for the app's server: hands each delivery to the route and keeps the answer.
    const answers: { status: number; body: unknown }[] = [];
    const app = http.createServer((req, res) => {
      const chunks: Buffer[] = [];
      req.on('data', (c: Buffer) => chunks.push(c));
      req.on('end', async () => {
        const response = await post(
          Buffer.concat(chunks),
          String(req.headers['stripe-signature'] ?? ''),
        );
        answers.push({ status: response.status, body: await response.json() });
        res.writeHead(response.status).end();
      });
    });
    await new Promise<void>((resolve) => app.listen(0, '127.0.0.1', resolve));
    const appUrl = `http://127.0.0.1:${(app.address() as AddressInfo).port}/api/webhooks/payments`;
    const script = fileURLToPath(new URL('../../scripts/fake-stripe.mjs', import.meta.url));
    const fake = spawn(process.execPath, [script, '--port=0'], {
      env: { NODE_ENV: 'test', FAKE_STRIPE_WEBHOOK_URL: appUrl, STRIPE_WEBHOOK_SECRET: SECRET },
      stdio: ['ignore', 'pipe', 'inherit'],
    });
    try {
      const base = await new Promise<string>((resolve, reject) => {
        fake.once('error', reject);
        fake.stdout!.on('data', (chunk: Buffer) => {
          const match = /listening on (\S+)/.exec(chunk.toString());
          if (match) resolve(match[1]!);
        });
      });
      const stripe = createStripe({ apiBase: base, secretKey: 'sk_test_unit' });
      const customer = await stripe.customers.create({ name: 'Dune Test Shop' });
      const invoice = await stripe.invoices.create({ customer: customer.id, currency: 'usd' });
      await stripe.invoiceItems.create({
        customer: customer.id,
        invoice: invoice.id,
        amount: 1234,
      });
      await stripe.invoices.finalizeInvoice(invoice.id!);
      await stripe.invoices.pay(invoice.id!);
      await expect.poll(() => answers.length, { timeout: 10_000 }).toBe(1);
      expect(answers[0]).toEqual({
        status: 200,
        body: expect.objectContaining({ type: 'invoice.paid', recorded: true }),
      });
    } finally {
      fake.kill();
      app.close();
    }
  });
});
