import { aliasedTable, and, asc, eq, isNotNull } from '@reelwright/db';
import {
  checklistTicks,
  jobs,
  partLines,
  photos,
  reels,
  serviceStandards,
  shops,
  users,
} from '@reelwright/db/schema';
import { db } from '../../db';
import { notFound } from '../../errors';
import { storageConfigured } from '../../storage';
import { applicableSteps } from '../bench';
import { jobBenchSessions, jobTimeline } from '../job-history';

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
    /** The app's URL for the photo; null when photo storage is not configured on this server. */
    url: string | null;
  }[];
  /** False when photo storage is not configured: photos are listed by name only. */
  photosViewable: boolean;
}

/**
 * The read-only record of a job, as an audit sees it (no customer contact details); `photoUrl`
 * names the route that serves its photos to this reader.
 */
export async function jobRecord(
  jobId: number,
  photoUrl: (photoId: number) => string,
): Promise<JobRecord> {
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
    jobTimeline(conn, jobId),
    jobBenchSessions(conn, jobId),
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
    applicableSteps(job.serviceStandardId, reel.kind, conn),
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
  const photoViews = pictures.map((p) => ({
    id: p.id,
    stage: p.stage,
    name: p.originalName ?? `Photo ${p.id}`,
    caption: p.caption,
    width: p.width,
    height: p.height,
    contentType: p.contentType,
    url: viewable ? photoUrl(p.id) : null,
  }));
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
    events: events.map((e) => ({
      id: e.id,
      fromState: e.fromState,
      toState: e.toState,
      at: e.at.toISOString(),
      userName: e.userName,
      note: e.note,
    })),
    bench: {
      minutes,
      sessions: sessions.map((s) => ({
        id: s.id,
        technicianName: s.technicianName,
        startedAt: s.startedAt?.toISOString() ?? null,
        minutes: s.minutes,
        note: s.note,
      })),
    },
    checklist: {
      standard: standard[0] ?? null,
      steps: steps.map((s) => {
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
