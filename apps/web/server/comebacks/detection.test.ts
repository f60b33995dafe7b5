import { and, eq } from '@reelwright/db';
import { activityLog, jobs, networkSettings, reels } from '@reelwright/db/schema';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { closeMemoryDb, openMemoryDb, testState as state } from '~/server/testing/memory-db';
import { buildNetwork, type Network } from '../bench/fixture';
import { expectApiError } from '../bench/test-support';
import { checkIn } from '../bench/check-in';
import type { Principal } from '../principal';
import { jobComeback, listComebacks } from '../queries/comebacks';
import { linkComeback } from './detect';
import { addComebackSetup, comebackHelpers, DAY, NOW, PROMISED } from './test-support';

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
