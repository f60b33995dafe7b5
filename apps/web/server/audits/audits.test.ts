import { and, eq } from '@reelwright/db';
import {
  activityLog,
  auditAnswers,
  auditRounds,
  auditSamples,
  correctiveActions,
  emails,
  photos,
} from '@reelwright/db/schema';
import { drawSample } from '@reelwright/metrics';
import { NextRequest } from 'next/server';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { sampleAnswersInput, type SampleAnswersInput } from '~/lib/validators/audits';
import { closeMemoryDb, openMemoryDb, testState as state } from '~/server/testing/memory-db';
import type { Principal } from '../principal';
import {
  auditSummaryByShop,
  formVersions,
  getRound,
  getSample,
  listRounds,
  redrawCheck,
} from '../queries/audits';
import { listCorrectiveActions } from '../queries/corrective-actions';
import { expectApiError } from '../bench/test-support';
import { updateCorrectiveAction } from './corrective-actions';
import { buildAuditNetwork, newYorkNoon, type AuditNetwork } from './fixture';
import { publishAuditForm } from './forms';
import { planRound, previewRound, type PlannedRound } from './plan';
import { addDays, localToday } from './sampling';
import { saveSample } from './score';
import * as clock from '~/server/clock';

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));
vi.mock('~/server/session', () =>
  import('~/server/testing/memory-db').then((m) => m.sessionModule),
);

let net: AuditNetwork;
const db = () => state.handle!.db;
let owner: Principal;
let north: Principal;
let south: Principal;
let leadDune: Principal;
let auditorA: Principal;
let auditorB: Principal;

beforeAll(async () => {
  await openMemoryDb();
  net = await buildAuditNetwork(state.handle!.db);
  owner = net.principal('owner@a.test');
  north = net.principal('north@a.test');
  south = net.principal('south@a.test');
  leadDune = net.principal('lead.dune@a.test');
  auditorA = net.principal('auditor.a@a.test');
  auditorB = net.principal('auditor.b@a.test');
}, 60_000);

afterAll(async () => {
  await closeMemoryDb();
});

/** `count` jobs ready at noon New York time on consecutive days from `from`, cycling through `days`. */
async function readyAtDune(from: string, count: number, days = 7, shopId?: number) {
  const at = Array.from({ length: count }, (_, i) => newYorkNoon(addDays(from, i % days)));
  return net.readyJobs(shopId ?? net.shops.dune.id, at);
}

const item = (code: string) => net.items.find((i) => i.code === code)!;

/** Answers for every item: all pass, or with the given item codes failed (with a note). */
function answers(failed: string[] = []): SampleAnswersInput['answers'] {
  return net.items.map((i) => ({
    itemId: i.id,
    result: failed.includes(i.code) ? ('fail' as const) : ('pass' as const),
    note: failed.includes(i.code) ? `Not done: ${i.title}` : undefined,
  }));
}

/** Finishes every sample of a round; the first `failing` samples fail a critical item of its form. */
async function scoreRound(round: PlannedRound, failing: number, auditor = auditorA) {
  const { items } = await getSample(auditor, round.id, round.sampledJobIds[0]!);
  const critical = items.find((i) => i.critical)!;
  let last;
  for (const [i, jobId] of round.sampledJobIds.entries()) {
    last = await saveSample(auditor, round.id, jobId, {
      answers: items.map((it) =>
        i < failing && it.id === critical.id
          ? { itemId: it.id, result: 'fail' as const, note: 'Not done' }
          : { itemId: it.id, result: 'pass' as const },
      ),
      final: true,
    });
  }
  return last!;
}

