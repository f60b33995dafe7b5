import { and, asc, eq, isNull, sql, type Tx } from '@reelwright/db';
import {
  activityLog,
  auditAnswers,
  auditFormItems,
  auditForms,
  auditRounds,
  auditSamples,
  correctiveActions,
  networkSettings,
  shops,
  users,
  type AuditRound,
} from '@reelwright/db/schema';
import { scoreAudit, type AuditAnswer, type AuditVerdict } from '@reelwright/metrics';
import type { SampleAnswersInput, VerdictValue } from '~/lib/validators/audits';
import { db } from '../db';
import { badRequest, conflict, notFound, type FieldError } from '../errors';
import { queueEmail } from '../mail/outbox';
import type { Principal } from '../principal';
import { auditRejectedEmail, period } from './emails';
import { addDays, decideLot, localToday } from './sampling';
import * as clock from '~/server/clock';

const VERDICT_VALUES: Record<AuditVerdict, VerdictValue> = {
  'meets standard': 'meets_standard',
  'needs work': 'needs_work',
  'critical miss': 'critical_miss',
};

const VERDICT_WORDS: Record<VerdictValue, string> = {
  meets_standard: 'meets standard',
  needs_work: 'needs work',
  critical_miss: 'critical miss',
};

export interface SavedSample {
  roundId: number;
  jobId: number;
  /** Score and verdict of the answers so far; stored only once the sample is finished. */
  score: number;
  verdict: VerdictValue;
  final: boolean;
  answered: number;
  items: number;
  round: {
    status: AuditRound['status'];
    scored: number;
    sampleSize: number;
    failures: number | null;
    decision: AuditRound['decision'];
  };
  correctiveActionId: number | null;
  /** The first sampled job, in draw order, not finished yet; null when all are. */
  nextUnscoredJobId: number | null;
}

/**
 * Saves the auditor's answers for one sampled job, part-way or final. Only the auditor the round
 * is assigned to may (404 for anyone else's round). When the last sample is finished the lot is
 * decided, and a rejection opens a corrective action and e-mails the shop lead and the regional
 * manager — all in the same transaction.
 */
