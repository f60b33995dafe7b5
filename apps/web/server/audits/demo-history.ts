import { asc, eq, sql } from '@reelwright/db';
import { auditFormItems, auditRounds, shops, users } from '@reelwright/db/schema';
import { db } from '../db';
import { scopeOf, type Principal } from '../principal';
import { addDays } from './sampling';
import { planRound } from './plan';
import { saveSample } from './score';
import * as clock from '~/server/clock';

// A few months of audit rounds for the demo network, planned and scored through the product's
// own planning and scoring, so the audit screens and figures have a history on first start. The
// auditor's answers follow each sampled job's record: a drag stack left unticked fails the drag
// item (a critical miss), which is what an auditor reading the job would find.

/** Form item → the checklist steps whose missing tick fails it. */
const ITEM_STEPS: Record<string, readonly string[]> = {
  'drag.serviced': ['drag.washers', 'drag.stack_order', 'drag.setting'],
  'test_crank.recorded': ['test_crank.under_load'],
  'safety.disposal': ['cleaning.disposal'],
  'lubrication.correct': ['lubrication.gears', 'lubrication.bearings'],
};

const FAIL_NOTES: Record<string, string> = {
  'drag.serviced': 'Drag steps not ticked and no finding on the washers.',
  'test_crank.recorded': 'No test crank under load before ready.',
  'safety.disposal': 'Solvent and rag disposal step not ticked.',
  'lubrication.correct': 'Lubrication steps not ticked.',
  'checklist.complete': 'Required steps left unticked without a reason.',
};

/** A small deterministic generator (mulberry32), so the same job always gets the same answers. */
function random(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4_294_967_296;
  };
}

/** The first and last day of each of the `count` whole months before the month of `today`. */
export function previousMonths(today: string, count: number): { from: string; to: string }[] {
  const [y, m] = today.split('-').map(Number) as [number, number];
  const out: { from: string; to: string }[] = [];
  for (let back = count; back >= 1; back--) {
    const first = new Date(Date.UTC(y, m - 1 - back, 1)).toISOString().slice(0, 10);
    const next = new Date(Date.UTC(y, m - back, 1)).toISOString().slice(0, 10);
    out.push({ from: first, to: addDays(next, -1) });
  }
  return out;
}

async function principalOf(role: 'owner' | 'auditor'): Promise<Principal | null> {
  const conn = await db();
  const [u] = await conn
    .select()
    .from(users)
    .where(sql`${users.role} = ${role} and ${users.active}`)
    .orderBy(asc(users.id))
    .limit(1);
  if (!u) return null;
  return {
    id: u.id,
    name: u.name,
    email: u.email,
    role: u.role,
    shopId: u.shopId,
    regionId: u.regionId,
    scope: scopeOf(u),
  };
}

/** Which applicable steps of the job's standard were left unticked, by code. */
async function untickedSteps(jobId: number): Promise<{ code: string; required: boolean }[]> {
  const conn = await db();
  const { rows } = await conn.execute<{ code: string; required: boolean }>(sql`
    select st.code, st.required
    from jobs j
    join reels r on r.id = j.reel_id
    join service_standard_steps st on st.standard_id = j.service_standard_id
    where j.id = ${jobId}
      and (st.applies_to is null or r.kind = any(st.applies_to))
      and not exists (
        select 1 from checklist_ticks t where t.job_id = j.id and t.step_id = st.id
      )`);
  return rows;
}

export interface DemoAuditHistory {
  rounds: number;
  samples: number;
  rejected: number;
}

/**
 * Plans and scores one round per shop for each of the `months` whole months before `today`.
 * Does nothing when any audit round exists already, so a second demo start keeps what is there.
 */
export async function addDemoAuditHistory(
  options: { today: string; months?: number } = { today: clock.now().toISOString().slice(0, 10) },
): Promise<DemoAuditHistory | null> {
  const conn = await db();
  const [existing] = await conn.select({ n: sql<number>`count(*)::int` }).from(auditRounds);
  if ((existing?.n ?? 0) > 0) return null;
  const [owner, auditor] = await Promise.all([principalOf('owner'), principalOf('auditor')]);
  if (!owner || !auditor) return null;
  const shopRows = await conn.select({ id: shops.id }).from(shops).orderBy(asc(shops.id));
  const result: DemoAuditHistory = { rounds: 0, samples: 0, rejected: 0 };
  for (const period of previousMonths(options.today, options.months ?? 4)) {
    for (const shop of shopRows) {
      const round = await planRound(owner, {
        shopId: shop.id,
        from: period.from,
        to: period.to,
        auditorId: auditor.id,
      }).catch(() => null); // an empty lot or discontinued inspection: no round that month
      if (!round) continue;
      result.rounds++;
      const [planned] = await conn
        .select({ formId: auditRounds.formId })
        .from(auditRounds)
        .where(eq(auditRounds.id, round.id));
      const items = await conn
        .select({ id: auditFormItems.id, code: auditFormItems.code })
        .from(auditFormItems)
        .where(eq(auditFormItems.formId, planned!.formId))
        .orderBy(asc(auditFormItems.position));
      for (const jobId of round.sampledJobIds) {
        const unticked = await untickedSteps(jobId);
        const missing = new Set(unticked.map((s) => s.code));
        const rng = random(jobId);
        const answers = items.map((item) => {
          const steps = ITEM_STEPS[item.code];
          const failed =
            item.code === 'checklist.complete'
              ? unticked.some((s) => s.required)
              : steps
                ? steps.some((code) => missing.has(code))
                : rng() < 0.03;
          return failed
            ? {
                itemId: item.id,
                result: 'fail' as const,
                note: FAIL_NOTES[item.code] ?? 'Not as the standard says.',
              }
            : { itemId: item.id, result: 'pass' as const };
        });
        const saved = await saveSample(auditor, round.id, jobId, { answers, final: true });
        result.samples++;
        if (saved.round.decision === 'rejected') result.rejected++;
      }
    }
  }
  return result;
}
