import { aliasedTable, and, asc, desc, eq, isNotNull, sql, type SQL } from '@reelwright/db';
import {
  auditAnswers,
  auditFormItems,
  auditForms,
  auditRounds,
  auditSamples,
  benchSessions,
  checklistTicks,
  correctiveActions,
  emails,
  jobEvents,
  jobs,
  networkSettings,
  partLines,
  photos,
  reels,
  serviceStandardSteps,
  serviceStandards,
  shops,
  users,
  type EmailKind,
} from '@reelwright/db/schema';
import {
  drawSample,
  fairnessBand,
  wilsonInterval,
  type FairnessBand,
  type Interval,
} from '@reelwright/metrics';
import { can } from '~/lib/permissions';
import type {
  AnswerResultValue,
  CorrectiveActionStatusValue,
  InspectionLevelValue,
  RoundListQuery,
  RoundStatusValue,
  SeverityValue,
  VerdictValue,
} from '~/lib/validators/audits';
import { lotJobIds, shopSeverities, shopSeverity } from '../audits/sampling';
import { db } from '../db';
import { notFound } from '../errors';
import type { Principal } from '../principal';
import { presignView, storageConfigured } from '../storage';
import { shopScope } from './scope';

/**
 * Which rounds the caller sees: an auditor only the rounds assigned to them; a shop lead their
 * shop's rounds once decided (before that the sample is not disclosed to the shop, whose people
 * could still edit the sampled jobs); managers and the owner every round of their shops.
 */
export function roundScope(principal: Principal): SQL | undefined {
  if (principal.role === 'auditor') return eq(auditRounds.auditorId, principal.id);
  switch (principal.scope.kind) {
    case 'network':
      return undefined;
    case 'region':
      return eq(shops.regionId, principal.scope.regionId);
    case 'shop':
      return and(eq(shops.id, principal.scope.shopId), eq(auditRounds.status, 'decided'));
  }
}

export interface RoundRow {
  id: number;
  shop: { id: number; name: string; timeZone: string; regionId: number };
  periodStart: string;
  periodEnd: string;
  status: RoundStatusValue;
  severity: SeverityValue;
  aql: number;
  inspectionLevel: InspectionLevelValue;
  lotSize: number;
  codeLetter: string;
  sampleSize: number;
  acceptNumber: number;
  rejectNumber: number;
  decision: 'accepted' | 'rejected' | null;
  failures: number | null;
  auditor: { id: number; name: string } | null;
  plannedAt: string;
  decidedAt: string | null;
  scored: number;
}

const scoredCount =
  sql<number>`(select count(*) from ${auditSamples} s where s.round_id = ${auditRounds}.id and s.completed_at is not null)`.mapWith(
    Number,
  );

function roundColumns() {
  return {
    id: auditRounds.id,
    shopId: shops.id,
    shopName: shops.name,
    timeZone: shops.timeZone,
    regionId: shops.regionId,
    periodStart: auditRounds.periodStart,
    periodEnd: auditRounds.periodEnd,
    status: auditRounds.status,
    severity: auditRounds.severity,
    aql: auditRounds.aql,
    inspectionLevel: auditRounds.inspectionLevel,
    lotSize: auditRounds.lotSize,
    codeLetter: auditRounds.codeLetter,
    sampleSize: auditRounds.sampleSize,
    acceptNumber: auditRounds.acceptNumber,
    rejectNumber: auditRounds.rejectNumber,
    decision: auditRounds.decision,
    failures: auditRounds.failures,
    auditorId: users.id,
    auditorName: users.name,
    plannedAt: auditRounds.plannedAt,
    decidedAt: auditRounds.decidedAt,
    scored: scoredCount,
  };
}

interface RoundSelect {
  id: number;
  shopId: number;
  shopName: string;
  timeZone: string;
  regionId: number;
  periodStart: string;
  periodEnd: string;
  status: RoundStatusValue;
  severity: SeverityValue;
  aql: number;
  inspectionLevel: InspectionLevelValue;
  lotSize: number;
  codeLetter: string;
  sampleSize: number;
  acceptNumber: number;
  rejectNumber: number;
  decision: 'accepted' | 'rejected' | null;
  failures: number | null;
  auditorId: number | null;
  auditorName: string | null;
  plannedAt: Date;
  decidedAt: Date | null;
  scored: number;
}