describe('planning a round', () => {
  it('regional manager – plans a round: lot in id order, plan of the standard, stored seed, auditor e-mailed', async () => {
    // 132 jobs ready in March at noon, plus jobs just outside the period in local time.
    const lot = await readyAtDune('2026-03-01', 132, 31);
    // 23:30 on 31 March in New York is 03:30 UTC on 1 April: inside the period.
    const [lateInside] = await net.readyJobs(net.shops.dune.id, [new Date('2026-04-01T03:30:00Z')]);
    // 00:10 on 1 April New York time: outside. 23:50 on 28 February: outside.
    await net.readyJobs(net.shops.dune.id, [
      new Date('2026-04-01T04:10:00Z'),
      new Date('2026-03-01T04:50:00Z'),
    ]);

    const preview = await previewRound(north, {
      shopId: net.shops.dune.id,
      from: '2026-03-01',
      to: '2026-03-31',
    });
    expect(preview).toMatchObject({
      lotSize: 133,
      severity: 'normal',
      aql: 2.5,
      level: 'II',
      blocked: null,
      plan: { codeLetter: 'F', sampleSize: 20, accept: 1, reject: 2 },
    });

    const round = await planRound(north, {
      shopId: net.shops.dune.id,
      from: '2026-03-01',
      to: '2026-03-31',
      auditorId: auditorA.id,
    });
    expect(round).toMatchObject({
      lotSize: 133,
      codeLetter: 'F',
      sampleSize: 20,
      accept: 1,
      reject: 2,
      severity: 'normal',
      aql: 2.5,
      level: 'II',
    });
    expect(round.seed).toMatch(/^[0-9a-f]{32}$/);
    expect(new Set(round.sampledJobIds).size).toBe(20);

    const [stored] = await db().select().from(auditRounds).where(eq(auditRounds.id, round.id));
    const expectedLot = [...lot, lateInside!].sort((a, b) => a - b);
    expect(stored!.lotJobIds).toEqual(expectedLot);
    expect(stored!.seed).toBe(round.seed);
    // The stored seed and lot redraw the same sample, in the same order.
    expect(drawSample(stored!.lotJobIds, stored!.sampleSize, stored!.seed)).toEqual(
      round.sampledJobIds,
    );
    const samples = await db()
      .select()
      .from(auditSamples)
      .where(eq(auditSamples.roundId, round.id))
      .orderBy(auditSamples.position);
    expect(samples.map((s) => s.jobId)).toEqual(round.sampledJobIds);

    const check = await redrawCheck(north, round.id);
    expect(check).toMatchObject({ matches: true, lotUnchanged: true, lotSize: 133 });
    expect(check.redrawn).toEqual(round.sampledJobIds);

    const mail = await db()
      .select()
      .from(emails)
      .where(and(eq(emails.entityType, 'audit_round'), eq(emails.entityId, round.id)));
    expect(mail).toHaveLength(1);
    expect(mail[0]).toMatchObject({
      kind: 'audit_assigned',
      toAddress: 'auditor.a@a.test',
      status: 'pending',
    });
    expect(mail[0]!.subject).toContain('20 jobs at Dune Audit Shop');

    const log = await db()
      .select()
      .from(activityLog)
      .where(and(eq(activityLog.entityType, 'audit_round'), eq(activityLog.entityId, round.id)));
    expect(log.map((l) => l.action)).toEqual(['audit_round.plan']);
    expect(log[0]!.userId).toBe(north.id);
  });

  it('redraw and compare – a tampered sample no longer matches the stored seed', async () => {
    const [round] = await listRounds(north, { shopId: net.shops.dune.id });
    const detail = await getRound(north, round!.id);
    const swapIn = detail.lotJobIds.find((id) => !detail.samples.some((s) => s.jobId === id))!;
    const first = detail.samples[0]!;
    await db()
      .update(auditSamples)
      .set({ jobId: swapIn })
      .where(and(eq(auditSamples.roundId, round!.id), eq(auditSamples.jobId, first.jobId)));
    expect((await redrawCheck(north, round!.id)).matches).toBe(false);
    await db()
      .update(auditSamples)
      .set({ jobId: first.jobId })
      .where(and(eq(auditSamples.roundId, round!.id), eq(auditSamples.jobId, swapIn)));
    expect((await redrawCheck(north, round!.id)).matches).toBe(true);
  });

  it('owner – cannot plan a second round over the same jobs, so no one can redraw until a sample suits them', async () => {
    await readyAtDune('2026-05-01', 60, 10, net.shops.kelp.id);
    const a = await previewRound(owner, {
      shopId: net.shops.kelp.id,
      from: '2026-05-01',
      to: '2026-05-10',
    });
    expect(a.lotSize).toBe(60);
    const round = await planRound(owner, {
      shopId: net.shops.kelp.id,
      from: '2026-05-01',
      to: '2026-05-10',
      auditorId: auditorB.id,
    });
    // Replanning the same period is refused, so no one can redraw until a sample suits them.
    await expectApiError(
      planRound(owner, {
        shopId: net.shops.kelp.id,
        from: '2026-05-05',
        to: '2026-05-20',
        auditorId: auditorB.id,
      }),
      409,
    );
    expect(round.seed).not.toBe(
      (await db().select().from(auditRounds).where(eq(auditRounds.shopId, net.shops.dune.id)))[0]!
        .seed,
    );
  });

  it('regional manager – cannot plan or preview a round for another region’s shop (404)', async () => {
    await expectApiError(
      previewRound(south, { shopId: net.shops.dune.id, from: '2026-03-01', to: '2026-03-31' }),
      404,
    );
    await expectApiError(
      planRound(south, {
        shopId: net.shops.dune.id,
        from: '2026-06-01',
        to: '2026-06-30',
        auditorId: auditorA.id,
      }),
      404,
    );
  });

  it('refuses an empty lot, a period not over yet and a non-auditor, writing nothing', async () => {
    const before = await db().select().from(auditRounds);
    const err = await expectApiError(
      planRound(north, {
        shopId: net.shops.dune.id,
        from: '2026-08-01',
        to: '2026-08-07',
        auditorId: auditorA.id,
      }),
      400,
    );
    expect(err.detail).toContain('No jobs became ready');
    const today = localToday('America/New_York');
    await expectApiError(
      planRound(north, {
        shopId: net.shops.dune.id,
        from: today,
        to: addDays(today, 3),
        auditorId: auditorA.id,
      }),
      400,
    );
    await expectApiError(
      planRound(north, {
        shopId: net.shops.dune.id,
        from: '2026-03-01',
        to: '2026-03-31',
        auditorId: leadDune.id,
      }),
      400,
    );
    expect(await db().select().from(auditRounds)).toHaveLength(before.length);
  });
});

