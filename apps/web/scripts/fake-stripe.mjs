#!/usr/bin/env node
// A local stand-in for the few Stripe endpoints royalty invoicing uses (customers, invoice items,
// invoices: create, retrieve, finalize, send, pay), honouring Idempotency-Key as Stripe does: the
// same key and parameters replay the first answer, the same key with other parameters is a 400.
// State lives in memory. When an invoice is paid (POST /v1/invoices/{id}/pay, or the "Pay" button
// of its hosted page /i/{id}) and FAKE_STRIPE_WEBHOOK_URL and STRIPE_WEBHOOK_SECRET are set, it
// posts an invoice.paid event there, signed as Stripe signs them (Stripe-Signature: t=…,v1=…).
//
//   node apps/web/scripts/fake-stripe.mjs [--port=N]   # or FAKE_STRIPE_PORT (12111; 0 = any); FAKES_HOST
//
// GET /_fake/state lists what was created. FAKE_STRIPE_ENV_FILE: once listening, STRIPE_API_BASE
// and a placeholder STRIPE_SECRET_KEY are written there as KEY=value lines.
import { createHmac } from 'node:crypto';
import { renameSync, writeFileSync } from 'node:fs';
import http from 'node:http';

const host = process.env.FAKES_HOST || '127.0.0.1';
const portArg = process.argv.find((a) => a.startsWith('--port='))?.slice('--port='.length);
const port = Number(portArg ?? process.env.FAKE_STRIPE_PORT ?? 12111);
const store = { customers: new Map(), invoiceitems: new Map(), invoices: new Map() };
const replays = new Map();
let counter = 0;
const fail = (status, message, type = 'invalid_request_error') => ({
  status,
  body: { error: { type, message } },
});
const ok = (body) => ({ status: 200, body });
const webhookUrl = process.env.FAKE_STRIPE_WEBHOOK_URL;
const webhookSecret = process.env.STRIPE_WEBHOOK_SECRET;

/** Posts a signed event to the app, as Stripe does: HMAC-SHA256 of "{t}.{body}" with the secret. */
async function sendEvent(type, object) {
  if (!webhookUrl || !webhookSecret) return;
  const created = Math.floor(Date.now() / 1000);
  const id = `evt_fake${String(++counter).padStart(8, '0')}`;
  const body = JSON.stringify({
    id,
    object: 'event',
    type,
    created,
    livemode: false,
    data: { object },
  });
  const signature = createHmac('sha256', webhookSecret).update(`${created}.${body}`).digest('hex');
  try {
    const response = await fetch(webhookUrl, {
      method: 'POST',
      headers: {
        'content-type': 'application/json',
        'stripe-signature': `t=${created},v1=${signature}`,
      },
      body,
    });
    console.log(`fake-stripe: ${type} ${object.id} → ${response.status}`);
  } catch (error) {
    console.error(`fake-stripe: could not deliver ${type}: ${error.message}`);
  }
}

/** Stripe's form encoding: `metadata[shop_id]=3` becomes { metadata: { shop_id: '3' } }. */
function parseForm(text) {
  const out = {};
  for (const [key, value] of new URLSearchParams(text)) {
    const [head, sub] = key.replace(/]/g, '').split('[');
    if (sub === undefined) out[head] = value;
    else (out[head] ??= {})[sub] = value;
  }
  for (const k of ['amount', 'days_until_due']) if (k in out) out[k] = Number(out[k]);
  return out;
}

function create(kind, prefix, object, params, extra = {}) {
  const id = `${prefix}_fake${String(++counter).padStart(8, '0')}`;
  const created = Math.floor(Date.now() / 1000);
  const row = { metadata: {}, ...params, ...extra, id, object, created };
  store[kind].set(id, row);
  return row;
}

function totals(invoice) {
  const data = [...store.invoiceitems.values()].filter((i) => i.invoice === invoice.id);
  const total = data.reduce((sum, i) => sum + i.amount, 0);
  const due = total - invoice.amount_paid;
  Object.assign(invoice, { lines: { object: 'list', data }, total, amount_due: due });
  return invoice;
}

