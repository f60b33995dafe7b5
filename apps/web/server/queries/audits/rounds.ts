import { and, asc, desc, eq, sql } from '@reelwright/db';
import {
  auditAnswers,
  auditFormItems,
  auditForms,
  auditRounds,
  auditSamples,
  correctiveActions,
  emails,
  jobs,
  reels,
  shops,
  users,
  type EmailKind,
} from '@reelwright/db/schema';
import { drawSample } from '@reelwright/metrics';
import { can } from '~/lib/permissions';
import type {
  AnswerResultValue,
  CorrectiveActionStatusValue,
  RoundListQuery,
  VerdictValue,
} from '~/lib/validators/audits';
import { lotJobIds } from '../../audits/sampling';
import { db } from '../../db';
import type { Principal } from '../../principal';
import { shopFilter } from '../scope';
import { formItems } from './forms';
import { findRound, roundColumns, roundScope, toRoundRow, type RoundRow } from './round-row';

/** The rounds the caller sees, newest period first; 404 for a shop filter outside the caller's shops. */
export async function listRounds(
  principal: Principal,
  query: RoundListQuery = {},
): Promise<RoundRow[]> {
  const conn = await db();
  await shopFilter(principal, query.shopId, conn);
  const rows = await conn
    .select(roundColumns())
    .from(auditRounds)
    .innerJoin(shops, eq(shops.id, auditRounds.shopId))
    .leftJoin(users, eq(users.id, auditRounds.auditorId))
    .where(
      and(
        roundScope(principal),
        query.shopId === undefined ? undefined : eq(auditRounds.shopId, query.shopId),
        query.status === undefined ? undefined : eq(auditRounds.status, query.status),
      ),
    )
    .orderBy(desc(auditRounds.periodEnd), desc(auditRounds.id));
  return rows.map(toRoundRow);
}

export interface RoundSampleRow {
  position: number;
  jobId: number;
  serviceType: string;
  reel: string;
  readyAt: string | null;
  score: number | null;
  verdict: VerdictValue | null;
  startedAt: string | null;
  completedAt: string | null;
  answered: number;
}

export interface RoundDetail extends RoundRow {
  seed: string;
  lotJobIds: number[];
  plan: Record<string, unknown> | null;
  form: { id: number; version: number; title: string; items: number };
  plannedBy: { id: number; name: string };
  samples: RoundSampleRow[];
  correctiveActions: {
    id: number;
    title: string;
    status: CorrectiveActionStatusValue;
    dueOn: string;
    ownerName: string | null;
  }[];
  /** E-mail the round sent (planners and the owner only; null for others). */
  emails:
    | {
        id: number;
        kind: EmailKind;
        to: string;
        subject: string;
        status: string;
        createdAt: string;
      }[]
    | null;
}

/** One round with its plan, seed, lot, sample and follow-up; 404 outside what the caller sees. */
export async function getRound(principal: Principal, id: number): Promise<RoundDetail> {
  const row = await findRound(principal, id);
  const conn = await db();
  const [form, samples, actions, mail] = await Promise.all([
    conn
      .select({
        id: auditForms.id,
        version: auditForms.version,
        title: auditForms.title,
        items:
          sql<number>`(select count(*) from ${auditFormItems} i where i.form_id = ${auditForms}.id)`.mapWith(
            Number,
          ),
      })
      .from(auditForms)
      .where(eq(auditForms.id, row.formId)),
    conn
      .select({
        position: auditSamples.position,
        jobId: auditSamples.jobId,
        serviceType: jobs.serviceType,
        maker: reels.maker,
        model: reels.model,
        readyAt: jobs.readyAt,
        score: auditSamples.score,
        verdict: auditSamples.verdict,
        startedAt: auditSamples.startedAt,
        completedAt: auditSamples.completedAt,
        answered:
          sql<number>`(select count(*) from ${auditAnswers} a where a.sample_id = ${auditSamples}.id)`.mapWith(
            Number,
          ),
      })
      .from(auditSamples)
      .innerJoin(jobs, eq(jobs.id, auditSamples.jobId))
      .innerJoin(reels, eq(reels.id, jobs.reelId))
      .where(eq(auditSamples.roundId, id))
      .orderBy(asc(auditSamples.position)),
    conn
      .select({
        id: correctiveActions.id,
        title: correctiveActions.title,
        status: correctiveActions.status,
        dueOn: correctiveActions.dueOn,
        ownerName: users.name,
      })
      .from(correctiveActions)
      .leftJoin(users, eq(users.id, correctiveActions.ownerId))
      .where(eq(correctiveActions.auditRoundId, id))
      .orderBy(asc(correctiveActions.id)),
    can(principal.role, 'audits:plan')
      ? conn
          .select({
            id: emails.id,
            kind: emails.kind,
            to: emails.toAddress,
            subject: emails.subject,
            status: emails.status,
            createdAt: emails.createdAt,
          })
          .from(emails)
          .where(and(eq(emails.entityType, 'audit_round'), eq(emails.entityId, id)))
          .orderBy(asc(emails.id))
      : Promise.resolve(null),
  ]);
  return {
    ...toRoundRow(row),
    seed: row.seed,
    lotJobIds: row.lotJobIds,
    plan: row.plan,
    form: form[0] ?? { id: row.formId, version: 0, title: 'Unknown form', items: 0 },
    plannedBy: { id: row.plannedById, name: row.plannedByName },
    samples: samples.map((s) => ({
      position: s.position,
      jobId: s.jobId,
      serviceType: s.serviceType,
      reel: `${s.maker} ${s.model}`,
      readyAt: s.readyAt?.toISOString() ?? null,
      score: s.score,
      verdict: s.verdict,
      startedAt: s.startedAt?.toISOString() ?? null,
      completedAt: s.completedAt?.toISOString() ?? null,
      answered: s.answered,
    })),
    correctiveActions: actions,
    emails: mail?.map((m) => ({ ...m, createdAt: m.createdAt.toISOString() })) ?? null,
  };
}

