import { and, eq, sql, type SQL } from '@reelwright/db';
import { auditRounds, auditSamples, shops, users } from '@reelwright/db/schema';
import type {
  InspectionLevelValue,
  RoundStatusValue,
  SeverityValue,
} from '~/lib/validators/audits';
import { db } from '../../db';
import { notFound } from '../../errors';
import type { Principal } from '../../principal';

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
    case 'rounds':
      return eq(auditRounds.auditorId, principal.id);
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

export function roundColumns() {
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

/** A row of `roundColumns()`: the round with its shop and auditor flattened. */
type RoundSelect = Omit<RoundRow, 'shop' | 'auditor' | 'plannedAt' | 'decidedAt'> & {
  shopId: number;
  shopName: string;
  timeZone: string;
  regionId: number;
  auditorId: number | null;
  auditorName: string | null;
  plannedAt: Date;
  decidedAt: Date | null;
};

export function toRoundRow(r: RoundSelect): RoundRow {
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

/** The round with its plan fields, or 404 outside what the caller sees. */
export async function findRound(principal: Principal, id: number) {
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