describe('scoring and deciding', () => {
  let round: PlannedRound;

  beforeAll(async () => {
    // 20 jobs in a June week: lot 16–25 is code C, n = 5, Ac 0 Re 1 at AQL 2.5 — use AQL 10
    // for a plan that accepts one failure (C at 10: Ac 1 Re 2, Table II-A).
    await readyAtDune('2026-06-01', 20, 7);
    round = await planRound(north, {
      shopId: net.shops.dune.id,
      from: '2026-06-01',
      to: '2026-06-07',
      aql: 10,
      auditorId: auditorA.id,
    });
  });

  it('auditor – saves part-way: answers kept, no score stored, round in progress', async () => {
    const jobId = round.sampledJobIds[0]!;
    const saved = await saveSample(auditorA, round.id, jobId, {
      answers: answers().slice(0, 2),
      note: 'Photos checked',
    });
    expect(saved).toMatchObject({ final: false, answered: 2, items: 4 });
    const view = await getSample(auditorA, round.id, jobId);
    expect(view.canScore).toBe(true);
    expect(view.sample).toMatchObject({ score: null, verdict: null, completedAt: null });
    expect(view.answers).toHaveLength(2);
    expect(view.job.id).toBe(jobId);
    expect(view.round.status).toBe('in_progress');
    expect(view.nextJobId).toBe(round.sampledJobIds[1]);
  });

  it('auditor – sees the job record read-only, with confirmed photos listed by name without storage', async () => {
    const jobId = round.sampledJobIds[1]!;
    await db()
      .insert(photos)
      .values([
        {
          jobId,
          stage: 'teardown',
          storageKey: `test/${jobId}/a`,
          contentType: 'image/jpeg',
          sizeBytes: 1000,
          originalName: 'drag-stack.jpg',
          confirmedAt: clock.now(),
        },
        {
          jobId,
          stage: 'teardown',
          storageKey: `test/${jobId}/b`,
          contentType: 'image/jpeg',
          sizeBytes: 1000,
          originalName: 'never-confirmed.jpg',
        },
      ]);
    const view = await getSample(auditorA, round.id, jobId);
    expect(view.job).toMatchObject({
      id: jobId,
      findings: 'Cleaned and greased.',
      money: { labourCents: 4500, totalCents: 4500 },
      photosViewable: false,
    });
    expect(view.job.photos).toEqual([
      expect.objectContaining({ name: 'drag-stack.jpg', stage: 'teardown', url: null }),
    ]);
    expect(view.job).not.toHaveProperty('customer');
  });

  it('auditor – cannot finish with an item unanswered or a failure without a note', async () => {
    const jobId = round.sampledJobIds[0]!;
    const err = await expectApiError(
      saveSample(auditorA, round.id, jobId, { answers: answers().slice(0, 3), final: true }),
      400,
    );
    expect(err.detail).toContain('Findings written up');
    const parsed = sampleAnswersInput.safeParse({
      answers: [{ itemId: item('drag.serviced').id, result: 'fail' }],
      final: true,
    });
    expect(parsed.success).toBe(false);
    expect(parsed.error?.issues[0]?.path).toEqual(['answers', 0, 'note']);
  });

  it('auditor – a failed critical item is a critical miss whatever the score', async () => {
    const saved = await saveSample(auditorA, round.id, round.sampledJobIds[0]!, {
      answers: answers(['drag.serviced']),
      final: true,
    });
    // 70 of 100 weight passed, but the drag item is critical.
    expect(saved).toMatchObject({ score: 70, verdict: 'critical_miss', final: true });
    const needsWork = await saveSample(auditorA, round.id, round.sampledJobIds[1]!, {
      answers: [
        ...answers(['billing.correct']).slice(0, 3),
        { itemId: item('findings.recorded').id, result: 'not_applicable' },
      ],
      final: true,
    });
    // 50 / 80 applicable weight = 62.5 < 85.
    expect(needsWork).toMatchObject({ score: 62.5, verdict: 'needs_work' });
  });

  it('auditor – of another auditor gets 404 for the round and its samples', async () => {
    await expectApiError(getRound(auditorB, round.id), 404);
    await expectApiError(getSample(auditorB, round.id, round.sampledJobIds[2]!), 404);
    await expectApiError(
      saveSample(auditorB, round.id, round.sampledJobIds[2]!, { answers: answers(), final: true }),
      404,
    );
    expect((await listRounds(auditorB)).map((r) => r.id)).not.toContain(round.id);
    expect((await listRounds(auditorA)).map((r) => r.id)).toContain(round.id);
  });

  it('shop lead – does not see the round until it is decided', async () => {
    await expectApiError(getRound(leadDune, round.id), 404);
    expect(await listRounds(leadDune)).toEqual([]);
  });

  it('decides the lot when every sample is scored: failures ≥ Re rejects it', async () => {
    expect(round).toMatchObject({ sampleSize: 5, accept: 1, reject: 2 });
    let last;
    for (const jobId of round.sampledJobIds.slice(2)) {
      last = await saveSample(auditorA, round.id, jobId, { answers: answers(), final: true });
    }
    expect(last!.round).toMatchObject({ status: 'decided', decision: 'rejected', failures: 2 });
    const listed = (await listRounds(north)).find((r) => r.id === round.id)!;
    expect(listed).toMatchObject({ scored: 5, sampleSize: 5, decision: 'rejected' });
    expect((await getRound(north, round.id)).samples.map((s) => s.answered)).toEqual([
      4, 4, 4, 4, 4,
    ]);
    expect(last!.correctiveActionId).not.toBeNull();

    const [action] = await db()
      .select()
      .from(correctiveActions)
      .where(eq(correctiveActions.auditRoundId, round.id));
    expect(action).toMatchObject({
      shopId: net.shops.dune.id,
      ownerId: leadDune.id,
      status: 'open',
      source: 'audit',
      dueOn: addDays(localToday('America/New_York'), 14),
    });
    expect(action!.description).toContain('2 of 5 sampled jobs');
    expect(action!.description).toContain('Drag serviced');

    const mail = await db()
      .select()
      .from(emails)
      .where(and(eq(emails.entityId, round.id), eq(emails.kind, 'audit_rejected')));
    expect(mail.map((m) => m.toAddress).sort()).toEqual(['lead.dune@a.test', 'north@a.test']);

    // Decided: the shop lead now sees the round; scores are closed.
    expect((await getRound(leadDune, round.id)).decision).toBe('rejected');
    await expectApiError(
      saveSample(auditorA, round.id, round.sampledJobIds[0]!, { answers: answers(), final: true }),
      409,
    );
    const view = await getSample(auditorA, round.id, round.sampledJobIds[0]!);
    expect(view.canScore).toBe(false);
  });

  it('failures ≤ Ac accept the lot and open no corrective action', async () => {
    await readyAtDune('2026-06-08', 20, 7);
    const accepted = await planRound(north, {
      shopId: net.shops.dune.id,
      from: '2026-06-08',
      to: '2026-06-14',
      aql: 10,
      auditorId: auditorA.id,
    });
    const last = await scoreRound(accepted, accepted.accept);
    expect(last.round).toMatchObject({ decision: 'accepted', failures: accepted.accept });
    expect(last.correctiveActionId).toBeNull();
    expect(
      await db()
        .select()
        .from(correctiveActions)
        .where(eq(correctiveActions.auditRoundId, accepted.id)),
    ).toEqual([]);
  });

  it('a new form version changes no round already planned or scored', async () => {
    const before = await getSample(auditorA, round.id, round.sampledJobIds[0]!);
    const v2 = await publishAuditForm(owner, {
      title: 'Test form v2',
      items: [
        { code: 'checkin.complete', title: 'Check-in complete', weight: 10, critical: false },
        { code: 'photos.teardown', title: 'Teardown photos', weight: 10, critical: true },
      ],
    });
    expect(v2.version).toBe(2);
    const versions = await formVersions();
    expect(versions.map((v) => [v.version, v.items])).toEqual([
      [2, 2],
      [1, 4],
    ]);
    expect(versions.find((v) => v.version === 1)!.rounds).toBe(
      (await db().select().from(auditRounds)).length,
    );
    expect((await getRound(north, round.id)).form).toMatchObject({ version: 1, items: 4 });
    const after = await getSample(auditorA, round.id, round.sampledJobIds[0]!);
    expect(after.items).toEqual(before.items);
    expect(after.round.formVersion).toBe(1);
    expect(after.sample.score).toBe(70);
    const preview = await previewRound(north, {
      shopId: net.shops.dune.id,
      from: '2026-06-15',
      to: '2026-06-21',
    });
    expect(preview.form).toMatchObject({ version: 2 });
  });
});

