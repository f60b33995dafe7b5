import { eq, sql } from '@reelwright/db';
import { activityLog, jobs } from '@reelwright/db/schema';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { formatDayHours, parseDayHours, shopCalendarInput } from '~/lib/validators/shops';
import { closeMemoryDb, openMemoryDb, testState as state } from '~/server/testing/memory-db';
import type { Principal } from '../principal';
import { checkIn } from '../bench/check-in';
import { buildNetwork, type Network } from '../bench/fixture';
import { transitionJob } from '../bench/jobs';
import { est, jobMaker } from '../bench/test-support';
import { saveShopCalendar, shopCalendarView } from './calendar';

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));

let net: Network;
const db = () => state.handle!.db;

beforeAll(async () => {
  await openMemoryDb();
  net = await buildNetwork(state.handle!.db);
}, 60_000);
afterAll(closeMemoryDb);

const { checkInBody } = jobMaker(() => net);

async function readyJob(who: Principal, checkedIn: Date, waits: [Date, Date] | null, ready: Date) {
  const { id } = await checkIn(who, checkInBody(), { now: checkedIn });
  await transitionJob(who, id, { to: 'on_bench' }, { now: checkedIn });
  if (waits) {
    await transitionJob(who, id, { to: 'waiting_parts' }, { now: waits[0] });
    await transitionJob(who, id, { to: 'on_bench' }, { now: waits[1] });
  }
  await transitionJob(who, id, { to: 'ready', reason: 'Test' }, { now: ready });
  return id;
}

const stored = async (id: number) => {
  const [row] = await db()
    .select({
      c: jobs.customerTurnaroundMinutes,
      b: jobs.benchTurnaroundMinutes,
      w: jobs.waitingPartsMinutes,
    })
    .from(jobs)
    .where(eq(jobs.id, id));
  return row;
};

const weekdays = { open: '09:00', close: '17:00' };

describe('shop calendar', () => {
  it('owner – new hours and closed dates recompute every ready job’s stored turnaround, and the network’s monthly figures follow', async () => {
    // Dune opens Monday to Friday 09:00–17:00. Checked in Monday 10:00, waiting on parts Monday
    // 15:00 to Tuesday 11:00, ready Wednesday 10:00: customer 7 h + 8 h + 1 h = 960 min, waiting
    // 2 h + 2 h = 240 min, bench 720 min.
    const id = await readyJob(
      net.as.tech,
      est(2, '10:00'),
      [est(2, '15:00'), est(3, '11:00')],
      est(4, '10:00'),
    );
    expect(await stored(id)).toEqual({ c: 960, b: 720, w: 240 });

    // Tuesday closed for the season's last weeks, and Monday 12:00–17:00 only: Monday 12:00–17:00
    // counts 5 h (waiting 2 h of it), Tuesday nothing, Wednesday 09:00–10:00 1 h.
    const saved = await saveShopCalendar(
      net.as.owner,
      net.shops.dune.id,
      shopCalendarInput.parse({
        weekly: {
          mon: [{ open: '12:00', close: '17:00' }],
          tue: [weekdays],
          wed: [weekdays],
          thu: [weekdays],
          fri: [weekdays],
          sat: [],
          sun: [],
        },
        closedDates: ['2026-11-26', '2026-11-03'],
      }),
      { now: est(20, '09:00') },
    );
    expect(await stored(id)).toEqual({ c: 360, b: 240, w: 120 });
    expect(saved).toMatchObject({
      recomputed: 1,
      changed: 1,
      closedDates: ['2026-11-03', '2026-11-26'],
    });
    expect(saved.weekly.sat).toEqual([]);

    const { rows } = await db().execute<{ total: number }>(
      sql`select customer_total::int as total from shop_month_figures
        where shop_id = ${net.shops.dune.id} and month = '2026-11-01'`,
    );
    expect(rows[0]!.total).toBe(360);

    const [log] = await db()
      .select()
      .from(activityLog)
      .where(eq(activityLog.action, 'shop.calendar'));
    expect(log).toMatchObject({ userId: net.as.owner.id, entityId: net.shops.dune.id });
    expect(await shopCalendarView(net.shops.dune.id)).toMatchObject({
      weekly: { mon: [{ open: '12:00', close: '17:00' }], sat: [] },
      closedDates: ['2026-11-03', '2026-11-26'],
    });

    // Saving the same calendar again changes nothing.
    const again = await saveShopCalendar(
      net.as.owner,
      net.shops.dune.id,
      shopCalendarInput.parse({ weekly: saved.weekly, closedDates: saved.closedDates }),
    );
    expect(again).toMatchObject({ recomputed: 1, changed: 0 });
  });

  it('reads the form’s hours, and says what is wrong with a span', () => {
    expect(parseDayHours('9:00-12:30, 13:30–17:00')).toEqual({
      spans: [
        { open: '09:00', close: '12:30' },
        { open: '13:30', close: '17:00' },
      ],
    });
    expect(parseDayHours('  ')).toEqual({ spans: [] });
    expect(parseDayHours('17:00–09:00')).toEqual({
      error: '17:00–09:00: Closing time must be after opening time.',
    });
    expect(parseDayHours('nine to five')).toEqual({
      error: '“nine to five” is not a span such as 09:00–17:30.',
    });
    expect(parseDayHours('09:00–25:00')).toMatchObject({
      error: expect.stringContaining('24-hour'),
    });
    expect(formatDayHours([{ open: '09:00', close: '17:00' }])).toBe('09:00–17:00');
    expect(
      shopCalendarInput.safeParse({
        weekly: { mon: [], tue: [], wed: [], thu: [], fri: [], sat: [], sun: [] },
        closedDates: ['2026-12-25', '2026-12-25'],
      }).success,
    ).toBe(false);
  });

  it('an unknown shop is not found', async () => {
    await expect(shopCalendarView(99_999)).rejects.toMatchObject({ status: 404 });
  });
});
