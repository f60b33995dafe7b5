import { TZDate } from '@date-fns/tz';
import { and, asc, eq, type Db } from '@reelwright/db';
import { networkSettings, scheduledMarks, shops, users } from '@reelwright/db/schema';
import { scopeOf, type Principal } from '../principal';
import { localToday } from '../reminders/due';
import { runBatch, startReminderBatch } from '../reminders/send';

/** Local hour from which Monday's run may go out (the job runs hourly, so 08:00–08:59 usually). */
export const RUN_FROM_HOUR = 8;
/** How far ahead the weekly run looks for service due dates, as the reminders page defaults to. */
export const WEEKLY_WEEKS = 4;

export interface WeeklyRunResult {
  /** Shops whose run went out now. */
  ran: { shopId: number; total: number }[];
  /** Why nothing ran at all (the owner turned it off). */
  off?: boolean;
}

/**
 * The weekly service-reminder run: for each shop where it is Monday, from 08:00 local time, the
 * reminders due in the next four weeks are sent as a batch started by the network's owner, as if
 * they had pressed "Send" on the reminders page. A mark per (shop, that Monday) taken after the run
 * says it is done; a run cut short is finished by the next hourly attempt, and the unique key of
 * reminders_sent means no customer is reminded twice for one due date either way.
 */
export async function runWeeklyReminders(
  conn: Db,
  now: Date,
  options: { baseUrl: string },
): Promise<WeeklyRunResult> {
  const [settings] = await conn
    .select({ on: networkSettings.weeklyReminders })
    .from(networkSettings)
    .where(eq(networkSettings.id, 1));
  if (settings && !settings.on) return { ran: [], off: true };
  const owner = await ownerPrincipal(conn);
  if (!owner) return { ran: [] };
  const result: WeeklyRunResult = { ran: [] };
  const all = await conn
    .select({ id: shops.id, timeZone: shops.timeZone })
    .from(shops)
    .orderBy(asc(shops.id));
  for (const shop of all) {
    const local = new TZDate(now, shop.timeZone);
    if (local.getDay() !== 1 || local.getHours() < RUN_FROM_HOUR) continue;
    const monday = localToday(now, shop.timeZone);
    const [done] = await conn
      .select({ id: scheduledMarks.id })
      .from(scheduledMarks)
      .where(
        and(
          eq(scheduledMarks.kind, 'weekly_reminders'),
          eq(scheduledMarks.entityId, shop.id),
          eq(scheduledMarks.onDate, monday),
        ),
      );
    if (done) continue;
    const started = await startReminderBatch(
      owner,
      { shopId: shop.id, weeks: WEEKLY_WEEKS },
      { now },
    );
    await runBatch(started, { baseUrl: options.baseUrl, now });
    const [mark] = await conn
      .insert(scheduledMarks)
      .values({ kind: 'weekly_reminders', entityId: shop.id, onDate: monday })
      .onConflictDoNothing()
      .returning({ id: scheduledMarks.id });
    if (mark) result.ran.push({ shopId: shop.id, total: started.batch.total });
  }
  return result;
}

/** The network's first active owner, on whose behalf scheduled batches are recorded. */
async function ownerPrincipal(conn: Db): Promise<Principal | null> {
  const [owner] = await conn
    .select({
      id: users.id,
      name: users.name,
      email: users.email,
      role: users.role,
      shopId: users.shopId,
      regionId: users.regionId,
    })
    .from(users)
    .where(and(eq(users.role, 'owner'), eq(users.active, true)))
    .orderBy(asc(users.id))
    .limit(1);
  return owner ? { ...owner, scope: scopeOf(owner) } : null;
}