function toRoundRow(r: RoundSelect): RoundRow {
  return {
    id: r.id,
    shop: { id: r.shopId, name: r.shopName, timeZone: r.timeZone, regionId: r.regionId },
    periodStart: r.periodStart,
    periodEnd: r.periodEnd,
    status: r.status,
    severity: r.severity,
    aql: r.aql,
    inspectionLevel: r.inspectionLevel,
    lotSize: r.lotSize,
    codeLetter: r.codeLetter,
    sampleSize: r.sampleSize,
    acceptNumber: r.acceptNumber,
    rejectNumber: r.rejectNumber,
    decision: r.decision,
    failures: r.failures,
    auditor: r.auditorId == null ? null : { id: r.auditorId, name: r.auditorName ?? '' },
    plannedAt: r.plannedAt.toISOString(),
    decidedAt: r.decidedAt?.toISOString() ?? null,
    scored: r.scored,
  };
}

/** The rounds the caller sees, newest period first. */
export async function listRounds(
  principal: Principal,
  query: RoundListQuery = {},
): Promise<RoundRow[]> {
  const conn = await db();
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

async function findRound(principal: Principal, id: number) {
  const conn = await db();
  const [row] = await conn
    .select({
      ...roundColumns(),
      seed: auditRounds.seed,
      lotJobIds: auditRounds.lotJobIds,
      plan: auditRounds.plan,
      formId: auditRounds.formId,
      plannedById: auditRounds.plannedById,
      plannedByName: sql<string>`(select pb.name from ${users} pb where pb.id = ${auditRounds}.planned_by_id)`,
    })
    .from(auditRounds)
    .innerJoin(shops, eq(shops.id, auditRounds.shopId))
    .leftJoin(users, eq(users.id, auditRounds.auditorId))
    .where(and(eq(auditRounds.id, id), roundScope(principal)));
  if (!row) throw notFound('audit round');
  return row;
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

export interface FormItemView {
  id: number;
  position: number;
  code: string;
  title: string;
  guidance: string | null;
  weight: number;
  critical: boolean;
}

export interface JobRecord {
  id: number;
  state: string;
  serviceType: string;
  checkedInAt: string;
  promisedAt: string | null;
  readyAt: string | null;
  collectedAt: string | null;
  complaint: string | null;
  condition: string | null;
  findings: string | null;
  incompleteChecklistReason: string | null;
  comebackOfJobId: number | null;
  technicianName: string | null;
  reel: {
    kind: string;
    maker: string;
    model: string;
    size: string | null;
    bearingCount: number | null;
    gearRatio: string | null;
    useProfile: string;
    water: string;
  };
  events: {
    id: number;
    fromState: string | null;
    toState: string;
    at: string;
    userName: string | null;
    note: string | null;
  }[];
  bench: {
    minutes: number;
    sessions: {
      id: number;
      technicianName: string;
      startedAt: string | null;
      minutes: number | null;
      note: string | null;
    }[];
  };
  checklist: {
    standard: { version: number; title: string } | null;
    steps: {
      id: number;
      group: string;
      code: string;
      title: string;
      required: boolean;
      ticked: boolean;
      tickedAt: string | null;
      tickedBy: string | null;
      note: string | null;
    }[];
  };
  parts: {
    id: number;
    name: string;
    partNumber: string | null;
    quantity: number;
    unitPriceCents: number;
  }[];
  money: {
    labourCents: number;
    partsCents: number;
    discountCents: number;
    totalCents: number;
    partLinesCents: number;
    labourRateCents: number;
  };
  photos: {
    id: number;
    stage: string;
    name: string;
    caption: string | null;
    width: number | null;
    height: number | null;
    contentType: string;
    /** A short-lived view URL; null when photo storage is not configured on this server. */
    url: string | null;
  }[];
  /** False when photo storage is not configured: photos are listed by name only. */
  photosViewable: boolean;
}

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

/** The read-only record of a job, as an audit sees it (no customer contact details). */
export async function jobRecord(jobId: number): Promise<JobRecord> {
  const conn = await db();
  const [row] = await conn
    .select({ job: jobs, reel: reels, technicianName: users.name, rate: shops.labourRateCents })
    .from(jobs)
    .innerJoin(reels, eq(reels.id, jobs.reelId))
    .innerJoin(shops, eq(shops.id, jobs.shopId))
    .leftJoin(users, eq(users.id, jobs.technicianId))
    .where(eq(jobs.id, jobId));
  if (!row) throw notFound('job');
  const { job, reel } = row;
  const ticker = aliasedTable(users, 'ticker');
  const [events, sessions, parts, standard, steps, ticks, pictures] = await Promise.all([
    conn
      .select({
        id: jobEvents.id,
        fromState: jobEvents.fromState,
        toState: jobEvents.toState,
        at: jobEvents.at,
        userName: users.name,
        note: jobEvents.note,
      })
      .from(jobEvents)
      .leftJoin(users, eq(users.id, jobEvents.userId))
      .where(eq(jobEvents.jobId, jobId))
      .orderBy(asc(jobEvents.at), asc(jobEvents.id)),
    conn
      .select({
        id: benchSessions.id,
        technicianName: users.name,
        startedAt: benchSessions.startedAt,
        minutes: benchSessions.minutes,
        note: benchSessions.note,
      })
      .from(benchSessions)
      .innerJoin(users, eq(users.id, benchSessions.technicianId))
      .where(eq(benchSessions.jobId, jobId))
      .orderBy(asc(benchSessions.createdAt), asc(benchSessions.id)),
    conn
      .select({
        id: partLines.id,
        name: partLines.name,
        partNumber: partLines.partNumber,
        quantity: partLines.quantity,
        unitPriceCents: partLines.unitPriceCents,
      })
      .from(partLines)
      .where(eq(partLines.jobId, jobId))
      .orderBy(asc(partLines.createdAt), asc(partLines.id)),
    job.serviceStandardId === null
      ? Promise.resolve([])
      : conn
          .select({ version: serviceStandards.version, title: serviceStandards.title })
          .from(serviceStandards)
          .where(eq(serviceStandards.id, job.serviceStandardId)),
    job.serviceStandardId === null
      ? Promise.resolve([])
      : conn
          .select()
          .from(serviceStandardSteps)
          .where(eq(serviceStandardSteps.standardId, job.serviceStandardId))
          .orderBy(asc(serviceStandardSteps.position)),
    conn
      .select({
        stepId: checklistTicks.stepId,
        tickedAt: checklistTicks.tickedAt,
        userName: ticker.name,
        note: checklistTicks.note,
      })
      .from(checklistTicks)
      .leftJoin(ticker, eq(ticker.id, checklistTicks.userId))
      .where(eq(checklistTicks.jobId, jobId)),
    conn
      .select()
      .from(photos)
      .where(and(eq(photos.jobId, jobId), isNotNull(photos.confirmedAt)))
      .orderBy(asc(photos.createdAt), asc(photos.id)),
  ]);
  const tickByStep = new Map(ticks.map((t) => [t.stepId, t]));
  const viewable = storageConfigured();
  const photoViews = await Promise.all(
    pictures.map(async (p) => ({
      id: p.id,
      stage: p.stage,
      name: p.originalName ?? `Photo ${p.id}`,
      caption: p.caption,
      width: p.width,
      height: p.height,
      contentType: p.contentType,
      url: viewable ? await presignView(p.storageKey, p.contentType).catch(() => null) : null,
    })),
  );
  const minutes = sessions.reduce((t, s) => t + (s.minutes ?? 0), 0);
  return {
    id: job.id,
    state: job.state,
    serviceType: job.serviceType,
    checkedInAt: job.checkedInAt.toISOString(),
    promisedAt: job.promisedAt?.toISOString() ?? null,
    readyAt: job.readyAt?.toISOString() ?? null,
    collectedAt: job.collectedAt?.toISOString() ?? null,
    complaint: job.complaint,
    condition: job.condition,
    findings: job.findings,
    incompleteChecklistReason: job.incompleteChecklistReason,
    comebackOfJobId: job.comebackOfJobId,
    technicianName: row.technicianName,
    reel: {
      kind: reel.kind,
      maker: reel.maker,
      model: reel.model,
      size: reel.size,
      bearingCount: reel.bearingCount,
      gearRatio: reel.gearRatio,
      useProfile: reel.useProfile,
      water: reel.water,
    },
    events: events.map((e) => ({ ...e, at: e.at.toISOString() })),
    bench: {
      minutes,
      sessions: sessions.map((s) => ({ ...s, startedAt: s.startedAt?.toISOString() ?? null })),
    },
    checklist: {
      standard: standard[0] ?? null,
      steps: steps
        .filter((s) => !s.appliesTo || s.appliesTo.includes(reel.kind))
        .map((s) => {
          const tick = tickByStep.get(s.id);
          return {
            id: s.id,
            group: s.group,
            code: s.code,
            title: s.title,
            required: s.required,
            ticked: Boolean(tick),
            tickedAt: tick?.tickedAt.toISOString() ?? null,
            tickedBy: tick?.userName ?? null,
            note: tick?.note ?? null,
          };
        }),
    },
    parts,
    money: {
      labourCents: job.labourCents,
      partsCents: job.partsCents,
      discountCents: job.discountCents,
      totalCents: job.labourCents + job.partsCents - job.discountCents,
      partLinesCents: parts.reduce((t, p) => t + p.quantity * p.unitPriceCents, 0),
      labourRateCents: row.rate,
    },
    photos: photoViews,
    photosViewable: viewable,
  };
}

/** The items of one audit form version, in order. */
export async function formItems(formId: number): Promise<FormItemView[]> {
  const conn = await db();
  return conn
    .select({
      id: auditFormItems.id,
      position: auditFormItems.position,
      code: auditFormItems.code,
      title: auditFormItems.title,
      guidance: auditFormItems.guidance,
      weight: auditFormItems.weight,
      critical: auditFormItems.critical,
    })
    .from(auditFormItems)
    .where(eq(auditFormItems.formId, formId))
    .orderBy(asc(auditFormItems.position), asc(auditFormItems.id));
}

export async function passMark(): Promise<number> {
  const conn = await db();
  const [row] = await conn
    .select({ passMark: networkSettings.auditPassMark })
    .from(networkSettings)
    .limit(1);
  return row?.passMark ?? 85;
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
    jobRecord(jobId),
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

/** What the planning screen offers: the caller's shops, the auditors and the owner's defaults. */
export async function planningOptions(principal: Principal) {
  const conn = await db();
  const [shopRows, auditors, settings, form] = await Promise.all([
    conn
      .select({ id: shops.id, name: shops.name, timeZone: shops.timeZone })
      .from(shops)
      .where(and(shopScope(principal), eq(shops.active, true)))
      .orderBy(asc(shops.name)),
    conn
      .select({ id: users.id, name: users.name, email: users.email })
      .from(users)
      .where(and(eq(users.role, 'auditor'), eq(users.active, true)))
      .orderBy(asc(users.name)),
    conn
      .select({
        defaultAql: networkSettings.defaultAql,
        defaultInspectionLevel: networkSettings.defaultInspectionLevel,
      })
      .from(networkSettings)
      .limit(1),
    currentForm(),
  ]);
  return {
    shops: shopRows,
    auditors,
    defaults: {
      aql: settings[0]?.defaultAql ?? 2.5,
      level: (settings[0]?.defaultInspectionLevel ?? 'II') as InspectionLevelValue,
    },
    form: form ? { id: form.id, version: form.version, title: form.title } : null,
  };
}

/** The latest published version of the audit form with its items. */
export async function currentForm() {
  const conn = await db();
  const [form] = await conn
    .select()
    .from(auditForms)
    .where(isNotNull(auditForms.publishedAt))
    .orderBy(desc(auditForms.version))
    .limit(1);
  if (!form) return null;
  return { ...form, items: await formItems(form.id) };
}

/** Every version of the audit form, newest first, with how many rounds use each. */
export async function formVersions() {
  const conn = await db();
  return conn
    .select({
      id: auditForms.id,
      version: auditForms.version,
      title: auditForms.title,
      publishedAt: auditForms.publishedAt,
      items:
        sql<number>`(select count(*) from ${auditFormItems} i where i.form_id = ${auditForms}.id)`.mapWith(
          Number,
        ),
      rounds:
        sql<number>`(select count(*) from ${auditRounds} r where r.form_id = ${auditForms}.id)`.mapWith(
          Number,
        ),
    })
    .from(auditForms)
    .orderBy(desc(auditForms.version));
}

export interface ShopAuditSummary {
  shopId: number;
  shopName: string;
  samplesScored: number;
  /** Scored samples whose verdict is not "meets standard". */
  failures: number;
  /** failures / samplesScored; null with nothing scored. */
  failureRate: number | null;
  /** 95% Wilson score interval on the failure rate; null with nothing scored. */
  interval: Interval | null;
  /** Against the network's failure rate in the same period, at the shop's own volume. */
  band: FairnessBand | null;
  averageScore: number | null;
  roundsAccepted: number;
  roundsRejected: number;
  /** The severity the shop's next round would be planned at. */
  currentSeverity: SeverityValue;
  /** Corrective actions not yet verified (open, in progress or done awaiting verification). */
  openCorrectiveActions: number;
}

/**
 * Audit figures per shop in the caller's scope, for the network view and the shop page. Samples
 * and rounds count when the round's period ends inside [from, to] (local dates, inclusive); the
 * severity and open corrective actions are as of now. The fairness band compares each shop's
 * failure rate with the whole network's over the same rounds (exact binomial funnel limits).
 */
export async function auditSummaryByShop(
  principal: Principal,
  period: { from: string; to: string },
): Promise<ShopAuditSummary[]> {
  const conn = await db();
  const inPeriod = sql`${auditRounds.periodEnd} between ${period.from} and ${period.to}`;
  const [shopRows, sampleRows, roundRows, actionRows] = await Promise.all([
    conn
      .select({ id: shops.id, name: shops.name })
      .from(shops)
      .where(shopScope(principal))
      .orderBy(asc(shops.name)),
    // Every shop's samples (not only the caller's): the network rate is the comparison.
    conn
      .select({
        shopId: auditRounds.shopId,
        scored: sql<number>`count(*)`.mapWith(Number),
        failures:
          sql<number>`count(*) filter (where ${auditSamples.verdict} <> 'meets_standard')`.mapWith(
            Number,
          ),
        scoreSum: sql<number>`coalesce(sum(${auditSamples.score}), 0)`.mapWith(Number),
      })
      .from(auditSamples)
      .innerJoin(auditRounds, eq(auditRounds.id, auditSamples.roundId))
      .where(and(isNotNull(auditSamples.completedAt), inPeriod))
      .groupBy(auditRounds.shopId),
    conn
      .select({
        shopId: auditRounds.shopId,
        accepted: sql<number>`count(*) filter (where ${auditRounds.decision} = 'accepted')`.mapWith(
          Number,
        ),
        rejected: sql<number>`count(*) filter (where ${auditRounds.decision} = 'rejected')`.mapWith(
          Number,
        ),
      })
      .from(auditRounds)
      .where(and(eq(auditRounds.status, 'decided'), inPeriod))
      .groupBy(auditRounds.shopId),
    conn
      .select({ shopId: correctiveActions.shopId, n: sql<number>`count(*)`.mapWith(Number) })
      .from(correctiveActions)
      .where(sql`${correctiveActions.status} <> 'verified'`)
      .groupBy(correctiveActions.shopId),
  ]);
  const network = sampleRows.reduce(
    (t, r) => ({ scored: t.scored + r.scored, failures: t.failures + r.failures }),
    { scored: 0, failures: 0 },
  );
  const networkRate = network.scored ? network.failures / network.scored : null;
  const samplesByShop = new Map(sampleRows.map((r) => [r.shopId, r]));
  const roundsByShop = new Map(roundRows.map((r) => [r.shopId, r]));
  const actionsByShop = new Map(actionRows.map((r) => [r.shopId, r.n]));
  const severities = await shopSeverities(
    conn,
    shopRows.map((s) => s.id),
  );
  return shopRows.map((shop) => {
    const s = samplesByShop.get(shop.id);
    const scored = s?.scored ?? 0;
    const failures = s?.failures ?? 0;
    return {
      shopId: shop.id,
      shopName: shop.name,
      samplesScored: scored,
      failures,
      failureRate: scored ? failures / scored : null,
      interval: scored ? wilsonInterval(failures, scored) : null,
      band:
        scored && networkRate !== null && networkRate > 0 && networkRate < 1
          ? fairnessBand(failures, scored, networkRate)
          : null,
      averageScore: scored ? s!.scoreSum / scored : null,
      roundsAccepted: roundsByShop.get(shop.id)?.accepted ?? 0,
      roundsRejected: roundsByShop.get(shop.id)?.rejected ?? 0,
      currentSeverity: severities.get(shop.id)!.severity,
      openCorrectiveActions: actionsByShop.get(shop.id) ?? 0,
    };
  });
}
