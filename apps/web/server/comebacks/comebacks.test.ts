import { and, asc, eq } from '@reelwright/db';
import {
  activityLog,
  benchSessions,
  comebacks,
  correctiveActions,
  customers,
  emails,
  jobs,
  networkSettings,
  partLines,
  reels,
  rootCauses,
  users,
} from '@reelwright/db/schema';
import { NextRequest } from 'next/server';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { comebackPatch, comebackSettingsInput } from '~/lib/validators/comebacks';
import { closeMemoryDb, openMemoryDb, testState as state } from '~/server/testing/memory-db';
import { buildNetwork, type Network } from '../bench/fixture';
import { checkIn } from '../bench/check-in';
import { ApiError } from '../errors';
import { scopeOf, type Principal } from '../principal';
import { comebackBreakdown, getComeback, jobComeback, listComebacks } from '../queries/comebacks';
import { linkComeback } from './detect';
import { updateComeback } from './review';
import { saveComebackSettings } from './settings';

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));
vi.mock('~/server/session', () =>
  import('~/server/testing/memory-db').then((m) => m.sessionModule),
);
vi.mock('~/env', async (importOriginal) => {
  const original = await importOriginal<{ env: Record<string, unknown> }>();
  return { env: { ...original.env, APP_BASE_URL: 'https://reelwright.test' } };
});

const DAY = 86_400_000;
// Monday 2 November 2026, 10:00 in New York (UTC−5).
const NOW = new Date(Date.UTC(2026, 10, 2, 15, 0));
const PROMISED = '2026-11-06';

let net: Network;
let kelpLead: Principal;
const db = () => state.handle!.db;

beforeAll(async () => {
  await openMemoryDb();
  net = await buildNetwork(state.handle!.db);
  await db().insert(networkSettings).values({ id: 1, networkName: 'Test network' });
  await db()
    .insert(rootCauses)
    .values([
      { code: 'lubrication_missed', label: 'Lubrication missed', position: 0 },
      { code: 'drag_stack_not_serviced', label: 'Drag stack not serviced', position: 1 },
      { code: 'retired_cause', label: 'Retired cause', position: 2, active: false },
    ]);
  const [lead] = await db()
    .insert(users)
    .values({
      email: 'lead.kelp@t.test',
      name: 'Kira Kelplead',
      passwordHash: 'x',
      role: 'shop_lead',
      shopId: net.shops.kelp.id,
    })
    .returning();
  kelpLead = { ...lead!, scope: scopeOf(lead!) };
}, 60_000);

afterAll(async () => {
  await closeMemoryDb();
});

let serial = 0;

/** A fresh customer and reel at the shop, with one earlier job collected `lagMs` before NOW. */
async function reelWithHistory(opts: {
  lagMs: number;
  customerShop?: 'dune' | 'kelp';
  jobShop?: 'dune' | 'kelp';
  technicianId?: number;
}) {
  serial += 1;
  const customerShop = net.shops[opts.customerShop ?? 'dune'];
  const jobShop = net.shops[opts.jobShop ?? 'dune'];
  const [customer] = await db()
    .insert(customers)
    .values({ shopId: customerShop.id, name: `Cora Comeback ${serial}` })
    .returning();
  const [reel] = await db()
    .insert(reels)
    .values({ customerId: customer!.id, kind: 'spinning', maker: 'Testmaker', model: `R${serial}` })
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

async function expectApiError(promise: Promise<unknown>, status: number) {
  const error = await promise.then(
    () => null,
    (e: unknown) => e,
  );
  expect(error, `expected a ${status}`).toBeInstanceOf(ApiError);
  expect((error as ApiError).status).toBe(status);
  return error as ApiError;
}

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
    body: (await response.json()) as Record<string, unknown> & {
      errors?: { field: string; message: string }[];
    },
  };
}