export interface RedrawCheck {
  seed: string;
  lotSize: number;
  sampleSize: number;
  stored: number[];
  redrawn: number[];
  /** True when the stored seed and lot redraw exactly the stored sample, in the same order. */
  matches: boolean;
  /** Jobs that became ready in the period now, counted again from the job records. */
  currentLotSize: number;
  /** True when the lot counted now is the stored lot (a job imported later would change it). */
  lotUnchanged: boolean;
}

/** Redraws the sample from the stored seed and lot and compares it with the stored sample. */
export async function redrawCheck(principal: Principal, id: number): Promise<RedrawCheck> {
  const row = await findRound(principal, id);
  const conn = await db();
  const stored = await conn
    .select({ jobId: auditSamples.jobId })
    .from(auditSamples)
    .where(eq(auditSamples.roundId, id))
    .orderBy(asc(auditSamples.position));
  const redrawn = drawSample(row.lotJobIds, row.sampleSize, row.seed);
  const current = await lotJobIds(
    conn,
    { id: row.shopId, timeZone: row.timeZone },
    row.periodStart,
    row.periodEnd,
  );
  const storedIds = stored.map((s) => s.jobId);
  return {
    seed: row.seed,
    lotSize: row.lotJobIds.length,
    sampleSize: row.sampleSize,
    stored: storedIds,
    redrawn,
    matches: redrawn.length === storedIds.length && redrawn.every((v, i) => v === storedIds[i]),
    currentLotSize: current.length,
    lotUnchanged:
      current.length === row.lotJobIds.length && current.every((v, i) => v === row.lotJobIds[i]),
  };
}

export interface ReportSample extends RoundSampleRow {
  answers: { itemId: number; result: AnswerResultValue; note: string | null }[];
  note: string | null;
}

/** Everything the printable report shows: the round, the form and every sample's answers. */
export async function getRoundReport(principal: Principal, id: number) {
  const round = await getRound(principal, id);
  const conn = await db();
  const [items, answers, notes] = await Promise.all([
    formItems(round.form.id),
    conn
      .select({
        jobId: auditSamples.jobId,
        itemId: auditAnswers.itemId,
        result: auditAnswers.result,
        note: auditAnswers.note,
      })
      .from(auditAnswers)
      .innerJoin(auditSamples, eq(auditSamples.id, auditAnswers.sampleId))
      .where(eq(auditSamples.roundId, id)),
    conn
      .select({ jobId: auditSamples.jobId, note: auditSamples.note })
      .from(auditSamples)
      .where(eq(auditSamples.roundId, id)),
  ]);
  const noteByJob = new Map(notes.map((n) => [n.jobId, n.note]));
  const samples: ReportSample[] = round.samples.map((s) => ({
    ...s,
    note: noteByJob.get(s.jobId) ?? null,
    answers: answers
      .filter((a) => a.jobId === s.jobId)
      .map((a) => ({ itemId: a.itemId, result: a.result, note: a.note })),
  }));
  return { round, items, samples };
}
