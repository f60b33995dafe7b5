import { and, eq, isNull, type Db } from '@reelwright/db';
import { activityLog, royaltyInvoices, shops, type RoyaltyInvoice } from '@reelwright/db/schema';
import type Stripe from 'stripe';
import { db } from '../db';
import { conflict, forbidden } from '../errors';
import { stripeFromEnv } from '../payments/stripe';
import type { Principal } from '../principal';
import { currentClose } from '../queries/month-close';
import { money } from './csv';
import type { ShopFigures } from './figures';
import { monthLabel } from './period';
import * as clock from '~/server/clock';

export interface IssuedInvoice {
  shopId: number;
  shopName: string;
  outcome: 'issued' | 'already_issued' | 'nothing_due' | 'failed';
  status: RoyaltyInvoice['status'] | null;
  amountCents: number;
  stripeInvoiceId: string | null;
  error?: string;
}

export interface IssueResult {
  month: string;
  issued: number;
  alreadyIssued: number;
  nothingDue: number;
  failed: number;
  invoices: IssuedInvoice[];
}

/** The key every provider call for one shop's royalty of one month is derived from. */
export const invoiceKey = (month: string, shopId: number) =>
  `reelwright:royalty:${month}:shop-${shopId}`;

const customerKey = (shopId: number) => `reelwright:customer:shop-${shopId}`;

/**
 * Issues one royalty invoice per shop from the month's standing close: a provider customer per shop
 * (kept in shops.stripe_customer_id), a draft invoice, one invoice item for the royalty, then the
 * invoice finalised and sent. Each call carries an idempotency key derived from shop and month, and
 * every id is stored as soon as it is known, so issuing again (or after a failure half-way) resumes
 * where it stopped and never bills twice. Shops with nothing due get no invoice.
 */
export async function issueRoyaltyInvoices(
  principal: Principal,
  month: string,
  options: { stripe?: Stripe; now?: Date } = {},
): Promise<IssueResult> {
  if (principal.scope.kind !== 'network')
    throw forbidden('Only the owner issues royalty invoices.');
  const conn = await db();
  const close = await currentClose(conn, month);
  if (!close) throw conflict(`Close ${monthLabel(month)} before issuing its royalty invoices.`);
  const stripe = options.stripe ?? stripeFromEnv();
  const now = options.now ?? clock.now();
  const frozen = close.figures;
  const result: IssueResult = {
    month,
    issued: 0,
    alreadyIssued: 0,
    nothingDue: 0,
    failed: 0,
    invoices: [],
  };
  for (const figures of frozen.shops) {
    const base = {
      shopId: figures.shop.id,
      shopName: figures.shop.name,
      amountCents: figures.royaltyCents,
    };
    if (figures.royaltyCents <= 0) {
      result.nothingDue += 1;
      result.invoices.push({
        ...base,
        outcome: 'nothing_due',
        status: null,
        stripeInvoiceId: null,
      });
      continue;
    }
    const row = await invoiceRow(conn, close.id, month, figures, frozen.currency);
    if (row.issuedAt && row.stripeInvoiceId) {
      result.alreadyIssued += 1;
      result.invoices.push({
        ...base,
        amountCents: row.amountCents,
        outcome: 'already_issued',
        status: row.status,
        stripeInvoiceId: row.stripeInvoiceId,
      });
      continue;
    }
    try {
      const done = await issueOne(conn, stripe, row, figures, now);
      result.issued += 1;
      result.invoices.push({
        ...base,
        amountCents: done.amountCents,
        outcome: 'issued',
        status: done.status,
        stripeInvoiceId: done.stripeInvoiceId,
      });
    } catch (error) {
      const message = error instanceof Error ? error.message : String(error);
      await conn
        .update(royaltyInvoices)
        .set({ lastError: message.slice(0, 500) })
        .where(eq(royaltyInvoices.id, row.id));
      result.failed += 1;
      result.invoices.push({
        ...base,
        outcome: 'failed',
        status: row.status,
        stripeInvoiceId: row.stripeInvoiceId,
        error: message,
      });
    }
  }
  await conn.insert(activityLog).values({
    at: now,
    userId: principal.id,
    action: 'month.invoices',
    entityType: 'month_close',
    entityId: close.id,
    after: {
      month,
      issued: result.issued,
      alreadyIssued: result.alreadyIssued,
      failed: result.failed,
    },
  });
  return result;
}

/**
 * The shop's invoice row for the month, created on first issue. One row per shop and month, ever:
 * a row from an earlier close that never reached the provider takes the new close's amount (under a
 * new key, since a key must not be reused with other parameters); an issued one is left alone.
 */