describe('detection at check-in', () => {
  it('technician – a reel back at the same shop inside the window is flagged and the lead e-mailed', async () => {
    const r = await reelWithHistory({ lagMs: 30 * DAY + 5 * 3_600_000 });
    const { id, comebackId, emailsQueued } = await checkInReel(net.as.tech, r);
    const [job] = await db().select().from(jobs).where(eq(jobs.id, id));
    expect(job!.comebackOfJobId).toBe(r.original.id);
    const cb = await comebackOf(id);
    expect(cb).toMatchObject({
      id: comebackId,
      originalJobId: r.original.id,
      originalShopId: net.shops.dune.id,
      status: 'open',
      detection: 'automatic',
      daysSinceCollection: 30,
      symptom: 'Drag slips again.',
    });
    expect(cb!.notifiedAt).not.toBeNull();
    expect(emailsQueued).toBe(1);
    const [mail] = await mailFor(cb!.id);
    expect(mail).toMatchObject({ kind: 'comeback_review', toAddress: 'lead.dune@t.test' });
    expect(mail!.subject).toContain(`job #${id}`);
    expect(mail!.textBody).toContain(`https://reelwright.test/comebacks/${cb!.id}`);
    expect(mail!.textBody).toContain('30 days after');
    const log = await db()
      .select({ action: activityLog.action })
      .from(activityLog)
      .where(and(eq(activityLog.entityType, 'comeback'), eq(activityLog.entityId, cb!.id)));
    expect(log.map((l) => l.action)).toEqual(['comeback.detect']);

    // The job page's flag: days since collection and the original job, readable by the technician.
    const flag = await jobComeback(net.as.tech, id);
    expect(flag.comeback).toMatchObject({
      id: cb!.id,
      daysSinceCollection: 30,
      insideWindow: true,
      originalJob: { id: r.original.id, visible: true },
    });
    expect(flag.canReadReview).toBe(true);
    expect(flag.canLink).toBe(false);
  });

  it('technician – a reel back at another shop is flagged for the shop that did the work', async () => {
    const r = await reelWithHistory({ lagMs: 12 * DAY, customerShop: 'kelp', jobShop: 'dune' });
    const { id } = await checkInReel(net.as.kelpTech, r);
    const cb = await comebackOf(id);
    expect(cb).toMatchObject({
      originalJobId: r.original.id,
      originalShopId: net.shops.dune.id,
      daysSinceCollection: 12,
    });
    const [job] = await db().select().from(jobs).where(eq(jobs.id, id));
    expect(job!.shopId).toBe(net.shops.kelp.id);
    const mail = await mailFor(cb!.id);
    // Dune's lead gets the review, not Kelp's.
    expect(mail.map((m) => m.toAddress)).toEqual(['lead.dune@t.test']);
    expect(mail[0]!.textBody).toContain('Kelp Test Shop (your shop Dune Test Shop did the work)');
    // It sits in Dune's queue, not Kelp's.
    const dune = await listComebacks(net.as.lead, {}, NOW);
    expect(dune.comebacks.map((c) => c.id)).toContain(cb!.id);
    const kelp = await listComebacks(kelpLead, {}, NOW);
    expect(kelp.comebacks.map((c) => c.id)).not.toContain(cb!.id);
    // The Kelp technician sees the flag, but Dune's job is outside their shop: no link to it.
    const flag = await jobComeback(net.as.kelpTech, id);
    expect(flag.comeback?.originalJob).toMatchObject({ id: r.original.id, visible: false });
  });

  it('technician – a new customer at another shop with the same reel (maker, model, serial) is recognised', async () => {
    const r = await reelWithHistory({ lagMs: 20 * DAY });
    await db().update(reels).set({ serialNumber: 'SN-4471 B' }).where(eq(reels.id, r.reel.id));
    const walkIn = (serialNumber?: string, name = 'Walk-in Angler') =>
      checkIn(
        net.as.kelpTech,
        {
          customer: { name, reminderConsent: false },
          reel: {
            kind: 'spinning',
            maker: 'TESTMAKER',
            model: r.reel.model,
            serialNumber,
            useProfile: 'light',
            water: 'fresh',
          },
          serviceType: 'repair',
          promisedOn: PROMISED,
          complaint: 'Bail will not close.',
        },
        { now: NOW },
      );
    // Same serial written differently: the same reel, so Dune's work came back.
    const same = await walkIn('sn4471b');
    expect(await comebackOf(same.id)).toMatchObject({
      originalJobId: r.original.id,
      originalShopId: net.shops.dune.id,
      daysSinceCollection: 20,
    });
    // Maker and model alone, or another serial, name another reel: no flag.
    expect((await walkIn(undefined, 'Second Walk-in')).comebackId).toBeNull();
    expect((await walkIn('SN-4471 C', 'Third Walk-in')).comebackId).toBeNull();
  });

  it('technician – no flag once the warranty window has closed', async () => {
    const r = await reelWithHistory({ lagMs: 91 * DAY });
    const { id, comebackId, emailsQueued } = await checkInReel(net.as.tech, r);
    expect(comebackId).toBeNull();
    expect(emailsQueued).toBe(0);
    expect(await comebackOf(id)).toBeUndefined();
    const [job] = await db().select().from(jobs).where(eq(jobs.id, id));
    expect(job!.comebackOfJobId).toBeNull();
  });

  // The window is [collected, collected + 90 × 24 h): the instant it closes is outside, the same
  // edge as the comeback rate in @reelwright/metrics and the network comparison.
  it('technician – exactly 90 × 24 hours after collection is outside; a millisecond earlier is inside', async () => {
    const atEdge = await reelWithHistory({ lagMs: 90 * DAY });
    expect((await checkInReel(net.as.tech, atEdge)).comebackId).toBeNull();
    const justInside = await reelWithHistory({ lagMs: 90 * DAY - 1 });
    const flagged = await checkInReel(net.as.tech, justInside);
    expect(flagged.comebackId).not.toBeNull();
    expect((await comebackOf(flagged.id))!.daysSinceCollection).toBe(89);
  });

  it("owner – the warranty window is the owner's setting", async () => {
    await db().update(networkSettings).set({ warrantyDays: 30 });
    try {
      const r = await reelWithHistory({ lagMs: 45 * DAY });
      expect((await checkInReel(net.as.tech, r)).comebackId).toBeNull();
    } finally {
      await db().update(networkSettings).set({ warrantyDays: 90 });
    }
  });

  it('technician – a reel that never came in before, or whose job is still open, is not flagged', async () => {
    const r = await reelWithHistory({ lagMs: 10 * DAY });
    await db()
      .update(jobs)
      .set({ state: 'ready', collectedAt: null })
      .where(eq(jobs.id, r.original.id));
    expect((await checkInReel(net.as.tech, r)).comebackId).toBeNull();
  });
});