export async function saveSample(
  principal: Principal,
  roundId: number,
  jobId: number,
  input: SampleAnswersInput,
): Promise<SavedSample> {
  const conn = await db();
  return conn.transaction(async (tx) => {
    const [round] = await tx
      .select()
      .from(auditRounds)
      .where(and(eq(auditRounds.id, roundId), eq(auditRounds.auditorId, principal.id)))
      .for('update');
    if (!round) throw notFound('audit round');
    const [sample] = await tx
      .select()
      .from(auditSamples)
      .where(and(eq(auditSamples.roundId, roundId), eq(auditSamples.jobId, jobId)));
    // A job that is not in the sample is 404 whatever the round's state, as in any other round.
    if (!sample) throw notFound('sampled job');
    if (round.status === 'decided' || round.status === 'cancelled')
      throw conflict(`Round #${round.id} is ${round.status}; its scores can no longer change.`);

    const items = await tx
      .select()
      .from(auditFormItems)
      .where(eq(auditFormItems.formId, round.formId))
      .orderBy(asc(auditFormItems.position));
    const [form] = await tx
      .select({ version: auditForms.version })
      .from(auditForms)
      .where(eq(auditForms.id, round.formId));
    const itemIds = new Set(items.map((i) => i.id));
    const errors: FieldError[] = [];
    input.answers.forEach((a, i) => {
      if (!itemIds.has(a.itemId))
        errors.push({
          field: `body.answers.${i}.itemId`,
          message: `Not an item of audit form version ${form?.version ?? '?'}`,
        });
    });
    if (errors.length) throw badRequest('Some answers are not for this round’s form.', errors);
    const answered = new Set(input.answers.map((a) => a.itemId));
    const missing = items.filter((i) => !answered.has(i.id));
    if (input.final && missing.length)
      throw badRequest(
        `Answer every item before finishing: ${missing.map((i) => i.title).join('; ')}.`,
        missing.map((i) => ({ field: `item.${i.id}`, message: 'Not answered yet' })),
      );

    const [settings] = await tx
      .select({
        passMark: networkSettings.auditPassMark,
        dueDays: networkSettings.correctiveActionDueDays,
      })
      .from(networkSettings)
      .limit(1);
    const byId: Record<string, AuditAnswer> = {};
    for (const a of input.answers)
      byId[String(a.itemId)] = a.result === 'not_applicable' ? 'n/a' : a.result;
    const result = scoreAudit(
      items.map((i) => ({ id: String(i.id), weight: i.weight, critical: i.critical })),
      byId,
      settings?.passMark ?? 85,
    );
    const verdict = VERDICT_VALUES[result.verdict];
    const score = Math.round(result.score * 100) / 100;
    const now = clock.now();
    const final = input.final === true;

    await tx.delete(auditAnswers).where(eq(auditAnswers.sampleId, sample.id));
    if (input.answers.length)
      await tx.insert(auditAnswers).values(
        input.answers.map((a) => ({
          sampleId: sample.id,
          itemId: a.itemId,
          result: a.result,
          note: a.note || null,
          answeredAt: now,
        })),
      );
    await tx
      .update(auditSamples)
      .set({
        note: input.note || null,
        startedAt: sample.startedAt ?? now,
        score: final ? score : null,
        verdict: final ? verdict : null,
        completedAt: final ? now : null,
      })
      .where(eq(auditSamples.id, sample.id));
    if (round.status === 'planned')
      await tx
        .update(auditRounds)
        .set({ status: 'in_progress' })
        .where(eq(auditRounds.id, round.id));
    await tx.insert(activityLog).values({
      at: now,
      userId: principal.id,
      action: final ? 'audit_sample.score' : 'audit_sample.save',
      entityType: 'audit_sample',
      entityId: sample.id,
      shopId: round.shopId,
      before: {
        score: sample.score,
        verdict: sample.verdict,
        completedAt: sample.completedAt?.toISOString() ?? null,
      },
      after: {
        roundId,
        jobId,
        score: final ? score : null,
        verdict: final ? verdict : null,
        answers: input.answers.length,
      },
    });

    const [progress] = await tx
      .select({
        scored:
          sql<number>`count(*) filter (where ${auditSamples.completedAt} is not null)`.mapWith(
            Number,
          ),
        failures:
          sql<number>`count(*) filter (where ${auditSamples.completedAt} is not null and ${auditSamples.verdict} <> 'meets_standard')`.mapWith(
            Number,
          ),
        total: sql<number>`count(*)`.mapWith(Number),
      })
      .from(auditSamples)
      .where(eq(auditSamples.roundId, round.id));
    const scored = progress?.scored ?? 0;
    let status: AuditRound['status'] = round.status === 'planned' ? 'in_progress' : round.status;
    let decision: AuditRound['decision'] = null;
    let failures: number | null = null;
    let correctiveActionId: number | null = null;
    if (final && progress && scored === progress.total) {
      failures = progress.failures;
      decision = decideLot(failures, { accept: round.acceptNumber, reject: round.rejectNumber });
      status = 'decided';
      await tx
        .update(auditRounds)
        .set({ status, failures, decision, decidedAt: now })
        .where(and(eq(auditRounds.id, round.id), isNull(auditRounds.decidedAt)));
      await tx.insert(activityLog).values({
        at: now,
        userId: principal.id,
        action: 'audit_round.decide',
        entityType: 'audit_round',
        entityId: round.id,
        shopId: round.shopId,
        before: { status: round.status },
        after: {
          status,
          failures,
          decision,
          accept: round.acceptNumber,
          reject: round.rejectNumber,
        },
      });
      if (decision === 'rejected')
        correctiveActionId = await openCorrectiveAction(tx, principal, round, {
          failures,
          dueDays: settings?.dueDays ?? 14,
          now,
        });
    }
    const [nextUnscored] = await tx
      .select({ jobId: auditSamples.jobId })
      .from(auditSamples)
      .where(and(eq(auditSamples.roundId, round.id), isNull(auditSamples.completedAt)))
      .orderBy(asc(auditSamples.position))
      .limit(1);
    return {
      roundId,
      jobId,
      score,
      verdict,
      final,
      answered: answered.size,
      items: items.length,
      round: { status, scored, sampleSize: round.sampleSize, failures, decision },
      correctiveActionId,
      nextUnscoredJobId: nextUnscored?.jobId ?? null,
    };
  });
}