async function invoiceRow(
  conn: Db,
  closeId: number,
  month: string,
  figures: ShopFigures,
  currency: string,
): Promise<RoyaltyInvoice> {
  const values = {
    monthCloseId: closeId,
    shopId: figures.shop.id,
    month,
    revenueCents: figures.money.billedCents,
    royaltyRateBp: figures.shop.royaltyRateBp,
    amountCents: figures.royaltyCents,
    currency,
    idempotencyKey: invoiceKey(month, figures.shop.id),
  };
  await conn
    .insert(royaltyInvoices)
    .values(values)
    .onConflictDoNothing({
      target: [royaltyInvoices.shopId, royaltyInvoices.month],
    });
  const [row] = await conn
    .select()
    .from(royaltyInvoices)
    .where(and(eq(royaltyInvoices.shopId, figures.shop.id), eq(royaltyInvoices.month, month)));
  if (!row) throw new Error(`royalty invoice row for shop ${figures.shop.id} vanished`);
  if (
    !row.stripeInvoiceId &&
    row.monthCloseId !== closeId &&
    row.amountCents !== values.amountCents
  ) {
    const [updated] = await conn
      .update(royaltyInvoices)
      .set({ ...values, idempotencyKey: `${values.idempotencyKey}:close-${closeId}` })
      .where(and(eq(royaltyInvoices.id, row.id), isNull(royaltyInvoices.stripeInvoiceId)))
      .returning();
    return updated ?? row;
  }
  return row;
}

async function shopCustomer(conn: Db, stripe: Stripe, shopId: number): Promise<string> {
  const [shop] = await conn.select().from(shops).where(eq(shops.id, shopId));
  if (!shop) throw new Error(`shop ${shopId} not found`);
  if (shop.stripeCustomerId) return shop.stripeCustomerId;
  const customer = await stripe.customers.create(
    {
      name: shop.name,
      email: shop.email ?? undefined,
      metadata: { reelwright_shop_id: String(shop.id) },
    },
    { idempotencyKey: customerKey(shop.id) },
  );
  // Two issues racing get the same customer (same key); either write is the same id.
  await conn
    .update(shops)
    .set({ stripeCustomerId: customer.id })
    .where(and(eq(shops.id, shop.id), isNull(shops.stripeCustomerId)));
  return customer.id;
}

async function issueOne(
  conn: Db,
  stripe: Stripe,
  row: RoyaltyInvoice,
  figures: ShopFigures,
  now: Date,
): Promise<RoyaltyInvoice> {
  const key = row.idempotencyKey;
  const save = async (patch: Partial<RoyaltyInvoice>) => {
    const [updated] = await conn
      .update(royaltyInvoices)
      .set({ ...patch, lastError: null })
      .where(eq(royaltyInvoices.id, row.id))
      .returning();
    row = updated!;
  };
  const label = monthLabel(row.month);
  const currency = row.currency.toLowerCase();
  const metadata = {
    reelwright_royalty_invoice_id: String(row.id),
    reelwright_shop_id: String(row.shopId),
    month: row.month,
  };
  const customer = row.stripeCustomerId ?? (await shopCustomer(conn, stripe, row.shopId));
  if (!row.stripeCustomerId) await save({ stripeCustomerId: customer });

  let invoice: Stripe.Invoice;
  if (!row.stripeInvoiceId) {
    invoice = await stripe.invoices.create(
      {
        customer,
        currency,
        collection_method: 'send_invoice',
        days_until_due: 30,
        auto_advance: false,
        pending_invoice_items_behavior: 'exclude',
        description: `Royalty for ${label}, ${figures.shop.name}`,
        metadata,
      },
      { idempotencyKey: `${key}:invoice` },
    );
    await save({ stripeInvoiceId: invoice.id });
  } else {
    invoice = await stripe.invoices.retrieve(row.stripeInvoiceId);
  }
  if (!row.stripeInvoiceItemId && invoice.status === 'draft') {
    const rate = (row.royaltyRateBp / 100).toFixed(2);
    const item = await stripe.invoiceItems.create(
      {
        customer,
        invoice: invoice.id,
        amount: row.amountCents,
        currency,
        description: `Royalty ${label}: ${rate}% of ${money(row.revenueCents)} ${row.currency} billed revenue`,
        metadata,
      },
      { idempotencyKey: `${key}:item` },
    );
    await save({ stripeInvoiceItemId: item.id });
  }
  if (invoice.status === 'draft') {
    invoice = await stripe.invoices.finalizeInvoice(
      invoice.id!,
      { auto_advance: false },
      { idempotencyKey: `${key}:finalize` },
    );
  }
  if (invoice.status === 'open') {
    invoice = await stripe.invoices.sendInvoice(invoice.id!, {}, { idempotencyKey: `${key}:send` });
  }
  await save({
    status: invoice.status === 'paid' ? 'paid' : invoice.status === 'void' ? 'void' : 'open',
    hostedInvoiceUrl: invoice.hosted_invoice_url ?? null,
    issuedAt: row.issuedAt ?? now,
  });
  return row;
}