describe('manual link', () => {
  it('technician – links a return outside the window by hand; the days are stored', async () => {
    const r = await reelWithHistory({ lagMs: 120 * DAY });
    const { id } = await checkInReel(net.as.tech, r);
    const before = await jobComeback(net.as.tech, id);
    expect(before.comeback).toBeNull();
    expect(before.canLink).toBe(true);
    expect(before.candidates).toEqual([
      expect.objectContaining({ id: r.original.id, daysBefore: 120, insideWindow: false }),
    ]);
    const linked = await linkComeback(
      net.as.tech,
      id,
      { originalJobId: r.original.id, symptom: 'Handle back-play again.' },
      { now: NOW },
    );
    const cb = await comebackOf(id);
    expect(cb).toMatchObject({
      id: linked.comebackId,
      detection: 'manual',
      daysSinceCollection: 120,
      status: 'open',
      symptom: 'Handle back-play again.',
    });
    expect((await mailFor(cb!.id)).length).toBe(1);
    const after = await jobComeback(net.as.tech, id);
    expect(after.comeback).toMatchObject({ id: cb!.id, insideWindow: false });
    expect(after.canLink).toBe(false);

    // Linking again is a conflict.
    await expectApiError(
      linkComeback(net.as.tech, id, { originalJobId: r.original.id }, { now: NOW }),
      409,
    );
  });

  it('technician – only an earlier collected job of the same reel can be linked', async () => {
    const r = await reelWithHistory({ lagMs: 200 * DAY });
    const other = await reelWithHistory({ lagMs: 150 * DAY });
    const { id } = await checkInReel(net.as.tech, r);
    const wrongReel = await expectApiError(
      linkComeback(net.as.tech, id, { originalJobId: other.original.id }, { now: NOW }),
      400,
    );
    expect(wrongReel.fieldErrors?.[0]?.field).toBe('body.originalJobId');
    // Collected after this reel was checked in (as if the dates were entered wrongly).
    const [later] = await db()
      .insert(jobs)
      .values({
        shopId: net.shops.dune.id,
        customerId: r.customer.id,
        reelId: r.reel.id,
        serviceType: 'tune_up',
        state: 'collected',
        checkedInAt: new Date(NOW.getTime() - DAY),
        readyAt: new Date(NOW.getTime() + DAY),
        collectedAt: new Date(NOW.getTime() + 2 * DAY),
      })
      .returning();
    const notBefore = await expectApiError(
      linkComeback(net.as.tech, id, { originalJobId: later!.id }, { now: NOW }),
      400,
    );
    expect(notBefore.fieldErrors?.[0]?.message).toMatch(/not collected before/);
    await expectApiError(linkComeback(net.as.tech, id, { originalJobId: id }, { now: NOW }), 400);
    // Nothing was written by the refusals.
    expect(await comebackOf(id)).toBeUndefined();
  });

  it("another shop's technician gets 404; a manager, who works no bench, 403", async () => {
    const r = await reelWithHistory({ lagMs: 100 * DAY });
    const { id } = await checkInReel(net.as.tech, r);
    await expectApiError(
      linkComeback(net.as.kelpTech, id, { originalJobId: r.original.id }, { now: NOW }),
      404,
    );
    await expectApiError(
      linkComeback(net.as.north, id, { originalJobId: r.original.id }, { now: NOW }),
      403,
    );
    const route = await import('~/app/api/jobs/[id]/comeback-of/route');
    const res = await call(
      net.as.owner,
      route.POST,
      'POST',
      `/api/jobs/${id}/comeback-of`,
      { id: String(id) },
      { originalJobId: r.original.id },
    );
    expect(res.status).toBe(403);
    expect(res.type).toContain('application/problem+json');
  });
});

