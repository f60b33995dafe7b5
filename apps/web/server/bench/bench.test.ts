import { asc, eq } from '@reelwright/db';
import {
  activityLog,
  benchSessions,
  customers,
  emails,
  jobEvents,
  jobs,
  reels,
} from '@reelwright/db/schema';
import { jobTurnaround } from '@reelwright/metrics';
import { NextRequest } from 'next/server';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { JOB_STATES, type JobState } from '~/lib/labels';
import { checkInInput, NEXT_STATES, type CheckInInput } from '~/lib/validators/jobs';
import { closeMemoryDb, openMemoryDb, testState as state } from '~/server/testing/memory-db';
import { ApiError } from '../errors';
import type { Principal } from '../principal';
import { getJobDetail } from '../queries/bench';
import { shopCalendar } from './calendar';
import { checkIn } from './check-in';
import { buildNetwork, type Network } from './fixture';
import { patchJob, transitionJob, waitingSpans } from './jobs';
import { addPart, deletePart, recordBenchTime, setChecklist } from './work';

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

// Monday 2 November 2026, after the autumn clock change: New York is UTC−5.
const est = (day: number, clock: string) => {
  const [h, m] = clock.split(':').map(Number) as [number, number];
  return new Date(Date.UTC(2026, 10, day, h + 5, m));
};
const MON = est(2, '10:00');

const checkInBody = (over: Partial<CheckInInput> = {}): CheckInInput => ({
  customer: { id: net.customers.ada.id },
  reel: { id: net.reels.ada.id },
  serviceType: 'tune_up',
  promisedOn: '2026-11-06',
  ...over,
});

async function newJob(over: Partial<CheckInInput> = {}, now = MON, who = net.as.tech) {
  const { id } = await checkIn(who, checkInBody(over), { now });
  return id;
}

async function expectApiError(promise: Promise<unknown>, status: number) {
  const error = await promise.then(
    () => null,
    (e: unknown) => e,
  );
  expect(error, `expected a ${status}`).toBeInstanceOf(ApiError);
  expect((error as ApiError).status).toBe(status);
  return error as ApiError;
}

/** Walks a fresh job along the allowed path to `target`. */
async function jobIn(target: JobState) {
  const id = await newJob();
  const path: JobState[] = ['on_bench', 'waiting_parts', 'on_bench', 'ready', 'collected'];
  const stopAfter: Record<JobState, number> = {
    checked_in: 0,
    on_bench: 1,
    waiting_parts: 2,
    ready: 4,
    collected: 5,
  };
  let t = MON.getTime();
  for (const to of path.slice(0, stopAfter[target])) {
    t += 3_600_000;
    await transitionJob(net.as.tech, id, { to, reason: 'Test job' }, { now: new Date(t) });
  }
  return id;
}

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