/** The corrective action a rejected lot opens for the shop lead, and the e-mails it sends. */
async function openCorrectiveAction(
  tx: Tx,
  principal: Principal,
  round: AuditRound,
  facts: { failures: number; dueDays: number; now: Date },
): Promise<number> {
  const [shop] = await tx
    .select({ id: shops.id, name: shops.name, timeZone: shops.timeZone, regionId: shops.regionId })
    .from(shops)
    .where(eq(shops.id, round.shopId));
  if (!shop) throw new Error(`Round ${round.id} has no shop`);
  const people = await tx
    .select({
      id: users.id,
      name: users.name,
      email: users.email,
      role: users.role,
      shopId: users.shopId,
      regionId: users.regionId,
    })
    .from(users)
    .where(
      and(
        eq(users.active, true),
        sql`((${users.role} = 'shop_lead' and ${users.shopId} = ${shop.id}) or (${users.role} = 'regional_manager' and ${users.regionId} = ${shop.regionId}))`,
      ),
    )
    .orderBy(asc(users.id));
  const leads = people.filter((p) => p.role === 'shop_lead');
  const managers = people.filter((p) => p.role === 'regional_manager');
  const owner = leads[0] ?? null;

  const failed = await tx
    .select({
      jobId: auditSamples.jobId,
      verdict: auditSamples.verdict,
      score: auditSamples.score,
      critical: sql<
        string[]
      >`coalesce(array_agg(${auditFormItems.title} order by ${auditFormItems.position}) filter (where ${auditAnswers.result} = 'fail' and ${auditFormItems.critical}), '{}')`,
    })
    .from(auditSamples)
    .leftJoin(auditAnswers, eq(auditAnswers.sampleId, auditSamples.id))
    .leftJoin(auditFormItems, eq(auditFormItems.id, auditAnswers.itemId))
    .where(
      and(eq(auditSamples.roundId, round.id), sql`${auditSamples.verdict} <> 'meets_standard'`),
    )
    .groupBy(auditSamples.id)
    .orderBy(asc(auditSamples.position));
  const lines = failed.map((f) => {
    const words = f.verdict ? VERDICT_WORDS[f.verdict] : 'not scored';
    const critical = f.critical.length ? ` (${f.critical.join('; ')})` : '';
    return `Job #${f.jobId}: ${words}, score ${Math.round(f.score ?? 0)}${critical}.`;
  });
  const dueOn = addDays(localToday(shop.timeZone, facts.now), facts.dueDays);
  const description = [
    `${facts.failures} of ${round.sampleSize} sampled jobs fell short of the standard (accept ${round.acceptNumber}, reject ${round.rejectNumber}), so the lot of ${round.lotSize} jobs ready ${period(round.periodStart, round.periodEnd)} is rejected.`,
    ...lines,
    'Find the cause of each shortfall, put it right at the bench (training, checklist use, tools), and note what changed before marking this done.',
  ].join('\n');
  const [action] = await tx
    .insert(correctiveActions)
    .values({
      shopId: shop.id,
      source: 'audit',
      auditRoundId: round.id,
      title: `Audit round #${round.id} rejected: bring ${shop.name} back to the standard`,
      description,
      ownerId: owner?.id ?? null,
      dueOn,
      status: 'open',
      createdById: principal.id,
    })
    .returning({ id: correctiveActions.id });
  if (!action) throw new Error('openCorrectiveAction: insert returned no row');
  await tx.insert(activityLog).values({
    at: facts.now,
    userId: principal.id,
    action: 'corrective_action.open',
    entityType: 'corrective_action',
    entityId: action.id,
    shopId: shop.id,
    before: null,
    after: { auditRoundId: round.id, ownerId: owner?.id ?? null, dueOn, status: 'open' },
  });
  for (const person of [...leads, ...managers]) {
    const message = auditRejectedEmail({
      recipientName: person.name,
      shopName: shop.name,
      roundId: round.id,
      from: round.periodStart,
      to: round.periodEnd,
      failures: facts.failures,
      sampleSize: round.sampleSize,
      reject: round.rejectNumber,
      correctiveActionId: action.id,
      dueOn,
      ownerName: owner?.name ?? null,
    });
    await queueEmail(tx, {
      kind: 'audit_rejected',
      to: person.email,
      subject: message.subject,
      text: message.text,
      shopId: shop.id,
      entityType: 'audit_round',
      entityId: round.id,
    });
  }
  return action.id;
}
