import { and, asc, eq, gte, inArray, lt, sql, type Db, type Tx } from '@reelwright/db';
import { auditRounds, jobs } from '@reelwright/db/schema';
import {
  nextSeverity,
  singleSamplingPlan,
  type InspectedLot,
  type InspectionLevel,
  type LotOutcome,
} from '@reelwright/metrics';
import { TZDate } from '@date-fns/tz';
import { format } from 'date-fns';
import type { InspectionLevelValue, SeverityValue } from '~/lib/validators/audits';
import * as clock from '~/server/clock';

type Conn = Db | Tx;

/** The database spells special levels S1…S4; the standard (and the metrics engine) S-1…S-4. */
export function metricsLevel(level: InspectionLevelValue): InspectionLevel {
  return (level.startsWith('S') ? `S-${level.slice(1)}` : level) as InspectionLevel;
}

/** Today's local date in a time zone, "YYYY-MM-DD". */
export function localToday(timeZone: string, now = clock.now()): string {
  return format(new TZDate(now, timeZone), 'yyyy-MM-dd');
}

/** A local date moved by whole days (calendar arithmetic, no time zone involved). */
export function addDays(date: string, days: number): string {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number];
  return new Date(Date.UTC(y, m - 1, d + days)).toISOString().slice(0, 10);
}

/** The instant a local date starts in a zone (midnight, or the first minute that exists). */
export function localDayStart(date: string, timeZone: string): Date {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number];
  return new Date(new TZDate(y, m - 1, d, 0, 0, 0, timeZone).getTime());
}

/**
 * The lot of a round: the shop's jobs that became ready between the start of `from` and the end
 * of `to` in the shop's zone, by id ascending — the stated order the sample is drawn from.
 */
export async function lotJobIds(
  conn: Conn,
  shop: { id: number; timeZone: string },
  from: string,
  to: string,
): Promise<number[]> {
  const rows = await conn
    .select({ id: jobs.id })
    .from(jobs)
    .where(
      and(
        eq(jobs.shopId, shop.id),
        gte(jobs.readyAt, localDayStart(from, shop.timeZone)),
        lt(jobs.readyAt, localDayStart(addDays(to, 1), shop.timeZone)),
      ),
    )
    .orderBy(asc(jobs.id));
  return rows.map((r) => r.id);
}

export interface RoundHistoryEntry {
  roundId: number;
  periodStart: string;
  periodEnd: string;
  severity: SeverityValue;
  decision: LotOutcome;
  failures: number;
  sampleSize: number;
}

export interface ShopSeverity {
  severity: SeverityValue;
  /** Decided rounds of the shop, oldest first: what the switching rules replayed. */
  history: RoundHistoryEntry[];
  /** Rounds planned but not decided yet; their outcome may still change the severity. */
  undecided: number;
  reason: string;
}

/** The shops' rounds (every shop's for null) that count for the switching rules, in period order. */
function roundsOf(conn: Conn, shopIds: readonly number[] | null) {
  return conn
    .select({
      id: auditRounds.id,
      shopId: auditRounds.shopId,
      status: auditRounds.status,
      periodStart: auditRounds.periodStart,
      periodEnd: auditRounds.periodEnd,
      severity: auditRounds.severity,
      decision: auditRounds.decision,
      failures: auditRounds.failures,
      aql: auditRounds.aql,
      codeLetter: auditRounds.codeLetter,
      sampleSize: auditRounds.sampleSize,
    })
    .from(auditRounds)
    .where(
      and(
        shopIds ? inArray(auditRounds.shopId, [...shopIds]) : undefined,
        sql`${auditRounds.status} <> 'cancelled'`,
      ),
    )
    .orderBy(asc(auditRounds.periodStart), asc(auditRounds.id));
}
type RoundRow = Awaited<ReturnType<typeof roundsOf>>[number];

/**
 * The switching rules of ISO 2859-1 §9.3–9.4 replayed over a shop's rounds (not cancelled, in
 * period order), starting from normal inspection.
 */
