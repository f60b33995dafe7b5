import { and, eq, sql } from '@reelwright/db';
import { shops, type ComebackAttribution } from '@reelwright/db/schema';
import type { PeriodQuery } from '~/lib/validators/network';
import { loadComebackSettings } from '../../comebacks/settings';
import { db } from '../../db';
import { notFound } from '../../errors';
import type { Principal } from '../../principal';
import { shopScope } from '../scope';
import * as clock from '~/server/clock';

export interface BreakdownRow {
  key: string;
  label: string;
  confirmed: number;
  /** Of them, with an attribution that counts in the comeback rate. */
  counted: number;
}

export interface ComebackBreakdown {
  period: PeriodQuery;
  confirmed: number;
  counted: number;
  countedAttributions: ComebackAttribution[];
  warrantyDays: number;
  byRootCause: BreakdownRow[];
  byStep: BreakdownRow[];
  /** Null when the caller may not see it (technicians). */
  byTechnician: (BreakdownRow & { collected: number })[] | null;
}

/**
 * The period's confirmed comebacks of one shop, as the shop page's comeback rate counts them:
 * jobs of the shop collected in the period (in its zone, by `asOf`) that came back inside the
 * warranty window; split by root cause, by the checklist step they trace to (by step code, so
 * versions of the standard add up), and by the original job's technician for the shop lead,
 * regional manager and owner. Outside the scope: not found.
 */
export async function comebackBreakdown(
  principal: Principal,
  shopId: number,
  period: PeriodQuery,
  asOf = clock.now(),
): Promise<ComebackBreakdown> {
  const conn = await db();
  const [shop] = await conn
    .select({ id: shops.id })
    .from(shops)
    .where(and(eq(shops.id, shopId), shopScope(principal)));
  if (!shop) throw notFound('shop');
  const settings = await loadComebackSettings(conn);
  const hours = settings.warrantyDays * 24;
  const at = asOf.toISOString();
  const counted = `{${settings.countedAttributions.join(',')}}`;
  type Row = {
    dim: string;
    key: string | null;
    label: string | null;
    confirmed: number;
    counted: number;
  };
  const { rows } = await conn.execute<Row>(sql`
    with s as (
      select x.id,
        (${period.from}::date::timestamp at time zone x.time_zone) as t0,
        ((${period.to}::date + 1)::timestamp at time zone x.time_zone) as t1
      from shops x where x.id = ${shopId}
    ),
    c as (
      select cb.id, cb.attribution = any(${counted}::comeback_attribution[]) as counted,
        rc.code as cause_code, rc.label as cause_label,
        st.code as step_code, st.title as step_title,
        j.technician_id::text as tech_id, u.name as tech_name
      from s
      join jobs j on j.shop_id = s.id and j.collected_at >= s.t0 and j.collected_at < s.t1
        and j.collected_at <= ${at}::timestamptz
      join comebacks cb on cb.original_job_id = j.id and cb.original_shop_id = s.id
        and cb.status = 'confirmed' and cb.detected_at <= ${at}::timestamptz
        and cb.detected_at >= j.collected_at
        and cb.detected_at < j.collected_at + ${hours} * interval '1 hour'
      left join root_causes rc on rc.id = cb.root_cause_id
      left join service_standard_steps st on st.id = cb.checklist_step_id
      left join users u on u.id = j.technician_id
    )
    select 'cause' as dim, cause_code as key, min(cause_label) as label,
      count(*)::int as confirmed, (count(*) filter (where counted))::int as counted
    from c group by cause_code
    union all
    select 'step', step_code, min(step_title), count(*)::int, (count(*) filter (where counted))::int
    from c group by step_code
    union all
    select 'tech', tech_id, min(tech_name), count(*)::int, (count(*) filter (where counted))::int
    from c group by tech_id`);
  const seeTechnicians = principal.role !== 'technician';
  const collectedByTech = seeTechnicians
    ? (
        await conn.execute<{ key: string | null; label: string | null; n: number }>(sql`
          with s as (
            select x.id,
              (${period.from}::date::timestamp at time zone x.time_zone) as t0,
              ((${period.to}::date + 1)::timestamp at time zone x.time_zone) as t1
            from shops x where x.id = ${shopId}
          )
          select j.technician_id::text as key, min(u.name) as label, count(*)::int as n
          from s join jobs j on j.shop_id = s.id and j.collected_at >= s.t0
            and j.collected_at < s.t1 and j.collected_at <= ${at}::timestamptz
          left join users u on u.id = j.technician_id
          group by j.technician_id`)
      ).rows
    : [];
  const pick = (dim: string, none: string) =>
    rows
      .filter((r) => r.dim === dim)
      .map((r) => ({
        key: r.key ?? '',
        label: r.label ?? none,
        confirmed: Number(r.confirmed),
        counted: Number(r.counted),
      }))
      // Unnamed causes and steps go last: the named ones are what a lead can act on.
      .sort(
        (a, b) =>
          Number(a.key === '') - Number(b.key === '') ||
          b.confirmed - a.confirmed ||
          a.label.localeCompare(b.label),
      );
  const causes = pick('cause', 'Not recorded');
  const total = causes.reduce((n, r) => n + r.confirmed, 0);
  const totalCounted = causes.reduce((n, r) => n + r.counted, 0);
  let byTechnician: ComebackBreakdown['byTechnician'] = null;
  if (seeTechnicians) {
    const byKey = new Map(pick('tech', 'Unassigned').map((r) => [r.key, r]));
    byTechnician = collectedByTech
      .map((c) => {
        const key = c.key ?? '';
        const hit = byKey.get(key);
        return {
          key,
          label: c.label ?? 'Unassigned',
          collected: Number(c.n),
          confirmed: hit?.confirmed ?? 0,
          counted: hit?.counted ?? 0,
        };
      })
      .sort(
        (a, b) =>
          b.counted - a.counted || b.confirmed - a.confirmed || a.label.localeCompare(b.label),
      );
  }
  return {
    period,
    confirmed: total,
    counted: totalCounted,
    countedAttributions: settings.countedAttributions,
    warrantyDays: settings.warrantyDays,
    byRootCause: causes,
    byStep: pick('step', 'No step named'),
    byTechnician,
  };
}
