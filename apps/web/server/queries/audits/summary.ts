import { and, asc, eq, isNotNull, sql } from '@reelwright/db';
import { auditRounds, auditSamples, correctiveActions, shops } from '@reelwright/db/schema';
import {
  fairnessBand,
  wilsonInterval,
  type FairnessBand,
  type Interval,
} from '@reelwright/metrics';
import type { SeverityValue } from '~/lib/validators/audits';
import { shopSeverities } from '../../audits/sampling';
import { db } from '../../db';
import type { Principal } from '../../principal';
import { shopScope } from '../scope';

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