describe('review', () => {
  /** An open comeback at Dune (same shop) whose return job logged 45 minutes and a part. */
  async function openComeback(opts: { customerShop?: 'dune' | 'kelp' } = {}) {
    const r = await reelWithHistory({ lagMs: 20 * DAY, customerShop: opts.customerShop });
    const who = opts.customerShop === 'kelp' ? net.as.kelpTech : net.as.tech;
    const { id, comebackId } = await checkInReel(who, r);
    await db().insert(benchSessions).values({ jobId: id, technicianId: who.id, minutes: 45 });
    await db().update(jobs).set({ benchMinutes: 45 }).where(eq(jobs.id, id));
    await db()
      .insert(partLines)
      .values({ jobId: id, name: 'Drag washer set', quantity: 2, unitPriceCents: 1450 });
    return { ...r, jobId: id, comebackId: comebackId! };
  }

  it('shop lead – confirms with workmanship; redo cost from bench time and parts; logged', async () => {
    const c = await openComeback();
    const [cause] = await db()
      .select()
      .from(rootCauses)
      .where(eq(rootCauses.code, 'drag_stack_not_serviced'));
    const drag = net.steps.find((s) => s.code === 'drag.washers')!;
    const { comeback } = await updateComeback(
      net.as.lead,
      c.comebackId,
      {
        status: 'confirmed',
        attribution: 'workmanship',
        rootCauseId: cause!.id,
        rootCauseNote: 'Washers dry.',
        checklistStepId: drag.id,
        disposition: 'redone_free',
      },
      { now: NOW },
    );
    // 45 min at Dune's $60.00/h = $45.00, plus 2 × $14.50 parts = $74.00.
    expect(comeback.redo).toMatchObject({
      benchMinutes: 45,
      labourRateCents: 6000,
      labourCents: 4500,
      partsCents: 2900,
      totalCents: 7400,
    });
    expect(comeback).toMatchObject({
      status: 'confirmed',
      attribution: 'workmanship',
      rootCause: 'Drag stack not serviced',
      checklistStep: { code: 'drag.washers' },
      disposition: 'redone_free',
      redoCostCents: 7400,
      reviewerName: 'Lena Lead',
    });
    expect(comeback.history.map((h) => h.action)).toEqual(['comeback.detect', 'comeback.confirm']);

    // The shop page's breakdown counts it by root cause, step and technician.
    const breakdown = await comebackBreakdown(
      net.as.lead,
      net.shops.dune.id,
      { from: '2026-10-01', to: '2026-10-31' },
      NOW,
    );
    expect(breakdown.byRootCause).toContainEqual(
      expect.objectContaining({ label: 'Drag stack not serviced', confirmed: 1, counted: 1 }),
    );
    expect(breakdown.byStep).toContainEqual(
      expect.objectContaining({ key: 'drag.washers', confirmed: 1, counted: 1 }),
    );
    expect(breakdown.byTechnician).toContainEqual(
      expect.objectContaining({ label: 'Theo Tech', confirmed: 1, counted: 1 }),
    );
    // A technician sees the causes but not the split by technician.
    expect(
      (await comebackBreakdown(net.as.tech, net.shops.dune.id, breakdown.period, NOW)).byTechnician,
    ).toBeNull();
  });

  it('technician – can read the review but not make it (403)', async () => {
    const c = await openComeback();
    expect((await getComeback(net.as.tech, c.comebackId, NOW)).canReview).toBe(false);
    await expectApiError(
      updateComeback(net.as.tech, c.comebackId, {
        status: 'confirmed',
        attribution: 'workmanship',
      }),
      403,
    );
    const route = await import('~/app/api/comebacks/[id]/route');
    const id = String(c.comebackId);
    const res = await call(
      net.as.tech,
      route.PATCH,
      'PATCH',
      `/api/comebacks/${id}`,
      { id },
      {
        status: 'confirmed',
        attribution: 'workmanship',
      },
    );
    expect(res.status).toBe(403);
    expect(res.type).toContain('application/problem+json');
    expect((await comebackOf(c.jobId))!.status).toBe('open');
  });

  it('shop lead of the other shop – reads the return to their shop but cannot attribute it (403); elsewhere 404', async () => {
    const c = await openComeback({ customerShop: 'kelp' });
    const seen = await getComeback(kelpLead, c.comebackId, NOW);
    expect(seen.originalJob.shopName).toBe('Dune Test Shop');
    expect(seen.canReview).toBe(false);
    await expectApiError(
      updateComeback(kelpLead, c.comebackId, { attribution: 'workmanship' }, { now: NOW }),
      403,
    );
    // A comeback that never touched Kelp is not found for its lead, nor for the other region.
    const dune = await openComeback();
    await expectApiError(getComeback(kelpLead, dune.comebackId, NOW), 404);
    await expectApiError(
      updateComeback(kelpLead, dune.comebackId, { attribution: 'workmanship' }),
      404,
    );
    await expectApiError(getComeback(net.as.south, dune.comebackId, NOW), 404);
    await expectApiError(listComebacks(kelpLead, { shop: net.shops.dune.id }, NOW), 404);
    expect((await comebackOf(c.jobId))!.attribution).toBeNull();
  });

  it('regional manager – reassigns the review, the assignee is e-mailed; a lead cannot reassign', async () => {
    const c = await openComeback();
    await expectApiError(
      updateComeback(net.as.lead, c.comebackId, { assigneeId: net.as.north.id }),
      403,
    );
    const { comeback, emailsQueued } = await updateComeback(
      net.as.north,
      c.comebackId,
      { assigneeId: net.as.north.id },
      { now: NOW },
    );
    expect(emailsQueued).toBe(1);
    expect(comeback.assignee).toMatchObject({ id: net.as.north.id, name: 'Nora North' });
    expect(comeback.history.map((h) => h.action)).toContain('comeback.reassign');
    const mail = await mailFor(c.comebackId);
    expect(mail.at(-1)).toMatchObject({ toAddress: 'north@t.test' });
    expect(mail.at(-1)!.textBody).toContain('Nora North has assigned you');
    // Only people who can review the original shop's comebacks.
    const bad = await expectApiError(
      updateComeback(net.as.north, c.comebackId, { assigneeId: net.as.tech.id }),
      400,
    );
    expect(bad.fieldErrors?.[0]?.field).toBe('body.assigneeId');
  });

  it('shop lead – dismisses with a reason and a note; the reason reads back', async () => {
    const c = await openComeback();
    const { comeback } = await updateComeback(
      net.as.lead,
      c.comebackId,
      { status: 'dismissed', dismissReason: 'not_our_work', dismissNote: 'Opened elsewhere.' },
      { now: NOW },
    );
    expect(comeback.status).toBe('dismissed');
    expect(comeback.dismissal).toEqual({
      reason: 'not_our_work',
      note: 'Opened elsewhere.',
      text: 'Not our work: Opened elsewhere.',
    });
    expect(comeback.redoCostCents).toBeNull();
  });

  it('shop lead – opens a corrective action from a confirmed comeback, once', async () => {
    const c = await openComeback();
    const action = {
      title: 'Retrain on drag stacks',
      ownerId: net.as.tech.id,
      dueOn: '2026-11-16',
    };
    const early = await expectApiError(
      updateComeback(net.as.lead, c.comebackId, { correctiveAction: action }),
      400,
    );
    expect(early.fieldErrors?.[0]?.field).toBe('body.correctiveAction');
    const { comeback } = await updateComeback(
      net.as.lead,
      c.comebackId,
      { status: 'confirmed', attribution: 'workmanship', correctiveAction: action },
      { now: NOW },
    );
    expect(comeback.correctiveActions).toEqual([
      expect.objectContaining({
        title: 'Retrain on drag stacks',
        owner: 'Theo Tech',
        status: 'open',
      }),
    ]);
    const [row] = await db()
      .select()
      .from(correctiveActions)
      .where(eq(correctiveActions.comebackId, c.comebackId));
    expect(row).toMatchObject({
      source: 'comeback',
      shopId: net.shops.dune.id,
      dueOn: '2026-11-16',
    });
    await expectApiError(
      updateComeback(net.as.lead, c.comebackId, { correctiveAction: action }),
      409,
    );
  });
});