describe('bench time', () => {
  it('technician – starts and stops a timer; the minutes count on the job', async () => {
    const id = await jobIn('on_bench');
    await recordBenchTime(net.as.tech, id, { action: 'start' }, { now: est(2, '13:00') });
    let job = await getJobDetail(net.as.tech, id);
    expect(job.myRunningSince).toEqual(est(2, '13:00'));
    await recordBenchTime(net.as.tech, id, { action: 'stop' }, { now: est(2, '13:47') });
    await recordBenchTime(net.as.tech, id, { minutes: 20, note: 'Before the timer' });
    job = await getJobDetail(net.as.tech, id);
    expect(job.myRunningSince).toBeNull();
    expect(job.benchMinutes).toBe(67);
    expect(job.sessions.map((s) => s.minutes)).toEqual([47, 20]);
  });

  it('technician – one running timer per technician: a second start is 409, another technician may start', async () => {
    const first = await jobIn('on_bench');
    const second = await jobIn('on_bench');
    await recordBenchTime(net.as.tech, first, { action: 'start' }, { now: est(2, '14:00') });
    const error = await expectApiError(
      recordBenchTime(net.as.tech, second, { action: 'start' }, { now: est(2, '14:05') }),
      409,
    );
    expect(error.detail).toBe(
      `Your timer is already running on job #${first}. Stop it before starting another: one running timer per technician.`,
    );
    await recordBenchTime(net.as.tech2, second, { action: 'start' }, { now: est(2, '14:05') });
    expect((await getJobDetail(net.as.tech, second)).myTimerElsewhere).toBe(first);
    await recordBenchTime(net.as.tech, first, { action: 'stop' }, { now: est(2, '14:30') });
    await recordBenchTime(net.as.tech2, second, { action: 'stop' }, { now: est(2, '14:30') });
    const running = await db().select().from(benchSessions).where(eq(benchSessions.jobId, second));
    expect(running.map((s) => [s.technicianId, s.minutes])).toEqual([[net.as.tech2.id, 25]]);
  });

  it('technician – a timer needs the job on the bench, and stop needs a running timer', async () => {
    const id = await jobIn('checked_in');
    expect(
      (await expectApiError(recordBenchTime(net.as.tech, id, { action: 'start' }), 409)).detail,
    ).toContain('on the bench');
    const onBench = await jobIn('on_bench');
    expect(
      (await expectApiError(recordBenchTime(net.as.tech, onBench, { action: 'stop' }), 409)).detail,
    ).toContain('no timer running');
  });

  it('technician – waiting on parts stops the running timer', async () => {
    const id = await jobIn('on_bench');
    await recordBenchTime(net.as.tech, id, { action: 'start' }, { now: est(2, '15:00') });
    await transitionJob(net.as.tech, id, { to: 'waiting_parts' }, { now: est(2, '15:30') });
    const job = await getJobDetail(net.as.tech, id);
    expect(job.myRunningSince).toBeNull();
    expect(job.benchMinutes).toBe(30);
  });

  it('technician – bench-time labour follows the logged minutes at the posted rate', async () => {
    const id = await newJob({ serviceType: 'repair' });
    await transitionJob(net.as.tech, id, { to: 'on_bench' }, { now: est(2, '11:00') });
    await recordBenchTime(net.as.tech, id, { minutes: 90 });
    let job = await getJobDetail(net.as.tech, id);
    // $60.00 an hour at the Dune shop.
    expect(job.money).toMatchObject({ labourCents: 9000, labourBasis: 'bench_time' });
    await recordBenchTime(net.as.tech, id, { minutes: 15 });
    job = await getJobDetail(net.as.tech, id);
    expect(job.money.labourCents).toBe(10500);
    const error = await expectApiError(
      patchJob(net.as.tech, id, { labourBasis: 'flat_price' }),
      400,
    );
    expect(error.fieldErrors?.[0]?.field).toBe('body.labourBasis');
  });
});

