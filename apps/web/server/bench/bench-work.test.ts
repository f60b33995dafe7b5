import { eq } from '@reelwright/db';
import { benchSessions } from '@reelwright/db/schema';
import { NextRequest } from 'next/server';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { closeMemoryDb, openMemoryDb, testState as state } from '~/server/testing/memory-db';
import type { Principal } from '../principal';
import { getJobDetail } from '../queries/bench';
import { buildNetwork, type Network } from './fixture';
import { patchJob, transitionJob } from './jobs';
import { addPart, deletePart, recordBenchTime, setChecklist } from './work';
import { est, expectApiError, jobMaker } from './test-support';

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

const { checkInBody, newJob, jobIn } = jobMaker(() => net);

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