describe('validation', () => {
  it('the review schema: a dismissal needs a reason, a confirmation an attribution, no unknown fields', () => {
    expect(comebackPatch.safeParse({ status: 'dismissed' }).success).toBe(false);
    expect(comebackPatch.safeParse({ status: 'confirmed', attribution: null }).success).toBe(false);
    expect(comebackPatch.safeParse({ status: 'confirmed', reviewerId: 3 }).success).toBe(false);
    expect(comebackPatch.safeParse({}).success).toBe(false);
    expect(comebackPatch.safeParse({ disposition: 'free' }).success).toBe(false);
    expect(
      comebackPatch.safeParse({ status: 'dismissed', dismissReason: 'outside_window' }).success,
    ).toBe(true);
  });

  it('shop lead – bad input is a 400 with field errors and changes nothing', async () => {
    const r = await reelWithHistory({ lagMs: 5 * DAY });
    const { comebackId } = await checkInReel(net.as.tech, r);
    const id = String(comebackId);
    const route = await import('~/app/api/comebacks/[id]/route');
    const logBefore = await db().select().from(activityLog);
    const noReason = await call(
      net.as.lead,
      route.PATCH,
      'PATCH',
      `/api/comebacks/${id}`,
      { id },
      {
        status: 'dismissed',
      },
    );
    expect(noReason.status).toBe(400);
    expect(noReason.type).toContain('application/problem+json');
    expect(noReason.body.errors?.map((e) => e.field)).toEqual(['body.dismissReason']);
    // The stored comeback has no attribution, so confirming alone is refused by the server.
    const noAttribution = await call(
      net.as.lead,
      route.PATCH,
      'PATCH',
      `/api/comebacks/${id}`,
      { id },
      {
        status: 'confirmed',
      },
    );
    expect(noAttribution.status).toBe(400);
    expect(noAttribution.body.errors?.map((e) => e.field)).toEqual(['body.attribution']);
    const [retired] = await db()
      .select()
      .from(rootCauses)
      .where(eq(rootCauses.code, 'retired_cause'));
    const inactive = await call(
      net.as.lead,
      route.PATCH,
      'PATCH',
      `/api/comebacks/${id}`,
      { id },
      {
        status: 'confirmed',
        attribution: 'workmanship',
        rootCauseId: retired!.id,
      },
    );
    expect(inactive.status).toBe(400);
    expect(inactive.body.errors?.map((e) => e.field)).toEqual(['body.rootCauseId']);
    const [cb] = await db().select().from(comebacks).where(eq(comebacks.id, comebackId!));
    expect(cb).toMatchObject({ status: 'open', attribution: null, rootCauseId: null });
    expect((await db().select().from(activityLog)).length).toBe(logBefore.length);
  });

  it('owner – comeback settings: bad input 400 with field errors, nothing written; a good save reorders and renames', async () => {
    const route = await import('~/app/api/settings/comebacks/route');
    const current = await call(net.as.owner, route.GET, 'GET', '/api/settings/comebacks');
    expect(current.status).toBe(200);
    const causes = (
      current.body as unknown as { rootCauses: { id: number; label: string; active: boolean }[] }
    ).rootCauses;
    const good = {
      warrantyDays: 60,
      reviewDeadlineDays: 5,
      correctiveActionDueDays: 21,
      countedAttributions: ['workmanship'],
      rootCauses: [
        { id: causes[1]!.id, label: 'Drag stack skipped', active: true },
        { id: causes[0]!.id, label: causes[0]!.label, active: false },
        { id: causes[2]!.id, label: causes[2]!.label, active: false },
        { label: 'Wrong grease', active: true },
      ],
    };
    const bad = await call(
      net.as.owner,
      route.PUT,
      'PUT',
      '/api/settings/comebacks',
      {},
      {
        ...good,
        warrantyDays: 0,
        countedAttributions: [],
        rootCauses: [...good.rootCauses, { label: 'wrong GREASE', active: true }],
      },
    );
    expect(bad.status).toBe(400);
    expect(bad.body.errors?.map((e) => e.field).sort()).toEqual([
      'body.countedAttributions',
      'body.rootCauses.4.label',
      'body.warrantyDays',
    ]);
    const dropped = await call(
      net.as.owner,
      route.PUT,
      'PUT',
      '/api/settings/comebacks',
      {},
      {
        ...good,
        rootCauses: good.rootCauses.slice(0, 2),
      },
    );
    expect(dropped.status).toBe(400);
    expect(dropped.body.errors?.[0]?.message).toMatch(/Deactivate rather than remove/);
    const [unchanged] = await db().select().from(networkSettings);
    expect(unchanged).toMatchObject({ warrantyDays: 90, reviewDeadlineDays: 7 });
    expect((await db().select().from(rootCauses)).length).toBe(3);

    // Only the owner has the settings.
    expect(
      (await call(net.as.lead, route.PUT, 'PUT', '/api/settings/comebacks', {}, good)).status,
    ).toBe(403);

    try {
      const saved = await saveComebackSettings(net.as.owner, comebackSettingsInput.parse(good));
      expect(saved.settings).toEqual({
        warrantyDays: 60,
        reviewDeadlineDays: 5,
        correctiveActionDueDays: 21,
        countedAttributions: ['workmanship'],
      });
      expect(saved.rootCauses.map((c) => [c.label, c.active, c.code])).toEqual([
        ['Drag stack skipped', true, 'drag_stack_not_serviced'],
        ['Lubrication missed', false, 'lubrication_missed'],
        ['Retired cause', false, 'retired_cause'],
        ['Wrong grease', true, 'wrong_grease'],
      ]);
      const log = await db()
        .select({ action: activityLog.action })
        .from(activityLog)
        .where(eq(activityLog.entityType, 'network_settings'));
      expect(log.map((l) => l.action)).toEqual(['settings.update']);
    } finally {
      await db()
        .update(networkSettings)
        .set({ warrantyDays: 90, reviewDeadlineDays: 7, correctiveActionDueDays: 14 });
    }
  });
});
