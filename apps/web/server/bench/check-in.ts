import { and, desc, eq, inArray, isNotNull, sql, type Tx } from '@reelwright/db';
import {
  customers,
  jobEvents,
  jobs,
  reels,
  serviceStandards,
  shops,
  users,
} from '@reelwright/db/schema';
import type { CheckInInput } from '~/lib/validators/jobs';
import { detectAtCheckIn } from '../comebacks/detect';
import { db } from '../db';
import { badRequest, conflict, forbidden, notFound } from '../errors';
import type { Principal } from '../principal';
import { localDate, promiseInstant, shopCalendar } from './calendar';
import { flatPrice, logActivity } from './shared';
import * as clock from '~/server/clock';

/** The shop a bench write happens in: only a shop's own people check reels in. */
export function benchShopOf(principal: Principal): number {
  if (principal.scope.kind !== 'shop') throw forbidden('Only the people of a shop work its bench.');
  return principal.scope.shopId;
}

/** Someone who works the given shop's bench, or a 400 naming the field. */
export async function assertBenchPerson(conn: Tx, shopId: number, userId: number, field: string) {
  const [person] = await conn
    .select({ id: users.id })
    .from(users)
    .where(
      and(
        eq(users.id, userId),
        eq(users.shopId, shopId),
        eq(users.active, true),
        inArray(users.role, ['technician', 'shop_lead']),
      ),
    );
  if (!person)
    throw badRequest('Some body fields are not valid.', [
      { field, message: 'Choose someone who works at this shop’s bench' },
    ]);
}

/**
 * Checks a reel in: finds or adds the customer and the reel, opens the job under the latest
 * published service standard with the service's flat price as its labour, and records the first
 * event of its timeline; a reel back inside the warranty window is flagged as a comeback and the
 * original shop's lead e-mailed (`comebackId`, `emailsQueued`). All or nothing.
 */
export async function checkIn(
  principal: Principal,
  input: CheckInInput,
  options: { now?: Date } = {},
): Promise<{ id: number; comebackId: number | null; emailsQueued: number }> {
  const now = options.now ?? clock.now();
  const shopId = benchShopOf(principal);
  const conn = await db();
  return conn.transaction(async (tx) => {
    const [shop] = await tx.select().from(shops).where(eq(shops.id, shopId));
    if (!shop) throw notFound('shop');
    if (!shop.active) throw conflict(`${shop.name} is closed: it takes no new jobs.`);
    const calendar = shopCalendar(shop);
    if (input.promisedOn < localDate(now, shop.timeZone))
      throw badRequest('Some body fields are not valid.', [
        { field: 'body.promisedOn', message: 'The promised date cannot be in the past' },
      ]);
    if (input.technicianId !== undefined)
      await assertBenchPerson(tx, shopId, input.technicianId, 'body.technicianId');

    let customerId: number;
    if ('id' in input.customer) {
      const [found] = await tx
        .select({ id: customers.id })
        .from(customers)
        .where(and(eq(customers.id, input.customer.id), eq(customers.shopId, shopId)));
      if (!found) throw notFound('customer');
      customerId = found.id;
    } else {
      const c = input.customer;
      if (c.email) {
        const [same] = await tx
          .select({ name: customers.name })
          .from(customers)
          .where(
            and(eq(customers.shopId, shopId), sql`lower(${customers.email}) = lower(${c.email})`),
          );
        if (same)
          throw badRequest('Some body fields are not valid.', [
            {
              field: 'body.customer.email',
              message: `${same.name} already has this e-mail address: pick them from the search instead`,
            },
          ]);
      }
      const [created] = await tx
        .insert(customers)
        .values({
          shopId,
          name: c.name,
          phone: c.phone ?? null,
          email: c.email ?? null,
          reminderConsent: c.reminderConsent,
          createdAt: now,
        })
        .returning();
      customerId = created!.id;
      await logActivity(tx, {
        principal,
        action: 'customer.create',
        entityType: 'customer',
        entityId: customerId,
        shopId,
        after: { name: c.name, phone: c.phone ?? null, email: c.email ?? null },
        at: now,
      });
    }

    let reelId: number;
    if ('id' in input.reel) {
      const [found] = await tx
        .select({ id: reels.id, customerId: reels.customerId })
        .from(reels)
        .where(eq(reels.id, input.reel.id));
      if (!found || found.customerId !== customerId)
        throw badRequest('Some body fields are not valid.', [
          { field: 'body.reel.id', message: 'That reel does not belong to this customer' },
        ]);
      reelId = found.id;
    } else {
      const r = input.reel;
      const [created] = await tx
        .insert(reels)
        .values({
          customerId,
          kind: r.kind,
          maker: r.maker,
          model: r.model,
          size: r.size ?? null,
          bearingCount: r.bearingCount ?? null,
          gearRatio: r.gearRatio ?? null,
          serialNumber: r.serialNumber ?? null,
          useProfile: r.useProfile,
          water: r.water,
          createdAt: now,
        })
        .returning();
      reelId = created!.id;
      await logActivity(tx, {
        principal,
        action: 'reel.create',
        entityType: 'reel',
        entityId: reelId,
        shopId,
        after: { ...r },
        at: now,
      });
    }

    const [standard] = await tx
      .select({ id: serviceStandards.id })
      .from(serviceStandards)
      .where(isNotNull(serviceStandards.publishedAt))
      .orderBy(desc(serviceStandards.version))
      .limit(1);
    const flat = await flatPrice(tx, shopId, input.serviceType);
    const technicianId =
      input.technicianId ?? (principal.role === 'technician' ? principal.id : null);
    const [job] = await tx
      .insert(jobs)
      .values({
        shopId,
        customerId,
        reelId,
        serviceType: input.serviceType,
        state: 'checked_in',
        stateChangedAt: now,
        technicianId,
        serviceStandardId: standard?.id ?? null,
        complaint: input.complaint ?? null,
        condition: input.condition ?? null,
        checkedInAt: now,
        promisedAt: promiseInstant(input.promisedOn, calendar),
        labourCents: flat ?? 0,
        createdAt: now,
        updatedAt: now,
      })
      .returning();
    await tx.insert(jobEvents).values({
      jobId: job!.id,
      fromState: null,
      toState: 'checked_in',
      at: now,
      userId: principal.id,
    });
    await logActivity(tx, {
      principal,
      action: 'job.check_in',
      entityType: 'job',
      entityId: job!.id,
      shopId,
      after: {
        customerId,
        reelId,
        serviceType: input.serviceType,
        technicianId,
        promisedOn: input.promisedOn,
        labourCents: job!.labourCents,
      },
      at: now,
    });
    const comeback = await detectAtCheckIn(tx, principal, job!, now);
    return {
      id: job!.id,
      comebackId: comeback?.comebackId ?? null,
      emailsQueued: comeback?.emailsQueued ?? 0,
    };
  });
}
