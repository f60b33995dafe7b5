import { and, asc, eq, type Db } from '@reelwright/db';
import {
  comebacks,
  customers,
  emails,
  jobs,
  networkSettings,
  reels,
  rootCauses,
  users,
} from '@reelwright/db/schema';
import { NextRequest } from 'next/server';
import { testState } from '~/server/testing/memory-db';
import { checkIn } from '../bench/check-in';
import type { Network } from '../bench/fixture';
import { scopeOf, type Principal } from '../principal';

// What the comeback unit tests share: the bench fixture network with a Kelp shop lead, root causes
// and network settings; reels with a collected job behind them; calls through a route handler.

export const DAY = 86_400_000;
// Monday 2 November 2026, 10:00 in New York (UTC−5).
export const NOW = new Date(Date.UTC(2026, 10, 2, 15, 0));
export const PROMISED = '2026-11-06';

/** Network settings, the owner's root causes and a lead at Kelp, on top of the bench network. */
export async function addComebackSetup(db: Db, net: Network): Promise<{ kelpLead: Principal }> {
  await db.insert(networkSettings).values({ id: 1, networkName: 'Test network' });
  await db.insert(rootCauses).values([
    { code: 'lubrication_missed', label: 'Lubrication missed', position: 0 },
    { code: 'drag_stack_not_serviced', label: 'Drag stack not serviced', position: 1 },
    { code: 'retired_cause', label: 'Retired cause', position: 2, active: false },
  ]);
  const [lead] = await db
    .insert(users)
    .values({
      email: 'lead.kelp@t.test',
      name: 'Kira Kelplead',
      passwordHash: 'x',
      role: 'shop_lead',
      shopId: net.shops.kelp.id,
    })
    .returning();
  return { kelpLead: { ...lead!, scope: scopeOf(lead!) } };
}

export function comebackHelpers(network: () => Network) {
  const db = () => testState.handle!.db;
  let serial = 0;

  /** A fresh customer and reel at the shop, with one earlier job collected `lagMs` before NOW. */
  async function reelWithHistory(opts: {
    lagMs: number;
    customerShop?: 'dune' | 'kelp';
    jobShop?: 'dune' | 'kelp';
    technicianId?: number;
  }) {
    serial += 1;
    const net = network();
    const customerShop = net.shops[opts.customerShop ?? 'dune'];
    const jobShop = net.shops[opts.jobShop ?? 'dune'];
    const [customer] = await db()
      .insert(customers)
      .values({ shopId: customerShop.id, name: `Cora Comeback ${serial}` })
      .returning();
    const [reel] = await db()
      .insert(reels)
      .values({
        customerId: customer!.id,
        kind: 'spinning',
        maker: 'Testmaker',
        model: `R${serial}`,
      })
      .returning();
    const collectedAt = new Date(NOW.getTime() - opts.lagMs);
    const [original] = await db()
      .insert(jobs)
      .values({
        shopId: jobShop.id,
        customerId: customer!.id,
        reelId: reel!.id,
        serviceType: 'tune_up',
        state: 'collected',
        technicianId: opts.technicianId ?? net.as.tech.id,
        serviceStandardId: net.standard.id,
        checkedInAt: new Date(collectedAt.getTime() - 10 * DAY),
        readyAt: new Date(collectedAt.getTime() - 2 * DAY),
        collectedAt,
      })
      .returning();
    return { customer: customer!, reel: reel!, original: original! };
  }

  async function checkInReel(
    who: Principal,
    r: { customer: { id: number }; reel: { id: number } },
    complaint = 'Drag slips again.',
  ) {
    return checkIn(
      who,
      {
        customer: { id: r.customer.id },
        reel: { id: r.reel.id },
        serviceType: 'repair',
        promisedOn: PROMISED,
        complaint,
      },
      { now: NOW },
    );
  }

  async function comebackOf(jobId: number) {
    const [row] = await db().select().from(comebacks).where(eq(comebacks.jobId, jobId));
    return row;
  }

  async function mailFor(comebackId: number) {
    return db()
      .select()
      .from(emails)
      .where(and(eq(emails.entityType, 'comeback'), eq(emails.entityId, comebackId)))
      .orderBy(asc(emails.id));
  }

  async function call(
    principal: Principal,
    handler: (r: NextRequest, c: { params: Promise<Record<string, string>> }) => Promise<Response>,
    method: string,
    path: string,
    params: Record<string, string> = {},
    body?: unknown,
  ) {
    testState.principal = principal;
    const request = new NextRequest(`http://localhost${path}`, {
      method,
      body: body === undefined ? undefined : JSON.stringify(body),
      headers: { 'content-type': 'application/json' },
    });
    const response = await handler(request, { params: Promise.resolve(params) });
    return {
      status: response.status,
      type: response.headers.get('content-type'),
      body: (await response.json()) as Record<string, unknown> & {
        errors?: { field: string; message: string }[];
      },
    };
  }

  return { reelWithHistory, checkInReel, comebackOf, mailFor, call };
}