describe('parts, money and record', () => {
  it('technician – part lines keep the parts total; total = labour + parts − discount', async () => {
    const id = await jobIn('on_bench');
    await addPart(net.as.tech, id, {
      name: 'Drag washer set',
      partNumber: 'T-DW-1',
      quantity: 2,
      unitPriceCents: 1450,
    });
    const { id: clip } = await addPart(net.as.tech, id, {
      name: 'E-clip',
      quantity: 3,
      unitPriceCents: 150,
    });
    let job = await getJobDetail(net.as.tech, id);
    expect(job.money).toMatchObject({ labourCents: 4500, partsCents: 3350, totalCents: 7850 });
    expect(job.parts.map((p) => p.lineCents)).toEqual([2900, 450]);

    await patchJob(net.as.tech, id, { discountCents: 850, findings: 'Cracked handle cap.' });
    job = await getJobDetail(net.as.tech, id);
    expect(job.money).toMatchObject({ discountCents: 850, totalCents: 7000 });
    expect(job.findings).toBe('Cracked handle cap.');

    await deletePart(net.as.tech, id, clip);
    job = await getJobDetail(net.as.tech, id);
    expect(job.money).toMatchObject({ partsCents: 2900, totalCents: 6550 });

    const error = await expectApiError(patchJob(net.as.tech, id, { discountCents: 999_999 }), 400);
    expect(error.fieldErrors?.[0]?.field).toBe('body.discountCents');
    await patchJob(net.as.tech, id, { labourBasis: 'bench_time' });
    expect((await getJobDetail(net.as.tech, id)).money).toMatchObject({
      labourCents: 0,
      discountCents: 850,
      labourBasis: 'bench_time',
    });
  });

  it('technician – a job that reaches ready with no labour charge gets its service’s flat price', async () => {
    const id = await newJob();
    await patchJob(net.as.tech, id, { labourBasis: 'bench_time' });
    expect((await getJobDetail(net.as.tech, id)).money.labourCents).toBe(0);
    await transitionJob(net.as.tech, id, { to: 'on_bench' }, { now: est(2, '11:00') });
    await transitionJob(net.as.tech, id, { to: 'ready', reason: 'Test' }, { now: est(2, '12:00') });
    expect((await getJobDetail(net.as.tech, id)).money).toMatchObject({
      labourCents: 4500,
      labourBasis: 'flat_price',
    });
  });

  it('technician – a part of another job cannot be deleted through this one', async () => {
    const a = await jobIn('on_bench');
    const b = await jobIn('on_bench');
    const { id: part } = await addPart(net.as.tech, a, {
      name: 'Knob',
      quantity: 1,
      unitPriceCents: 1200,
    });
    await expectApiError(deletePart(net.as.tech, b, part), 404);
    expect((await getJobDetail(net.as.tech, a)).parts).toHaveLength(1);
  });

  it('technician – a collected job can no longer be changed', async () => {
    const id = await jobIn('collected');
    await expectApiError(
      addPart(net.as.tech, id, { name: 'Knob', quantity: 1, unitPriceCents: 1 }),
      409,
    );
    await expectApiError(patchJob(net.as.tech, id, { findings: 'late' }), 409);
    await expectApiError(setChecklist(net.as.tech, id, { stepIds: [] }), 409);
  });

  it('technician – PUT checklist replaces the ticked set and refuses steps the job does not have', async () => {
    const id = await jobIn('on_bench');
    const [photo, degrease, drag, bail, crank] = net.steps;
    await setChecklist(net.as.tech, id, { stepIds: [photo!.id, degrease!.id, crank!.id] });
    await setChecklist(net.as.tech2, id, { stepIds: [photo!.id, drag!.id] });
    const job = await getJobDetail(net.as.tech, id);
    const ticked = job.checklist.groups.flatMap((g) => g.steps).filter((s) => s.ticked);
    expect(ticked.map((s) => [s.code, s.tickedBy])).toEqual([
      ['teardown.photo', 'Theo Tech'],
      ['drag.washers', 'Tess Tech'],
    ]);
    // The bail step is for spinning reels; this job's reel is a baitcaster.
    const error = await expectApiError(setChecklist(net.as.tech, id, { stepIds: [bail!.id] }), 400);
    expect(error.fieldErrors?.[0]?.field).toBe('body.stepIds');
  });
});

