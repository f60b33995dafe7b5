import { TZDate } from '@date-fns/tz';
import { and, asc, eq, inArray, isNotNull, type Db } from '@reelwright/db';
import {
  customers,
  reels,
  remindersSent,
  shops,
  type UseProfile,
  type WaterType,
} from '@reelwright/db/schema';
import { civilDayNumber, nextServiceDue } from '@reelwright/metrics';
import { format } from 'date-fns';
import { db } from '../db';
import { notFound } from '../errors';
import type { Principal } from '../principal';
import { shopScope } from '../queries/scope';
import * as clock from '~/server/clock';

export type ReminderState = 'to_send' | 'sent' | 'no_consent' | 'no_email';

export interface DueReel {
  reelId: number;
  /** "Maker Model Size", as the customer knows it. */
  reel: string;
  useProfile: UseProfile;
  water: WaterType;
  lastServicedOn: string;
  /** The service-due date the reminder is for (local date). */
  dueOn: string;
  overdue: boolean;
  customer: { id: number; name: string; email: string | null; consent: boolean };
  reminder: ReminderState;
  sentAt: Date | null;
}

export interface DueShop {
  id: number;
  name: string;
  timeZone: string;
  seasonStart: string;
  seasonEnd: string;
  email: string | null;
  phone: string | null;
}

export interface DueReport {
  shop: DueShop;
  /** The shop's local date the list is computed for. */
  today: string;
  weeks: number;
  /** Last due date included (today + weeks × 7 days). */
  horizon: string;
  counts: Record<ReminderState, number> & { due: number };
  reels: DueReel[];
}

/** The shop in the caller's scope, with its season; 404 outside it. */
export async function reminderShop(
  conn: Db,
  principal: Principal,
  shopId: number,
): Promise<DueShop> {
  const [shop] = await conn
    .select({
      id: shops.id,
      name: shops.name,
      timeZone: shops.timeZone,
      seasonStart: shops.seasonStart,
      seasonEnd: shops.seasonEnd,
      email: shops.email,
      phone: shops.phone,
    })
    .from(shops)
    .where(and(eq(shops.id, shopId), shopScope(principal)));
  if (!shop) throw notFound('shop');
  return shop;
}

export const localToday = (now: Date, timeZone: string) =>
  format(new TZDate(now, timeZone), 'yyyy-MM-dd');

const DAY = 86_400_000;
const dayString = (day: number) => new Date(day * DAY).toISOString().slice(0, 10);

/** A due date that passed this recently is still reminded (shown as overdue). */
export const GRACE_DAYS = 14;

/**
 * The reel's scheduled service date on or after `from`: the next due date after the last service
 * (`nextServiceDue`), and if that lapsed, the schedule carried on from it — a year later for light
 * use, the next season point for heavy use — so a customer who skipped a service is reminded of
 * the next one rather than of one long past.
 */
export function scheduledDue(
  lastServicedOn: string,
  profile: UseProfile,
  season: { start: string; end: string },
  from: string,
): string {
  let due = nextServiceDue(lastServicedOn, profile, season);
  for (let i = 0; due < from && i < 100; i++) due = nextServiceDue(due, profile, season);
  return due;
}

/**
 * The reels of the shop's customers whose scheduled service (from the last service and use profile,
 * by @reelwright/metrics `nextServiceDue`: a year after for light use; the next of season start,
 * middle and end for heavy use; see `scheduledDue`) falls in the coming `weeks`, or fell due in the
 * last GRACE_DAYS, earliest first. Each says whether a reminder will go (consent and an e-mail
 * address), or already went for that due date.
 */
export async function dueReminders(
  principal: Principal,
  shopId: number,
  weeks: number,
  options: { now?: Date; conn?: Db } = {},
): Promise<DueReport> {
  const conn = options.conn ?? (await db());
  const shop = await reminderShop(conn, principal, shopId);
  const today = localToday(options.now ?? clock.now(), shop.timeZone);
  const horizonDay = civilDayNumber(today) + weeks * 7;
  const from = dayString(civilDayNumber(today) - GRACE_DAYS);
  const season = { start: shop.seasonStart, end: shop.seasonEnd };
  const rows = await conn
    .select({
      reelId: reels.id,
      maker: reels.maker,
      model: reels.model,
      size: reels.size,
      useProfile: reels.useProfile,
      water: reels.water,
      lastServicedOn: reels.lastServicedOn,
      customerId: customers.id,
      name: customers.name,
      email: customers.email,
      consent: customers.reminderConsent,
    })
    .from(reels)
    .innerJoin(customers, eq(customers.id, reels.customerId))
    .where(and(eq(customers.shopId, shop.id), isNotNull(reels.lastServicedOn)))
    .orderBy(asc(reels.id));
  const due = rows
    .map((r) => ({ ...r, dueOn: scheduledDue(r.lastServicedOn!, r.useProfile, season, from) }))
    .filter((r) => civilDayNumber(r.dueOn) <= horizonDay);
  const sent = due.length
    ? await conn
        .select({
          reelId: remindersSent.reelId,
          dueOn: remindersSent.dueOn,
          sentAt: remindersSent.sentAt,
        })
        .from(remindersSent)
        .where(
          inArray(
            remindersSent.reelId,
            due.map((r) => r.reelId),
          ),
        )
    : [];
  const sentAt = new Map(sent.map((s) => [`${s.reelId}:${s.dueOn}`, s.sentAt]));
  const counts = { due: due.length, to_send: 0, sent: 0, no_consent: 0, no_email: 0 };
  const list = due
    .map((r): DueReel => {
      const at = sentAt.get(`${r.reelId}:${r.dueOn}`) ?? null;
      const reminder: ReminderState = at
        ? 'sent'
        : !r.consent
          ? 'no_consent'
          : !r.email
            ? 'no_email'
            : 'to_send';
      counts[reminder] += 1;
      return {
        reelId: r.reelId,
        reel: [r.maker, r.model, r.size].filter(Boolean).join(' '),
        useProfile: r.useProfile,
        water: r.water,
        lastServicedOn: r.lastServicedOn!,
        dueOn: r.dueOn,
        overdue: r.dueOn < today,
        customer: { id: r.customerId, name: r.name, email: r.email, consent: r.consent },
        reminder,
        sentAt: at,
      };
    })
    .sort((a, b) => (a.dueOn === b.dueOn ? a.reelId - b.reelId : a.dueOn < b.dueOn ? -1 : 1));
  return { shop, today, weeks, horizon: dayString(horizonDay), counts, reels: list };
}
