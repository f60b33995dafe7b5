import { randomBytes } from 'node:crypto';
import { and, desc, eq, gte, isNotNull, lte, ne, type Tx } from '@reelwright/db';
import {
  activityLog,
  auditForms,
  auditRounds,
  auditSamples,
  networkSettings,
  shops,
  users,
} from '@reelwright/db/schema';
import { drawSample } from '@reelwright/metrics';
import type {
  InspectionLevelValue,
  PlanPreviewQuery,
  PlanRoundInput,
  SeverityValue,
} from '~/lib/validators/audits';
import { db } from '../db';
import { badRequest, conflict, notFound } from '../errors';
import { queueEmail } from '../mail/outbox';
import type { Principal } from '../principal';
import { shopScope } from '../queries/scope';
import { auditAssignedEmail } from './emails';
import {
  localToday,
  lotJobIds,
  planFor,
  shopSeverity,
  type ComputedPlan,
  type RoundHistoryEntry,
} from './sampling';

export interface PlanPreview {
  shop: { id: number; name: string; timeZone: string };
  from: string;
  to: string;
  aql: number;
  level: InspectionLevelValue;
  lotSize: number;
  severity: SeverityValue;
  severityReason: string;
  history: RoundHistoryEntry[];
  /** Rounds of the shop planned but not decided: their outcome may still change the severity. */
  undecided: number;
  plan: ComputedPlan | null;
  /** Why no round can be drawn for this shop and period; null when it can. */
  blocked: string | null;
  form: { id: number; version: number; title: string } | null;
}

async function settingsDefaults(tx: Tx) {
  const [row] = await tx
    .select({
      aql: networkSettings.defaultAql,
      level: networkSettings.defaultInspectionLevel,
      dueDays: networkSettings.correctiveActionDueDays,
    })
    .from(networkSettings)
    .limit(1);
  return { aql: row?.aql ?? 2.5, level: row?.level ?? 'II', dueDays: row?.dueDays ?? 14 };
}

async function latestForm(tx: Tx) {
  const [form] = await tx
    .select({ id: auditForms.id, version: auditForms.version, title: auditForms.title })
    .from(auditForms)
    .where(isNotNull(auditForms.publishedAt))
    .orderBy(desc(auditForms.version))
    .limit(1);
  return form ?? null;
}

/** Works out the round for a shop and period inside a transaction; nothing is written. */
async function prepare(
  tx: Tx,
  principal: Principal,
  query: PlanPreviewQuery,
  options: { lock?: boolean } = {},
): Promise<PlanPreview & { lot: number[] }> {
  const select = tx
    .select({ id: shops.id, name: shops.name, timeZone: shops.timeZone })
    .from(shops)
    .where(and(eq(shops.id, query.shopId), shopScope(principal)));
  // Locking the shop row serialises two planners of the same shop, so their periods cannot overlap.
  const [shop] = options.lock ? await select.for('update') : await select;
  if (!shop) throw notFound('shop');
  const defaults = await settingsDefaults(tx);
  const aql = query.aql ?? defaults.aql;
  const level = query.level ?? defaults.level;
  const [lot, severity, form, overlapping] = await Promise.all([
    lotJobIds(tx, shop, query.from, query.to),
    shopSeverity(tx, shop.id),
    latestForm(tx),
    tx
      .select({
        id: auditRounds.id,
        periodStart: auditRounds.periodStart,
        periodEnd: auditRounds.periodEnd,
      })
      .from(auditRounds)
      .where(
        and(
          eq(auditRounds.shopId, shop.id),
          ne(auditRounds.status, 'cancelled'),
          lte(auditRounds.periodStart, query.to),
          gte(auditRounds.periodEnd, query.from),
        ),
      )
      .limit(1),
  ]);
  const today = localToday(shop.timeZone);
  let blocked: string | null = null;
  if (severity.severity === 'discontinued') blocked = severity.reason;
  else if (overlapping[0])
    blocked = `Round #${overlapping[0].id} already covers ${overlapping[0].periodStart} to ${overlapping[0].periodEnd}; a job is audited in one round only, so periods of a shop's rounds may not overlap.`;
  else if (query.to > today)
    blocked = `The period must end by today (${today} at ${shop.name}); a lot still growing cannot be sampled.`;
  else if (lot.length === 0) blocked = `No jobs became ready at ${shop.name} in this period.`;
  else if (!form)
    blocked = 'There is no published audit form yet; the owner publishes one in Settings.';
  return {
    shop,
    from: query.from,
    to: query.to,
    aql,
    level,
    lotSize: lot.length,
    severity: severity.severity,
    severityReason: severity.reason,
    history: severity.history,
    undecided: severity.undecided,
    plan: planFor(lot.length, aql, level, severity.severity),
    blocked,
    form,
    lot,
  };
}

