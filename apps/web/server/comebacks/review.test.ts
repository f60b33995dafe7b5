import { eq } from '@reelwright/db';
import {
  activityLog,
  benchSessions,
  comebacks,
  correctiveActions,
  jobs,
  networkSettings,
  partLines,
  rootCauses,
} from '@reelwright/db/schema';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { comebackPatch, comebackSettingsInput } from '~/lib/validators/comebacks';
import { closeMemoryDb, openMemoryDb, testState as state } from '~/server/testing/memory-db';
import { buildNetwork, type Network } from '../bench/fixture';
import { expectApiError } from '../bench/test-support';
import type { Principal } from '../principal';
import { comebackBreakdown, getComeback, listComebacks } from '../queries/comebacks';
import { addComebackSetup, comebackHelpers, DAY, NOW } from './test-support';
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

let net: Network;
let kelpLead: Principal;
const db = () => state.handle!.db;

beforeAll(async () => {
  await openMemoryDb();
  net = await buildNetwork(state.handle!.db);
  ({ kelpLead } = await addComebackSetup(db(), net));
}, 60_000);

afterAll(closeMemoryDb);

const { reelWithHistory, checkInReel, comebackOf, mailFor, call } = comebackHelpers(() => net);

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
