import { and, asc, eq, isNotNull, sql, type Tx } from '@reelwright/db';
import { jobEvents, jobs, shops, type OpeningHours } from '@reelwright/db/schema';
import { jobTurnaround } from '@reelwright/metrics';
import { WEEKDAYS, type ShopCalendarInput } from '~/lib/validators/shops';
import { shopCalendar } from '../bench/calendar';
import { logActivity } from '../bench/shared';
import { waitingSpans } from '../bench/jobs';
import { db } from '../db';
import { notFound } from '../errors';
import type { Principal } from '../principal';
import * as clock from '~/server/clock';

export interface ShopCalendarView {
  shop: { id: number; name: string; timeZone: string };
  weekly: Required<OpeningHours>;
  closedDates: string[];
}

export interface SavedShopCalendar extends ShopCalendarView {
  /** Jobs that had become ready, whose turnaround was computed again on the new calendar. */
  recomputed: number;
  /** Those whose stored turnaround changed. */
  changed: number;
}

function view(
  shop: Pick<
    typeof shops.$inferSelect,
    'id' | 'name' | 'timeZone' | 'openingHours' | 'closedDates'
  >,
): ShopCalendarView {
  return {
    shop: { id: shop.id, name: shop.name, timeZone: shop.timeZone },
    weekly: Object.fromEntries(
      WEEKDAYS.map((d) => [d, shop.openingHours[d] ?? []]),
    ) as Required<OpeningHours>,
    closedDates: [...shop.closedDates].sort(),
  };
}

/** A shop's weekly hours and closed dates (the owner's settings; any shop of the network). */
export async function shopCalendarView(shopId: number): Promise<ShopCalendarView> {
  const [shop] = await (await db()).select().from(shops).where(eq(shops.id, shopId)).limit(1);
  if (!shop) throw notFound('shop');
  return view(shop);
}

/**
 * Business-time turnaround of every job of the shop that has become ready, computed again by the
 * metrics engine on the shop's calendar as it now stands (waiting spells from each job's
 * timeline, rounded to whole minutes as when the job became ready) and stored where it changed,
 * in one statement, so the monthly figures' triggers recompute each month once.
 */
async function recomputeTurnarounds(tx: Tx, shop: typeof shops.$inferSelect) {
  const calendar = shopCalendar(shop);
  const ready = await tx
    .select({
      id: jobs.id,
      checkedInAt: jobs.checkedInAt,
      readyAt: jobs.readyAt,
      customer: jobs.customerTurnaroundMinutes,
      bench: jobs.benchTurnaroundMinutes,
      waiting: jobs.waitingPartsMinutes,
    })
    .from(jobs)
    .where(and(eq(jobs.shopId, shop.id), isNotNull(jobs.readyAt)));
  const events = await tx
    .select({ jobId: jobEvents.jobId, toState: jobEvents.toState, at: jobEvents.at })
    .from(jobEvents)
    .innerJoin(jobs, eq(jobs.id, jobEvents.jobId))
    .where(and(eq(jobs.shopId, shop.id), isNotNull(jobs.readyAt)))
    .orderBy(asc(jobEvents.jobId), asc(jobEvents.at), asc(jobEvents.id));
  const timelines = new Map<number, { toState: (typeof events)[number]['toState']; at: Date }[]>();
  for (const e of events) {
    if (!timelines.has(e.jobId)) timelines.set(e.jobId, []);
    timelines.get(e.jobId)!.push(e);
  }
  const changed: { id: number; c: number; b: number; w: number }[] = [];
  for (const job of ready) {
    const t = jobTurnaround(
      {
        checkedInAt: job.checkedInAt,
        readyAt: job.readyAt!,
        waitingSpans: waitingSpans(timelines.get(job.id) ?? []),
      },
      calendar,
    );
    const c = Math.round(t.customerMinutes);
    const w = Math.round(t.waitingMinutes);
    if (c !== job.customer || c - w !== job.bench || w !== job.waiting) {
      changed.push({ id: job.id, c, b: c - w, w });
    }
  }
  if (changed.length > 0) {
    const list = (f: (r: (typeof changed)[number]) => number) => `{${changed.map(f).join(',')}}`;
    await tx.execute(sql`
      update jobs set customer_turnaround_minutes = v.c, bench_turnaround_minutes = v.b,
        waiting_parts_minutes = v.w, updated_at = now()
      from unnest(${list((r) => r.id)}::int[], ${list((r) => r.c)}::int[],
        ${list((r) => r.b)}::int[], ${list((r) => r.w)}::int[]) as v(id, c, b, w)
      where jobs.id = v.id`);
  }
  return { recomputed: ready.length, changed: changed.length };
}

/**
 * `PUT /api/shops/{id}/calendar`: the owner sets a shop's weekly opening hours and closed dates.
 * Business-time turnaround depends on them, so in the same transaction every ready job's stored
 * turnaround is computed again (the network figures follow through the monthly figures' triggers);
 * the change is kept in the activity log.
 */
export async function saveShopCalendar(
  principal: Principal,
  shopId: number,
  input: ShopCalendarInput,
  options: { now?: Date } = {},
): Promise<SavedShopCalendar> {
  const now = options.now ?? clock.now();
  const weekly: OpeningHours = Object.fromEntries(
    WEEKDAYS.filter((d) => input.weekly[d].length > 0).map((d) => [d, input.weekly[d]]),
  );
  const closedDates = [...input.closedDates].sort();
  return (await db()).transaction(async (tx) => {
    const [before] = await tx.select().from(shops).where(eq(shops.id, shopId)).for('update');
    if (!before) throw notFound('shop');
    const [after] = await tx
      .update(shops)
      .set({ openingHours: weekly, closedDates })
      .where(eq(shops.id, shopId))
      .returning();
    const counts = await recomputeTurnarounds(tx, after!);
    await logActivity(tx, {
      principal,
      action: 'shop.calendar',
      entityType: 'shop',
      entityId: shopId,
      shopId,
      before: { openingHours: before.openingHours, closedDates: before.closedDates },
      after: { openingHours: weekly, closedDates, ...counts },
      at: now,
    });
    return { ...view(after!), ...counts };
  });
}