function severityFromRounds(rounds: readonly RoundRow[]): ShopSeverity {
  const decided = rounds.filter((r) => r.status === 'decided' && r.decision && r.failures !== null);
  const history: RoundHistoryEntry[] = decided.map((r) => ({
    roundId: r.id,
    periodStart: r.periodStart,
    periodEnd: r.periodEnd,
    severity: r.severity,
    decision: r.decision!,
    failures: r.failures!,
    sampleSize: r.sampleSize,
  }));
  const lots: InspectedLot[] = decided.map((r) => ({
    nonconforming: r.failures!,
    aql: r.aql,
    codeLetter: r.codeLetter,
  }));
  const severity = nextSeverity(
    'normal',
    history.map((h) => h.decision),
    lots,
  );
  return {
    severity,
    history,
    undecided: rounds.length - decided.length,
    reason: severityReason(severity, history),
  };
}

/** The inspection severity of the shop's next round, from its history of rounds. */
export async function shopSeverity(conn: Conn, shopId: number): Promise<ShopSeverity> {
  return (await shopSeverities(conn, [shopId])).get(shopId)!;
}

/**
 * The severity of each shop's next round, read in one query (the network view asks for all:
 * null, which leaves out the shops without rounds, whose severity is normal).
 */
export async function shopSeverities(
  conn: Conn,
  shopIds: readonly number[] | null,
): Promise<Map<number, ShopSeverity>> {
  const rounds = shopIds?.length === 0 ? [] : await roundsOf(conn, shopIds);
  const byShop = new Map<number, RoundRow[]>((shopIds ?? []).map((id) => [id, []]));
  for (const r of rounds) {
    if (!byShop.has(r.shopId)) byShop.set(r.shopId, []);
    byShop.get(r.shopId)!.push(r);
  }
  return new Map([...byShop].map(([id, rows]) => [id, severityFromRounds(rows)]));
}

function severityReason(severity: SeverityValue, history: RoundHistoryEntry[]): string {
  const rejected = history.filter((h) => h.decision === 'rejected').length;
  if (history.length === 0) return 'No decided rounds yet: inspection starts at normal.';
  const tally = `${history.length} decided ${history.length === 1 ? 'round' : 'rounds'}, ${rejected} rejected`;
  switch (severity) {
    case 'normal':
      return `${tally}. Normal inspection: no 2 of 5 or fewer consecutive rounds were rejected since it began.`;
    case 'tightened':
      return `${tally}. Tightened inspection: 2 of 5 or fewer consecutive rounds were rejected (ISO 2859-1 §9.3.1); 5 accepted rounds in a row return the shop to normal.`;
    case 'reduced':
      return `${tally}. Reduced inspection: at least 10 rounds in a row were accepted and the switching score reached 30 (ISO 2859-1 §9.3.3); a rejection returns the shop to normal.`;
    case 'discontinued':
      return `${tally}. Sampling is discontinued: 5 rounds were rejected on tightened inspection (ISO 2859-1 §9.4). Plan no further rounds until the shop's corrective actions have been carried out and verified, then agree with the owner how to resume on tightened inspection.`;
  }
}

export interface ComputedPlan {
  lotSize: number;
  /** Table I's letter for the lot and level. */
  codeLetter: string;
  /** Letter whose sample size the plan uses, after following the table's arrows. */
  planCodeLetter: string;
  sampleSize: number;
  accept: number;
  reject: number;
  hundredPercent: boolean;
  table: 'II-A' | 'II-B' | 'II-C';
}

const TABLES = { normal: 'II-A', tightened: 'II-B', reduced: 'II-C' } as const;

/** Single sampling plan for the lot; null for an empty lot or discontinued inspection. */
export function planFor(
  lotSize: number,
  aql: number,
  level: InspectionLevelValue,
  severity: SeverityValue,
): ComputedPlan | null {
  if (lotSize < 1 || severity === 'discontinued') return null;
  const plan = singleSamplingPlan(lotSize, aql, { level: metricsLevel(level), severity });
  return {
    lotSize,
    codeLetter: plan.lotCodeLetter,
    planCodeLetter: plan.codeLetter,
    sampleSize: plan.sampleSize,
    accept: plan.accept,
    reject: plan.reject,
    hundredPercent: plan.hundredPercent,
    table: TABLES[severity],
  };
}

/**
 * The lot's decision once every sample is scored: rejected when the failures (verdicts other than
 * meets standard) reach Re, otherwise accepted. Only reduced plans leave a gap between Ac and Re;
 * a count in it accepts the lot and the switching rules reinstate normal inspection.
 */
export function decideLot(failures: number, plan: { accept: number; reject: number }): LotOutcome {
  return failures >= plan.reject ? 'rejected' : 'accepted';
}
