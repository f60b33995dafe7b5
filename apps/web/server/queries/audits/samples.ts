import { and, asc, eq } from '@reelwright/db';
import { auditAnswers, auditForms, auditSamples } from '@reelwright/db/schema';
import type { AnswerResultValue, VerdictValue } from '~/lib/validators/audits';
import { db } from '../../db';
import { notFound } from '../../errors';
import type { Principal } from '../../principal';
import { formItems, passMark, type FormItemView } from './forms';
import { jobRecord, type JobRecord } from './job-record';
import { findRound, toRoundRow, type RoundRow } from './round-row';

export interface SampleView {
  round: RoundRow & { formVersion: number };
  position: number;
  /** Previous and next sampled job, in draw order. */
  previousJobId: number | null;
  nextJobId: number | null;
  sample: {
    score: number | null;
    verdict: VerdictValue | null;
    note: string | null;
    startedAt: string | null;
    completedAt: string | null;
  };
  items: FormItemView[];
  answers: { itemId: number; result: AnswerResultValue; note: string | null }[];
  passMark: number;
  job: JobRecord;
  /** True for the auditor assigned to the round while it is not decided. */
  canScore: boolean;
}

/** One sampled job of a round, with the form, the answers so far and the job's record. */
export async function getSample(
  principal: Principal,
  roundId: number,
  jobId: number,
): Promise<SampleView> {
  const round = await findRound(principal, roundId);
  const conn = await db();
  const samples = await conn
    .select()
    .from(auditSamples)
    .where(eq(auditSamples.roundId, roundId))
    .orderBy(asc(auditSamples.position));
  const index = samples.findIndex((s) => s.jobId === jobId);
  const sample = samples[index];
  if (!sample) throw notFound('sampled job');
  const [items, answers, mark, job, form] = await Promise.all([
    formItems(round.formId),
    conn
      .select({ itemId: auditAnswers.itemId, result: auditAnswers.result, note: auditAnswers.note })
      .from(auditAnswers)
      .where(eq(auditAnswers.sampleId, sample.id)),
    passMark(),
    jobRecord(
      jobId,
      (photoId) => `/api/audit-rounds/${roundId}/samples/${jobId}/photos/${photoId}`,
    ),
    conn
      .select({ version: auditForms.version })
      .from(auditForms)
      .where(eq(auditForms.id, round.formId)),
  ]);
  return {
    round: { ...toRoundRow(round), formVersion: form[0]?.version ?? 0 },
    position: sample.position,
    previousJobId: samples[index - 1]?.jobId ?? null,
    nextJobId: samples[index + 1]?.jobId ?? null,
    sample: {
      score: sample.score,
      verdict: sample.verdict,
      note: sample.note,
      startedAt: sample.startedAt?.toISOString() ?? null,
      completedAt: sample.completedAt?.toISOString() ?? null,
    },
    items,
    answers,
    passMark: mark,
    job,
    canScore:
      principal.role === 'auditor' &&
      round.auditorId === principal.id &&
      round.status !== 'decided' &&
      round.status !== 'cancelled',
  };
}

/** 404 unless the job is in the sample of a round the caller sees (for serving its photos). */
export async function requireSampledJob(principal: Principal, roundId: number, jobId: number) {
  await findRound(principal, roundId);
  const conn = await db();
  const [sample] = await conn
    .select({ id: auditSamples.id })
    .from(auditSamples)
    .where(and(eq(auditSamples.roundId, roundId), eq(auditSamples.jobId, jobId)))
    .limit(1);
  if (!sample) throw notFound('sampled job');
}
