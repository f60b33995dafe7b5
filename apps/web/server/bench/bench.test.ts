import { asc, eq } from '@reelwright/db';
import { activityLog, customers, emails, jobEvents, jobs, reels } from '@reelwright/db/schema';
import { jobTurnaround } from '@reelwright/metrics';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { JOB_STATES, type JobState } from '~/lib/labels';
import { checkInInput, NEXT_STATES } from '~/lib/validators/jobs';
import { closeMemoryDb, openMemoryDb, testState as state } from '~/server/testing/memory-db';
import { getJobDetail } from '../queries/bench';
import { shopCalendar } from './calendar';
import { checkIn } from './check-in';
import { buildNetwork, type Network } from './fixture';
import { transitionJob, waitingSpans } from './jobs';
import { recordBenchTime, setChecklist } from './work';
import { est, expectApiError, jobMaker, MON } from './test-support';

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));
vi.mock('~/server/session', () =>
  import('~/server/testing/memory-db').then((m) => m.sessionModule),
);

let net: Network;
const db = () => state.handle!.db;

beforeAll(async () => {
  await openMemoryDb();
  net = await buildNetwork(state.handle!.db);
}, 60_000);

afterAll(async () => {
  await closeMemoryDb();
});

const { newJob, jobIn } = jobMaker(() => net);

describe('check-in', () => {
  it('technician – adds a new customer and reel and opens the job with its first event', async () => {
    const { id } = await checkIn(
      net.as.tech,
      checkInInput.parse({
        customer: {
          name: 'Bea Newcomer',
          phone: '207 555 0111',
          email: 'Bea@Example.test',
          reminderConsent: true,
        },
        reel: {
          kind: 'spinning',
          maker: 'Inventedco',
          model: 'Gull 4000',
          size: '4000',
          bearingCount: 6,
          gearRatio: '5.2:1',
          useProfile: 'heavy',
          water: 'salt',
        },
        serviceType: 'overhaul',
        complaint: 'Grinds under load.',
        condition: 'Salt crust on the rotor.',
        promisedOn: '2026-11-06',
      }),
      { now: MON },
    );
    const job = await getJobDetail(net.as.tech, id);
    expect(job).toMatchObject({
      state: 'checked_in',
      serviceType: 'overhaul',
      complaint: 'Grinds under load.',
      condition: 'Salt crust on the rotor.',
      customer: { name: 'Bea Newcomer', email: 'bea@example.test', reminderConsent: true },
      reel: { kind: 'spinning', maker: 'Inventedco', gearRatio: '5.2:1', water: 'salt' },
      technician: { id: net.as.tech.id },
      promisedOn: '2026-11-06',
      money: { labourCents: 9000, partsCents: 0, totalCents: 9000, labourBasis: 'flat_price' },
      checklist: { standard: { version: 1 } },
    });
    // The promise is the shop's closing time that day, in its own zone.
    expect(job.promisedAt).toEqual(est(6, '17:00'));
    expect(job.events).toMatchObject([
      { fromState: null, toState: 'checked_in', userName: 'Theo Tech' },
    ]);
    const log = await db()
      .select()
      .from(activityLog)
      .where(eq(activityLog.shopId, net.shops.dune.id));
    expect(log.map((l) => l.action)).toEqual(
      expect.arrayContaining(['customer.create', 'reel.create', 'job.check_in']),
    );
  });

  it('technician – the spinning reel gets the spinning-only step, the baitcaster does not', async () => {
    const bait = await getJobDetail(net.as.tech, await newJob());
    const codes = bait.checklist.groups.flatMap((g) => g.steps.map((s) => s.code));
    expect(codes).not.toContain('inspection.bail');
    expect(bait.checklist.applicable).toBe(4);
    const caution = bait.checklist.groups
      .flatMap((g) => g.steps)
      .find((s) => s.code === 'cleaning.degrease');
    expect(caution?.safetyCaution).toContain('Gloves');
  });

  it("technician – cannot check in another shop's customer, or a reel that is not the customer's", async () => {
    await expectApiError(
      newJob({ customer: { id: net.customers.kai.id }, reel: { id: net.reels.kai.id } }),
      404,
    );
    const error = await expectApiError(newJob({ reel: { id: net.reels.kai.id } }), 400);
    expect(error.fieldErrors).toEqual([expect.objectContaining({ field: 'body.reel.id' })]);
  });

  it('technician – a refused check-in writes nothing, not even the new customer', async () => {
    const before = (await db().select().from(customers)).length;
    // The customer is inserted before the reel is found wanting: the whole check-in rolls back.
    const error = await expectApiError(
      newJob({
        customer: { name: 'Never Saved', reminderConsent: false },
        reel: { id: net.reels.kai.id },
      }),
      400,
    );
    expect(error.fieldErrors?.[0]?.field).toBe('body.reel.id');
    expect((await db().select().from(customers)).length).toBe(before);
    const other = await expectApiError(newJob({ technicianId: net.as.kelpTech.id }), 400);
    expect(other.fieldErrors?.[0]?.field).toBe('body.technicianId');
  });

  it('technician – a promised date in the past is refused', async () => {
    const error = await expectApiError(newJob({ promisedOn: '2026-11-01' }), 400);
    expect(error.fieldErrors?.[0]?.field).toBe('body.promisedOn');
  });

  it('technician – a second customer with the same e-mail is refused with a pointer to the search', async () => {
    const error = await expectApiError(
      newJob({
        customer: { name: 'Ada Again', email: 'ADA@example.test', reminderConsent: false },
      }),
      400,
    );
    expect(error.fieldErrors?.[0]).toMatchObject({ field: 'body.customer.email' });
    expect(error.fieldErrors?.[0]?.message).toContain('Ada Testcustomer');
  });
});