function handle(method, path, params) {
  const [, , resource, id, verb] = path.split('/');
  if (method === 'POST' && !id && resource === 'customers')
    return ok(create('customers', 'cus', 'customer', params));
  if (method === 'POST' && !id && resource === 'invoices') {
    if (!store.customers.has(params.customer))
      return fail(400, `No such customer: '${params.customer}'`);
    const extra = { status: 'draft', amount_paid: 0, currency: params.currency ?? 'usd' };
    return ok(totals(create('invoices', 'in', 'invoice', params, extra)));
  }
  if (method === 'POST' && !id && resource === 'invoiceitems') {
    const invoice = store.invoices.get(params.invoice);
    if (invoice?.status !== 'draft') return fail(400, 'Invoice items need a draft invoice here.');
    const item = create('invoiceitems', 'ii', 'invoiceitem', params);
    totals(invoice);
    return ok(item);
  }
  const invoice = resource === 'invoices' && store.invoices.get(id);
  if (!invoice) return fail(404, `Unrecognized request URL (${method}: ${path}).`);
  if (method === 'GET' && !verb) return ok(invoice);
  const needs = { finalize: 'draft', send: 'open', pay: 'open' }[verb];
  if (method !== 'POST' || !needs)
    return fail(404, `Unrecognized request URL (${method}: ${path}).`);
  if (invoice.status !== needs)
    return fail(400, `Invoice ${id} is ${invoice.status}, not ${needs}.`);
  if (verb === 'finalize') {
    const url = `http://${host}:${server.address().port}/i/${id}`;
    Object.assign(invoice, { status: 'open', number: `FAKE-${counter}`, hosted_invoice_url: url });
  }
  if (verb === 'pay') {
    Object.assign(invoice, { status: 'paid', amount_paid: invoice.total });
    void sendEvent('invoice.paid', structuredClone(totals(invoice)));
  }
  return ok(totals(invoice));
}

const server = http.createServer((req, res) => {
  const chunks = [];
  req.on('data', (c) => chunks.push(c));
  req.on('end', () => {
    const url = new URL(req.url ?? '/', 'http://fake');
    const send = ({ status, body }) => {
      res.writeHead(status, { 'content-type': 'application/json' });
      res.end(JSON.stringify(body));
    };
    const hosted = /^\/i\/([\w-]+)(\/pay)?$/.exec(url.pathname);
    if (hosted) return hostedPage(req, res, hosted[1], Boolean(hosted[2]));
    if (url.pathname === '/_fake/state')
      return send(
        ok(Object.fromEntries(Object.entries(store).map(([k, m]) => [k, [...m.values()]]))),
      );
    if (!/^Bearer \S+/.test(req.headers.authorization ?? ''))
      return send(fail(401, 'No API key provided.'));
    const text = Buffer.concat(chunks).toString('utf8');
    const key = req.method === 'POST' ? req.headers['idempotency-key'] : undefined;
    const fingerprint = `${req.method} ${url.pathname} ${text}`;
    const earlier = key && replays.get(key);
    if (earlier && earlier.fingerprint !== fingerprint)
      return send(
        fail(
          400,
          'Keys for idempotent requests can only be used with the same parameters.',
          'idempotency_error',
        ),
      );
    const result = earlier ? earlier.result : handle(req.method, url.pathname, parseForm(text));
    if (key && !earlier) replays.set(key, { fingerprint, result: structuredClone(result) });
    send(result);
  });
});

const escape = (text) => String(text).replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

/** The invoice's hosted page: its amount and status, and a button that pays it. */
function hostedPage(req, res, id, pay) {
  const invoice = store.invoices.get(id);
  if (!invoice) {
    res.writeHead(404, { 'content-type': 'text/plain' });
    return res.end('No such invoice.');
  }
  if (pay && req.method === 'POST') {
    if (invoice.status === 'open') handle('POST', `/v1/invoices/${id}/pay`, {});
    res.writeHead(303, { location: `/i/${id}` });
    return res.end();
  }
  const amount = `${(invoice.total / 100).toFixed(2)} ${invoice.currency.toUpperCase()}`;
  res.writeHead(200, {
    'content-type': 'text/html; charset=utf-8',
    'content-security-policy': "default-src 'none'; form-action 'self'",
  });
  res.end(`<!doctype html><html lang="en"><meta charset="utf-8"><title>Invoice ${escape(invoice.number ?? id)}</title>
<h1>Invoice ${escape(invoice.number ?? id)} (payment fake)</h1>
<p>${escape(invoice.description ?? 'Royalty invoice')}: ${escape(amount)}, ${escape(invoice.status)}.</p>
${invoice.status === 'open' ? `<form method="post" action="/i/${escape(id)}/pay"><button>Pay this invoice</button></form>` : ''}
</html>`);
}

server.listen(port, host, () => {
  const base = `http://${host}:${server.address().port}`;
  console.log(`fake-stripe: listening on ${base}`);
  const file = process.env.FAKE_STRIPE_ENV_FILE;
  if (file) {
    writeFileSync(
      `${file}.tmp`,
      `STRIPE_API_BASE=${base}\nSTRIPE_SECRET_KEY=sk_test_reelwright_fake\n`,
    );
    renameSync(`${file}.tmp`, file);
  }
});
for (const signal of ['SIGINT', 'SIGTERM', 'SIGHUP']) process.on(signal, () => process.exit(0));
// Started in the background by a script: leave when that script is gone.
const parent = process.ppid;
setInterval(() => process.ppid !== parent && process.exit(0), 1_000).unref();