/** What a round for this shop and period would be: lot, severity and plan. Writes nothing. */
export async function previewRound(
  principal: Principal,
  query: PlanPreviewQuery,
): Promise<PlanPreview> {
  const conn = await db();
  return conn.transaction(async (tx) => {
    const { lot: _lot, ...preview } = await prepare(tx, principal, query);
    return preview;
  });
}

export interface PlannedRound {
  id: number;
  shopId: number;
  from: string;
  to: string;
  aql: number;
  level: InspectionLevelValue;
  lotSize: number;
  codeLetter: string;
  planCodeLetter: string;
  sampleSize: number;
  accept: number;
  reject: number;
  hundredPercent: boolean;
  severity: SeverityValue;
  seed: string;
  sampledJobIds: number[];
  auditorId: number;
}

/**
 * Plans a round: counts the lot, takes the severity the shop's history gives, draws the sample
 * with a fresh random seed (the only randomness: anyone can redraw it from the stored seed and
 * lot), stores it all and e-mails the auditor — one transaction, with its activity log row.
 */
export async function planRound(
  principal: Principal,
  input: PlanRoundInput,
): Promise<PlannedRound> {
  const conn = await db();
  const planned = await conn.transaction(async (tx) => {
    const [auditor] = await tx
      .select({
        id: users.id,
        name: users.name,
        email: users.email,
        role: users.role,
        active: users.active,
      })
      .from(users)
      .where(eq(users.id, input.auditorId));
    if (!auditor || auditor.role !== 'auditor' || !auditor.active)
      throw badRequest('Some body fields are not valid.', [
        { field: 'body.auditorId', message: 'Choose an active auditor' },
      ]);
    const prep = await prepare(tx, principal, input, { lock: true });
    if (prep.blocked || !prep.plan || !prep.form) {
      const reason = prep.blocked ?? 'No plan for this lot.';
      if (prep.lotSize === 0 || input.to > localToday(prep.shop.timeZone))
        throw badRequest(reason, [{ field: 'body.to', message: reason }]);
      throw conflict(reason);
    }
    const plan = prep.plan;
    const seed = randomBytes(16).toString('hex');
    const sample = drawSample(prep.lot, plan.sampleSize, seed);
    const [round] = await tx
      .insert(auditRounds)
      .values({
        shopId: prep.shop.id,
        formId: prep.form.id,
        periodStart: input.from,
        periodEnd: input.to,
        status: 'planned',
        severity: prep.severity,
        aql: prep.aql,
        inspectionLevel: prep.level,
        lotSize: plan.lotSize,
        codeLetter: plan.codeLetter,
        sampleSize: plan.sampleSize,
        acceptNumber: plan.accept,
        rejectNumber: plan.reject,
        seed,
        lotJobIds: prep.lot,
        plan: {
          standard: 'ISO 2859-1 single sampling (= ANSI/ASQ Z1.4, MIL-STD-105E)',
          table: plan.table,
          lotCodeLetter: plan.codeLetter,
          planCodeLetter: plan.planCodeLetter,
          hundredPercent: plan.hundredPercent,
          lotOrder: 'job id ascending',
          draw: 'partial Fisher–Yates, seedrandom ARC4',
          severityReason: prep.severityReason,
          history: prep.history.map((h) => ({ roundId: h.roundId, decision: h.decision })),
          formVersion: prep.form.version,
        },
        auditorId: auditor.id,
        plannedById: principal.id,
      })
      .returning({ id: auditRounds.id });
    if (!round) throw new Error('planRound: insert returned no row');
    await tx
      .insert(auditSamples)
      .values(sample.map((jobId, i) => ({ roundId: round.id, jobId, position: i + 1 })));
    const result: PlannedRound = {
      id: round.id,
      shopId: prep.shop.id,
      from: input.from,
      to: input.to,
      aql: prep.aql,
      level: prep.level,
      lotSize: plan.lotSize,
      codeLetter: plan.codeLetter,
      planCodeLetter: plan.planCodeLetter,
      sampleSize: plan.sampleSize,
      accept: plan.accept,
      reject: plan.reject,
      hundredPercent: plan.hundredPercent,
      severity: prep.severity,
      seed,
      sampledJobIds: sample,
      auditorId: auditor.id,
    };
    await tx.insert(activityLog).values({
      userId: principal.id,
      action: 'audit_round.plan',
      entityType: 'audit_round',
      entityId: round.id,
      shopId: prep.shop.id,
      before: null,
      after: { ...result, lotJobIds: prep.lot },
    });
    const message = auditAssignedEmail({
      auditorName: auditor.name,
      plannerName: principal.name,
      shopName: prep.shop.name,
      roundId: round.id,
      from: input.from,
      to: input.to,
      sampleSize: plan.sampleSize,
    });
    await queueEmail(tx, {
      kind: 'audit_assigned',
      to: auditor.email,
      subject: message.subject,
      text: message.text,
      shopId: prep.shop.id,
      entityType: 'audit_round',
      entityId: round.id,
    });
    return result;
  });
  return planned;
}
