import { asc, eq, sql } from '@reelwright/db';
import {
  auditRounds,
  correctiveActions,
  partLines,
  photos,
  reminderBatches,
  users,
} from '@reelwright/db/schema';
import type { JobState } from '~/lib/labels';
import { DEFAULT_SEED_NOW, DEMO_ACCOUNTS, seedDemo } from '@reelwright/db/seed';
import { addDemoAuditHistory } from '~/server/audits/demo-history';
import { planRound } from '~/server/audits/plan';
import { scopeOf, type Principal } from '~/server/principal';
import { pngImage } from '~/server/photos/test-images';
import { confirmedKey, putObject } from '~/server/storage';
import { testState } from '~/server/testing/memory-db';

// The database the access matrix runs against: the demo network as `npm run demo` seeds it (a
// shorter history), its audit rounds planned and scored by the product's own code, and the few
// objects the seed does not make (photos, part lines on open jobs, reminder batches, corrective
// actions), one per shop so that every shop has one of each kind to be "own" or "other".

/** The clock while the matrix runs: just after the seed's "today", so November 2026 has ended. */
export const MATRIX_NOW = new Date(DEFAULT_SEED_NOW.getTime() + 2 * 86_400_000);

export interface Caller {
  /** The demo account's short name, or `signed out`. */
  name: string;
  principal: Principal | null;
}

export interface World {
  callers: Caller[];
  shops: { id: number; regionId: number }[];
  regionIds: number[];
  /** Per shop: a job on the bench side (with a part line and a photo added). */
  openJobs: { id: number; shopId: number; state: JobState; partId: number; photoId: number }[];
  technicians: { id: number; shopId: number }[];
  /** An open job whose reel was collected from an earlier job before it came in. */
  returnJobs: { id: number; shopId: number; originalJobId: number }[];
  rounds: {
    id: number;
    shopId: number;
    auditorId: number | null;
    decided: boolean;
    jobId: number;
    photoId: number;
    itemIds: number[];
  }[];
  comebacks: { id: number; shopId: number }[];
  actions: { id: number; shopId: number }[];
  batches: { id: number; shopId: number }[];
  rootCauses: { id: number; label: string; active: boolean }[];
  /** The first auditor's id: the rounds of one shop go to the second so they have an "other". */
  auditorId: number;
}

const SHORT_NAMES: Record<string, string> = {
  'owner@saltwick.test': 'owner',
  'manager.north@saltwick.test': 'manager north',
  'manager.south@saltwick.test': 'manager south',
  'lead.marram@saltwick.test': 'lead marram',
  'tech.marram@saltwick.test': 'tech marram',
  'lead.fennel@saltwick.test': 'lead fennel',
  'tech.fennel@saltwick.test': 'tech fennel',
  'auditor@saltwick.test': 'auditor',
};

async function rows<T>(query: ReturnType<typeof sql>): Promise<T[]> {
  return (await testState.handle!.db.execute(query)).rows as T[];
}