describe('severity across rounds (switching rules, ISO 2859-1 §9.3)', () => {
  it('two rejections in 5 or fewer rounds put the shop on tightened inspection', async () => {
    // Dune now has: March (undecided), June week 1 rejected, June week 2 accepted.
    const afterOne = await previewRound(north, {
      shopId: net.shops.dune.id,
      from: '2026-07-01',
      to: '2026-07-07',
    });
    expect(afterOne.severity).toBe('normal');
    expect(afterOne.history.map((h) => h.decision)).toEqual(['rejected', 'accepted']);
    expect(afterOne.undecided).toBe(1);

    await readyAtDune('2026-07-01', 12, 7);
    const second = await planRound(north, {
      shopId: net.shops.dune.id,
      from: '2026-07-01',
      to: '2026-07-07',
      auditorId: auditorA.id,
    });
    expect(second.severity).toBe('normal');
    const decided = await scoreRound(second, second.sampleSize);
    expect(decided.round.decision).toBe('rejected');

    await readyAtDune('2026-07-08', 30, 7);
    const next = await previewRound(north, {
      shopId: net.shops.dune.id,
      from: '2026-07-08',
      to: '2026-07-14',
    });
    expect(next.severity).toBe('tightened');
    expect(next.severityReason).toContain('Tightened');
    // Tightened plan (Table II-B): lot 30 is code D, n = 8, Ac 0 Re 1 at AQL 2.5.
    expect(next.plan).toMatchObject({ table: 'II-B', sampleSize: 8, accept: 0, reject: 1 });
    const third = await planRound(north, {
      shopId: net.shops.dune.id,
      from: '2026-07-08',
      to: '2026-07-14',
      auditorId: auditorA.id,
    });
    expect(third).toMatchObject({ severity: 'tightened', sampleSize: 8 });
    const summary = await auditSummaryByShop(north, { from: '2026-01-01', to: '2026-12-31' });
    const dune = summary.find((s) => s.shopId === net.shops.dune.id)!;
    expect(dune).toMatchObject({
      roundsAccepted: 1,
      roundsRejected: 2,
      currentSeverity: 'tightened',
      openCorrectiveActions: 2,
    });
    expect(dune.samplesScored).toBe(5 + 5 + second.sampleSize);
    expect(dune.failures).toBe(2 + 1 + second.sampleSize);
    expect(dune.interval!.lower).toBeLessThan(dune.failureRate!);
    expect(summary.map((s) => s.shopName)).not.toContain('Reef Audit Shop');
  });

  it('five rejections on tightened inspection discontinue sampling and block planning', async () => {
    // Reef's history written directly: 2 rejected on normal, then 5 rejected on tightened.
    const base = {
      shopId: net.shops.reef.id,
      formId: net.form.id,
      status: 'decided' as const,
      aql: 2.5,
      lotSize: 30,
      codeLetter: 'D',
      sampleSize: 5,
      acceptNumber: 0,
      rejectNumber: 1,
      seed: 'history',
      lotJobIds: [],
      plannedById: owner.id,
      failures: 1,
      decision: 'rejected' as const,
    };
    await db()
      .insert(auditRounds)
      .values(
        Array.from({ length: 7 }, (_, i) => ({
          ...base,
          severity: i < 2 ? ('normal' as const) : ('tightened' as const),
          periodStart: `2025-0${i + 1}-01`,
          periodEnd: `2025-0${i + 1}-07`,
        })),
      );
    await net.readyJobs(net.shops.reef.id, [new Date('2026-02-03T18:00:00Z')]);
    const preview = await previewRound(south, {
      shopId: net.shops.reef.id,
      from: '2026-02-01',
      to: '2026-02-07',
    });
    expect(preview.severity).toBe('discontinued');
    expect(preview.plan).toBeNull();
    expect(preview.blocked).toContain('discontinued');
    await expectApiError(
      planRound(south, {
        shopId: net.shops.reef.id,
        from: '2026-02-01',
        to: '2026-02-07',
        auditorId: auditorA.id,
      }),
      409,
    );
  });
});