describe('transitions', () => {
  it('technician – walks a job checked in → on the bench → waiting on parts → on the bench → ready → collected', async () => {
    const id = await jobIn('collected');
    const job = await getJobDetail(net.as.tech, id);
    expect(job.state).toBe('collected');
    expect(job.events.map((e) => e.toState)).toEqual([
      'checked_in',
      'on_bench',
      'waiting_parts',
      'on_bench',
      'ready',
      'collected',
    ]);
    expect(job.events.every((e) => e.userName === 'Theo Tech')).toBe(true);
    expect(job.readyAt).not.toBeNull();
    expect(job.collectedAt).not.toBeNull();
    expect(job.nextStates).toEqual([]);
  });

  for (const from of JOB_STATES) {
    const refused = JOB_STATES.filter((to) => !NEXT_STATES[from].includes(to));
    it(`technician – from ${from} every other move is refused with 409 (${refused.join(', ')})`, async () => {
      const id = await jobIn(from);
      const eventsBefore = await db().select().from(jobEvents).where(eq(jobEvents.jobId, id));
      for (const to of refused) {
        const error = await expectApiError(
          transitionJob(net.as.tech, id, { to, reason: 'x' }, { now: est(20, '10:00') }),
          409,
        );
        expect(error.detail).toContain('cannot move');
      }
      const [job] = await db().select().from(jobs).where(eq(jobs.id, id));
      expect(job!.state).toBe(from);
      expect(await db().select().from(jobEvents).where(eq(jobEvents.jobId, id))).toHaveLength(
        eventsBefore.length,
      );
    });
  }

  it('technician – marking ready with required steps unticked needs a reason, which is kept', async () => {
    const id = await jobIn('on_bench');
    const error = await expectApiError(
      transitionJob(net.as.tech, id, { to: 'ready' }, { now: est(3, '10:00') }),
      400,
    );
    expect(error.fieldErrors?.[0]?.field).toBe('body.reason');
    expect(error.fieldErrors?.[0]?.message).toContain(
      '3 required checklist steps are unticked (Photograph before teardown',
    );
    expect((await getJobDetail(net.as.tech, id)).state).toBe('on_bench');

    await transitionJob(
      net.as.tech,
      id,
      { to: 'ready', reason: 'Customer declined the drag service.' },
      { now: est(3, '10:00') },
    );
    const job = await getJobDetail(net.as.tech, id);
    expect(job.state).toBe('ready');
    expect(job.incompleteChecklistReason).toBe('Customer declined the drag service.');
  });

  it('technician – with every required step ticked no reason is needed, and none is stored', async () => {
    const id = await jobIn('on_bench');
    const detail = await getJobDetail(net.as.tech, id);
    const required = detail.checklist.groups.flatMap((g) => g.steps).filter((s) => s.required);
    await setChecklist(net.as.tech, id, { stepIds: required.map((s) => s.id) });
    await transitionJob(
      net.as.tech,
      id,
      { to: 'ready', reason: 'ignored' },
      { now: est(3, '10:00') },
    );
    const job = await getJobDetail(net.as.tech, id);
    expect(job.state).toBe('ready');
    expect(job.incompleteChecklistReason).toBeNull();
    expect(job.checklist.requiredUnticked).toBe(0);
  });

  it('technician – turnaround stored on ready equals @reelwright/metrics on the same rows', async () => {
    const id = await newJob({}, est(2, '10:00'));
    const moves: [JobState, Date][] = [
      ['on_bench', est(2, '11:00')],
      ['waiting_parts', est(3, '10:00')],
      ['on_bench', est(4, '14:00')],
      ['waiting_parts', est(5, '09:30')],
      ['on_bench', est(9, '16:00')],
    ];
    for (const [to, at] of moves) await transitionJob(net.as.tech, id, { to }, { now: at });
    await recordBenchTime(net.as.tech, id, { minutes: 95 }, { now: est(9, '16:30') });
    const readyAt = est(10, '11:15');
    await transitionJob(net.as.tech, id, { to: 'ready', reason: 'Test' }, { now: readyAt });

    const [row] = await db().select().from(jobs).where(eq(jobs.id, id));
    const events = await db()
      .select()
      .from(jobEvents)
      .where(eq(jobEvents.jobId, id))
      .orderBy(asc(jobEvents.at));
    const expected = jobTurnaround(
      { checkedInAt: row!.checkedInAt, readyAt: row!.readyAt!, waitingSpans: waitingSpans(events) },
      shopCalendar(net.shops.dune),
    );
    expect(row!.readyAt).toEqual(readyAt);
    expect(row!.customerTurnaroundMinutes).toBe(Math.round(expected.customerMinutes));
    expect(row!.waitingPartsMinutes).toBe(Math.round(expected.waitingMinutes));
    expect(row!.benchTurnaroundMinutes).toBe(
      Math.round(expected.customerMinutes) - Math.round(expected.waitingMinutes),
    );
    expect(row!.benchMinutes).toBe(95);
    // Worked by hand: Mon 10:00 → Tue 11:15 a week later, open 9–17 on weekdays: 7 + 8×5 + 2.25 h.
    expect(row!.customerTurnaroundMinutes).toBe((7 + 40 + 2.25) * 60);
    // Waiting: Tue 10:00 → Wed 14:00 (7 + 5 h) and Thu 09:30 → next Mon 16:00 (7.5 + 8 + 7 h).
    expect(row!.waitingPartsMinutes).toBe((12 + 22.5) * 60);
    const [reel] = await db().select().from(reels).where(eq(reels.id, row!.reelId));
    expect(reel!.lastServicedOn).toBe('2026-11-10');
  });

  it('technician – ready queues the pickup e-mail when the customer has an address', async () => {
    const id = await jobIn('on_bench');
    const { emailQueued } = await transitionJob(
      net.as.tech,
      id,
      { to: 'ready', reason: 'Test' },
      { now: est(3, '12:00') },
    );
    expect(emailQueued).toBe(true);
    const [mail] = await db().select().from(emails).where(eq(emails.jobId, id));
    expect(mail).toMatchObject({
      kind: 'job_ready',
      toAddress: 'ada@example.test',
      status: 'pending',
    });
    expect(mail!.subject).toContain('ready for pickup');

    const bare = await newJob({
      customer: { name: 'No Mail', reminderConsent: false },
      reel: { kind: 'fly', maker: 'Flyco', model: 'Arbor', useProfile: 'light', water: 'fresh' },
    });
    await transitionJob(net.as.tech, bare, { to: 'on_bench' }, { now: est(2, '11:00') });
    const result = await transitionJob(
      net.as.tech,
      bare,
      { to: 'ready', reason: 'Test' },
      { now: est(2, '12:00') },
    );
    expect(result.emailQueued).toBe(false);
    expect(await db().select().from(emails).where(eq(emails.jobId, bare))).toHaveLength(0);
  });

  it('technician – going on the bench assigns an unassigned job to them', async () => {
    const id = await newJob({}, MON, net.as.lead);
    expect((await getJobDetail(net.as.lead, id)).technician).toBeNull();
    await transitionJob(net.as.tech2, id, { to: 'on_bench' }, { now: est(2, '11:00') });
    expect((await getJobDetail(net.as.lead, id)).technician?.name).toBe('Tess Tech');
  });
});