/** Seeds the open test database (testState.handle) and reads back what the matrix needs. */
export async function buildWorld(): Promise<World> {
  const db = testState.handle!.db;
  // Half a year is enough history for audit lots, comebacks and two months of rounds.
  await seedDemo(db, { years: 0.5, passwordHash: 'not-a-hash' });
  await addDemoAuditHistory({ today: DEFAULT_SEED_NOW.toISOString().slice(0, 10), months: 2 });

  const people = await db.select().from(users).orderBy(asc(users.id));
  const principal = (email: string): Principal => {
    const u = people.find((p) => p.email === email)!;
    return { ...u, scope: scopeOf(u) };
  };
  const callers: Caller[] = [
    { name: 'signed out', principal: null },
    ...DEMO_ACCOUNTS.map((a) => ({
      name: SHORT_NAMES[a.email] ?? a.email,
      principal: principal(a.email),
    })),
  ];
  const auditors = people.filter((p) => p.role === 'auditor');
  const [auditor, secondAuditor] = auditors;

  const shops = await rows<{ id: number; regionId: number }>(
    sql`select id, region_id as "regionId" from shops order by id`,
  );
  // Scored rounds are decided and take no more answers: each shop gets an open round for August,
  // listed first below, so an auditor's own sample can be scored.
  const owner = callers.find((c) => c.principal?.role === 'owner')!.principal!;
  for (const shop of shops)
    await planRound(owner, {
      shopId: shop.id,
      from: '2026-08-01',
      to: '2026-08-31',
      auditorId: auditor!.id,
    });
  // The last shop's rounds go to the second auditor: out of the first one's scope.
  await db
    .update(auditRounds)
    .set({ auditorId: secondAuditor!.id })
    .where(eq(auditRounds.shopId, shops.at(-1)!.id));

  // Not every shop has a job just checked in (Fennel Cove's season is over): the earliest open
  // state wins, then the lowest id.
  const firstOpen = await rows<{ id: number; shopId: number; state: JobState }>(sql`
    select distinct on (shop_id) id, shop_id as "shopId", state from jobs
    where state in ('checked_in', 'on_bench', 'waiting_parts', 'ready')
    order by shop_id, state, id`);
  const openJobs: World['openJobs'] = [];
  for (const job of firstOpen) {
    const [part] = await db
      .insert(partLines)
      .values({ jobId: job.id, name: 'Drag washer set', quantity: 1, unitPriceCents: 900 })
      .returning({ id: partLines.id });
    openJobs.push({ ...job, partId: part!.id, photoId: await addPhoto(job.id, job.shopId) });
  }

  const roundRows = await rows<{
    id: number;
    shopId: number;
    auditorId: number | null;
    decided: boolean;
    jobId: number;
    formId: number;
  }>(sql`
    select r.id, r.shop_id as "shopId", r.auditor_id as "auditorId", r.form_id as "formId",
      r.status = 'decided' as decided,
      (select min(s.job_id) from audit_samples s where s.round_id = r.id) as "jobId"
    from audit_rounds r order by (r.status = 'decided'), r.id`);
  const rounds: World['rounds'] = [];
  for (const r of roundRows.filter((x) => x.jobId != null)) {
    const items = await rows<{ id: number }>(
      sql`select id from audit_form_items where form_id = ${r.formId} order by position`,
    );
    rounds.push({
      id: r.id,
      shopId: r.shopId,
      auditorId: r.auditorId,
      decided: r.decided,
      jobId: r.jobId,
      photoId: await addPhoto(r.jobId, r.shopId),
      itemIds: items.map((i) => i.id),
    });
  }

  const actions: World['actions'] = [];
  const batches: World['batches'] = [];
  for (const shop of shops) {
    const [action] = await db
      .insert(correctiveActions)
      .values({
        shopId: shop.id,
        source: 'other',
        title: 'Regrease drag stacks',
        dueOn: '2026-12-20',
      })
      .returning({ id: correctiveActions.id });
    actions.push({ id: action!.id, shopId: shop.id });
    const [batch] = await db
      .insert(reminderBatches)
      .values({ shopId: shop.id, status: 'done', completedAt: DEFAULT_SEED_NOW })
      .returning({ id: reminderBatches.id });
    batches.push({ id: batch!.id, shopId: shop.id });
  }

  return {
    callers,
    shops,
    regionIds: [...new Set(shops.map((s) => s.regionId))],
    openJobs,
    technicians: people
      .filter((p) => p.role === 'technician' && p.active && p.shopId != null)
      .map((p) => ({ id: p.id, shopId: p.shopId! })),
    returnJobs: await rows(sql`
      select distinct on (j.shop_id) j.id, j.shop_id as "shopId", o.id as "originalJobId"
      from jobs j join jobs o on o.reel_id = j.reel_id and o.collected_at < j.checked_in_at
      where j.state in ('checked_in', 'on_bench', 'waiting_parts', 'ready') and not exists (select 1 from comebacks c where c.job_id = j.id)
      order by j.shop_id, j.id, o.collected_at desc`),
    rounds,
    // A comeback is read from its original shop and the shop the reel came back to: only one
    // that stayed in one shop is cleanly in or out of a caller's scope.
    comebacks: await rows(sql`
      select distinct on (j.shop_id) c.id, j.shop_id as "shopId" from comebacks c
      join jobs j on j.id = c.job_id and j.shop_id = c.original_shop_id
      order by j.shop_id, (c.status = 'open') desc, c.id`),
    actions,
    batches,
    rootCauses: await rows(sql`select id, label, active from root_causes order by position, id`),
    auditorId: auditor!.id,
  };
}

/** A checked PNG on the job, stored where confirmed photos live. */
async function addPhoto(jobId: number, shopId: number): Promise<number> {
  const bytes = pngImage();
  const key = confirmedKey(shopId, jobId);
  await putObject(key, bytes, 'image/png');
  const [photo] = await testState
    .handle!.db.insert(photos)
    .values({
      jobId,
      stage: 'teardown',
      storageKey: key,
      contentType: 'image/png',
      sizeBytes: bytes.length,
      width: 4,
      height: 4,
      confirmedAt: DEFAULT_SEED_NOW,
    })
    .returning({ id: photos.id });
  return photo!.id;
}