describe('corrective actions', () => {
  it('shop lead moves it along, regional manager verifies; other moves are refused', async () => {
    const [action] = await listCorrectiveActions(leadDune, { status: 'open' });
    expect(action).toBeDefined();
    expect(action!.moves).toEqual(['in_progress', 'done']);
    expect(action!.canEdit).toBe(false);
    expect(action!.overdue).toBe(false);

    await expectApiError(updateCorrectiveAction(north, action!.id, { status: 'in_progress' }), 403);
    await expectApiError(updateCorrectiveAction(leadDune, action!.id, { status: 'verified' }), 403);
    await expectApiError(
      updateCorrectiveAction(leadDune, action!.id, { dueOn: '2027-01-31' }),
      403,
    );
    await expectApiError(updateCorrectiveAction(south, action!.id, { status: 'verified' }), 404);

    const started = await updateCorrectiveAction(leadDune, action!.id, { status: 'in_progress' });
    expect(started.status).toBe('in_progress');
    await expectApiError(updateCorrectiveAction(leadDune, action!.id, { status: 'done' }), 400);
    const done = await updateCorrectiveAction(leadDune, action!.id, {
      status: 'done',
      resolutionNote: 'Drag stack retraining held; checklist reviewed daily.',
    });
    expect(done).toMatchObject({ status: 'done', moves: [] });
    expect(done.doneAt).not.toBeNull();

    const verified = await updateCorrectiveAction(north, action!.id, { status: 'verified' });
    expect(verified).toMatchObject({ status: 'verified', verifiedBy: 'Nils North' });
    await expectApiError(updateCorrectiveAction(north, action!.id, { description: 'x' }), 409);

    const log = await db()
      .select({ action: activityLog.action })
      .from(activityLog)
      .where(
        and(eq(activityLog.entityType, 'corrective_action'), eq(activityLog.entityId, action!.id)),
      )
      .orderBy(activityLog.id);
    expect(log.map((l) => l.action)).toEqual([
      'corrective_action.open',
      'corrective_action.in_progress',
      'corrective_action.done',
      'corrective_action.verified',
    ]);
  });

  it('highlights an action past its due date as overdue', async () => {
    const [open] = await listCorrectiveActions(north, { status: 'open' });
    const late = new Date(clock.now().getTime() + 20 * 86_400_000);
    const [again] = (await listCorrectiveActions(north, { status: 'open' }, late)).filter(
      (a) => a.id === open!.id,
    );
    expect(again!.overdue).toBe(true);
    const edited = await updateCorrectiveAction(north, open!.id, {
      dueOn: addDays(localToday('America/New_York'), 30),
    });
    expect(edited.dueOn).toBe(addDays(localToday('America/New_York'), 30));
    expect(await listCorrectiveActions(south)).toEqual([]);
  });
});