describe('scope and roles', () => {
  it("technician – another shop's job is 404 for reading and for every write", async () => {
    const id = await jobIn('on_bench');
    const k = net.as.kelpTech;
    await expectApiError(getJobDetail(k, id), 404);
    await expectApiError(patchJob(k, id, { findings: 'x' }), 404);
    await expectApiError(transitionJob(k, id, { to: 'ready', reason: 'x' }), 404);
    await expectApiError(recordBenchTime(k, id, { action: 'start' }), 404);
    await expectApiError(addPart(k, id, { name: 'x', quantity: 1, unitPriceCents: 1 }), 404);
    await expectApiError(setChecklist(k, id, { stepIds: [] }), 404);
    await expectApiError(getJobDetail(net.as.south, id), 404);
    expect((await getJobDetail(net.as.north, id)).id).toBe(id);
    expect((await getJobDetail(net.as.owner, id)).id).toBe(id);
  });

  async function call(
    principal: Principal,
    handler: (r: NextRequest, c: { params: Promise<Record<string, string>> }) => Promise<Response>,
    method: string,
    path: string,
    params: Record<string, string> = {},
    body?: unknown,
  ) {
    state.principal = principal;
    const request = new NextRequest(`http://localhost${path}`, {
      method,
      body: body === undefined ? undefined : JSON.stringify(body),
      headers: { 'content-type': 'application/json' },
    });
    const response = await handler(request, { params: Promise.resolve(params) });
    return {
      status: response.status,
      type: response.headers.get('content-type'),
      body: await response.json(),
    };
  }

  it('regional manager and owner – read jobs but every bench write is 403', async () => {
    const jobsRoute = await import('~/app/api/jobs/route');
    const one = await import('~/app/api/jobs/[id]/route');
    const transitions = await import('~/app/api/jobs/[id]/transitions/route');
    const sessions = await import('~/app/api/jobs/[id]/bench-sessions/route');
    const parts = await import('~/app/api/jobs/[id]/parts/route');
    const checklist = await import('~/app/api/jobs/[id]/checklist/route');
    const id = String(await jobIn('on_bench'));
    for (const who of [net.as.north, net.as.owner]) {
      expect((await call(who, one.GET, 'GET', `/api/jobs/${id}`, { id })).status).toBe(200);
      expect((await call(who, jobsRoute.GET, 'GET', '/api/jobs')).status).toBe(200);
      const writes = [
        await call(who, jobsRoute.POST, 'POST', '/api/jobs', {}, checkInBody()),
        await call(who, one.PATCH, 'PATCH', `/api/jobs/${id}`, { id }, { findings: 'x' }),
        await call(
          who,
          transitions.POST,
          'POST',
          `/api/jobs/${id}/transitions`,
          { id },
          { to: 'ready', reason: 'x' },
        ),
        await call(
          who,
          sessions.POST,
          'POST',
          `/api/jobs/${id}/bench-sessions`,
          { id },
          { action: 'start' },
        ),
        await call(
          who,
          parts.POST,
          'POST',
          `/api/jobs/${id}/parts`,
          { id },
          { name: 'x', quantity: 1, unitPriceCents: 1 },
        ),
        await call(who, checklist.PUT, 'PUT', `/api/jobs/${id}/checklist`, { id }, { stepIds: [] }),
      ];
      for (const w of writes) {
        expect(w.status).toBe(403);
        expect(w.type).toContain('application/problem+json');
      }
    }
    expect((await getJobDetail(net.as.tech, Number(id))).state).toBe('on_bench');
  });

  it('auditor – every bench route is 403, reads included', async () => {
    const jobsRoute = await import('~/app/api/jobs/route');
    const one = await import('~/app/api/jobs/[id]/route');
    const customersRoute = await import('~/app/api/customers/route');
    const id = String(await jobIn('checked_in'));
    for (const r of [
      await call(net.as.auditor, jobsRoute.GET, 'GET', '/api/jobs'),
      await call(net.as.auditor, one.GET, 'GET', `/api/jobs/${id}`, { id }),
      await call(net.as.auditor, customersRoute.GET, 'GET', '/api/customers?query=ada'),
    ])
      expect(r.status).toBe(403);
  });

  it('technician – through the API: 201 on check-in, 400 with field errors, 409 problem for a refused move', async () => {
    const jobsRoute = await import('~/app/api/jobs/route');
    const transitions = await import('~/app/api/jobs/[id]/transitions/route');
    const created = await call(
      net.as.tech,
      jobsRoute.POST,
      'POST',
      '/api/jobs',
      {},
      checkInBody({ promisedOn: '2099-01-05' }),
    );
    expect(created.status).toBe(201);
    expect(created.body).toMatchObject({ state: 'checked_in', nextStates: ['on_bench'] });
    const bad = await call(
      net.as.tech,
      jobsRoute.POST,
      'POST',
      '/api/jobs',
      {},
      {
        customer: { name: '' },
        reel: { id: 1 },
        serviceType: 'polish',
        promisedOn: 'soon',
      },
    );
    expect(bad.status).toBe(400);
    expect(bad.body.errors.map((e: { field: string }) => e.field)).toEqual(
      expect.arrayContaining(['body.serviceType', 'body.promisedOn']),
    );
    const id = String(created.body.id);
    const refused = await call(
      net.as.tech,
      transitions.POST,
      'POST',
      `/api/jobs/${id}/transitions`,
      { id },
      { to: 'collected' },
    );
    expect(refused).toMatchObject({
      status: 409,
      body: { type: '/problems/conflict', status: 409 },
    });
    expect(refused.type).toContain('application/problem+json');
  });
});