describe('routes: roles, scope and bad input', () => {
  const request = (path: string, init?: { method?: string; body?: unknown }) =>
    new NextRequest(`http://test.local${path}`, {
      method: init?.method ?? 'GET',
      body: init?.body === undefined ? undefined : JSON.stringify(init.body),
      headers: { 'content-type': 'application/json' },
    });
  const params = (value: Record<string, string>) => ({ params: Promise.resolve(value) });

  it('technician – gets 403 from the audit routes; signed out gets 401', async () => {
    const { GET, POST } = await import('~/app/api/audit-rounds/route');
    state.principal = net.principal('tech.dune@a.test');
    expect((await GET(request('/api/audit-rounds'), params({}))).status).toBe(403);
    expect(
      (await POST(request('/api/audit-rounds', { method: 'POST', body: {} }), params({}))).status,
    ).toBe(403);
    state.principal = null;
    expect((await GET(request('/api/audit-rounds'), params({}))).status).toBe(401);
  });

  it('auditor – cannot plan (403); regional manager – bad input gets 400 field errors and writes nothing', async () => {
    const { POST } = await import('~/app/api/audit-rounds/route');
    state.principal = auditorA;
    const body = {
      shopId: net.shops.dune.id,
      from: '2026-09-01',
      to: '2026-09-07',
      auditorId: auditorA.id,
    };
    expect(
      (await POST(request('/api/audit-rounds', { method: 'POST', body }), params({}))).status,
    ).toBe(403);
    state.principal = north;
    const before = (await db().select().from(auditRounds)).length;
    const bad = await POST(
      request('/api/audit-rounds', {
        method: 'POST',
        body: { ...body, from: '2026-09-31', to: '2026-09-01', aql: 3 },
      }),
      params({}),
    );
    expect(bad.status).toBe(400);
    const problem = (await bad.json()) as { errors: { field: string }[] };
    expect(problem.errors.map((e) => e.field).sort()).toEqual(['body.aql', 'body.from', 'body.to']);
    const reversed = await POST(
      request('/api/audit-rounds', {
        method: 'POST',
        body: { ...body, from: '2026-09-07', to: '2026-09-01' },
      }),
      params({}),
    );
    expect(reversed.status).toBe(400);
    expect((await db().select().from(auditRounds)).length).toBe(before);
  });

  it('regional manager – plans through the API: 201 with the plan, seed and sampled job ids', async () => {
    const { POST } = await import('~/app/api/audit-rounds/route');
    await readyAtDune('2026-09-01', 8, 7);
    state.principal = north;
    const response = await POST(
      request('/api/audit-rounds', {
        method: 'POST',
        body: {
          shopId: net.shops.dune.id,
          from: '2026-09-01',
          to: '2026-09-07',
          auditorId: auditorB.id,
        },
      }),
      params({}),
    );
    expect(response.status).toBe(201);
    const round = (await response.json()) as PlannedRound;
    // Tightened now (see above): lot 8 is code A; Table II-B at AQL 2.5 gives code D, n 8 ≥ lot.
    expect(round).toMatchObject({
      lotSize: 8,
      severity: 'tightened',
      sampleSize: 8,
      accept: 0,
      reject: 1,
    });
    expect(round.sampledJobIds).toHaveLength(8);

    const { PUT } = await import('~/app/api/audit-rounds/[id]/samples/[jobId]/route');
    state.principal = auditorA;
    const notMine = await PUT(
      request(`/api/audit-rounds/${round.id}/samples/${round.sampledJobIds[0]}`, {
        method: 'PUT',
        body: { answers: answers(), final: true },
      }),
      params({ id: String(round.id), jobId: String(round.sampledJobIds[0]) }),
    );
    expect(notMine.status).toBe(404);
    state.principal = auditorB;
    const bad = await PUT(
      request(`/api/audit-rounds/${round.id}/samples/${round.sampledJobIds[0]}`, {
        method: 'PUT',
        body: { answers: [{ itemId: 999_999, result: 'pass' }] },
      }),
      params({ id: String(round.id), jobId: String(round.sampledJobIds[0]) }),
    );
    expect(bad.status).toBe(400);
    expect(
      await db()
        .select()
        .from(auditAnswers)
        .innerJoin(auditSamples, eq(auditSamples.id, auditAnswers.sampleId))
        .where(eq(auditSamples.roundId, round.id)),
    ).toEqual([]);

    const { POST: redraw } = await import('~/app/api/audit-rounds/[id]/redraw-check/route');
    state.principal = owner;
    const check = await redraw(
      request(`/api/audit-rounds/${round.id}/redraw-check`, { method: 'POST' }),
      params({ id: String(round.id) }),
    );
    expect(await check.json()).toMatchObject({ matches: true, redrawn: round.sampledJobIds });
  });

  it('shop lead – PATCH /api/corrective-actions with the id in the body; bad status is 400', async () => {
    const { PATCH } = await import('~/app/api/corrective-actions/route');
    const [open] = await listCorrectiveActions(leadDune, { status: 'open' });
    state.principal = leadDune;
    const bad = await PATCH(
      request('/api/corrective-actions', {
        method: 'PATCH',
        body: { id: open!.id, status: 'closed' },
      }),
      params({}),
    );
    expect(bad.status).toBe(400);
    const ok = await PATCH(
      request('/api/corrective-actions', {
        method: 'PATCH',
        body: { id: open!.id, status: 'in_progress' },
      }),
      params({}),
    );
    expect(ok.status).toBe(200);
    expect(await ok.json()).toMatchObject({ id: open!.id, status: 'in_progress' });
  });
});
