import { sql, type Db } from '@reelwright/db';
import {
  auditForms,
  auditRounds,
  correctiveActions,
  networkSettings,
  regions,
  shops,
  users,
  type OpeningHours,
} from '@reelwright/db/schema';
import { jobTurnaround, type ShopCalendar } from '@reelwright/metrics';

// A synthetic network of any size for the benchmark: shops with real calendars, jobs whose
// business-time minutes come from the metrics engine, comebacks and audit samples. Not the demo.

export interface GenerateOptions {
  shops: number;
  years: number;
  jobs: number;
  /** The generated network's "today": nothing happens after it. */
  now: Date;
  seed?: number;
  onProgress?: (done: number) => void;
}

const DAY = 86_400_000;
const HOUR = 3_600_000;
const BATCH = 10_000;

/** mulberry32: small, fast and seedable, so the same options give the same network. */
function rng(seed: number) {
  let a = seed >>> 0;
  const next = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4_294_967_296;
  };
  const normal = () => Math.sqrt(-2 * Math.log(1 - next())) * Math.cos(2 * Math.PI * next());
  return {
    next,
    int: (lo: number, hi: number) => lo + Math.floor(next() * (hi - lo + 1)),
    chance: (p: number) => next() < p,
    logNormal: (median: number, sigma: number) => median * Math.exp(sigma * normal()),
  };
}

const ZONES = ['America/New_York', 'America/Chicago', 'America/Denver', 'America/Los_Angeles'];
const span = (open: string, close: string) => [{ open, close }];
const HOURS: OpeningHours[] = [
  {
    mon: span('08:00', '18:00'),
    tue: span('08:00', '18:00'),
    wed: span('08:00', '18:00'),
    thu: span('08:00', '18:00'),
    fri: span('08:00', '18:00'),
    sat: span('09:00', '16:00'),
  },
  {
    tue: [
      { open: '09:00', close: '12:30' },
      { open: '13:30', close: '17:30' },
    ],
    wed: span('09:00', '17:30'),
    thu: span('09:00', '17:30'),
    fri: span('09:00', '17:30'),
    sat: span('09:00', '15:00'),
  },
  {
    wed: span('10:00', '16:00'),
    thu: span('10:00', '16:00'),
    fri: span('10:00', '16:00'),
    sat: span('09:00', '16:00'),
    sun: span('12:00', '16:00'),
  },
];

function closedDates(fromYear: number, toYear: number) {
  const out: string[] = [];
  for (let y = fromYear; y <= toYear; y++)
    out.push(`${y}-01-01`, `${y}-07-04`, `${y}-11-26`, `${y}-12-25`, `${y}-12-26`);
  return out;
}

const SERVICES = ['tune_up', 'overhaul', 'repair', 'parts_install'] as const;

/** Column arrays of one batch, inserted with a single `insert … select from unnest(…)`. */
class Batch {
  private cols = new Map<string, (string | null)[]>();
  size = 0;
  constructor(
    private readonly table: string,
    private readonly types: Record<string, string>,
  ) {
    for (const c of Object.keys(types)) this.cols.set(c, []);
  }
  push(row: Record<string, string | number | Date | null>) {
    for (const [c, values] of this.cols) {
      const v = row[c] ?? null;
      values.push(v === null ? null : v instanceof Date ? v.toISOString() : String(v));
    }
    this.size++;
  }
  async flush(db: Db) {
    if (this.size === 0) return;
    const names = [...this.cols.keys()];
    const arrays = names.map(
      (c) => sql`${sql.param(this.cols.get(c))}::text[]::${sql.raw(this.types[c]!)}[]`,
    );
    await db.execute(
      sql`insert into ${sql.identifier(this.table)} (${sql.raw(names.map((n) => `"${n}"`).join(', '))})
        select * from unnest(${sql.join(arrays, sql`, `)})`,
    );
    for (const c of names) this.cols.set(c, []);
    this.size = 0;
  }
}

export async function generateNetwork(db: Db, options: GenerateOptions) {
  const r = rng(options.seed ?? 20_260_401);
  const nowMs = options.now.getTime();
  const startMs = nowMs - Math.round(options.years * 365.25 * DAY);
  const firstYear = new Date(startMs).getUTCFullYear();
  const lastYear = new Date(nowMs).getUTCFullYear() + 1;
  const closed = closedDates(firstYear, lastYear);

  const regionCount = Math.max(1, Math.round(options.shops / 10));
  const regionRows = await db
    .insert(regions)
    .values(
      Array.from({ length: regionCount }, (_, i) => ({
        name: `Region ${i + 1}`,
        code: `r${i + 1}`,
      })),
    )
    .returning({ id: regions.id });
  const [owner] = await db
    .insert(users)
    .values({
      email: 'bench-owner@bench.test',
      name: 'Bench owner',
      passwordHash: 'x',
      role: 'owner',
    })
    .returning({ id: users.id });
  await db.insert(networkSettings).values({ id: 1, networkName: 'Benchmark network' });

  // Shop sizes from a fifth to twice the average, so small shops sit beside big ones.
  const weights = Array.from({ length: options.shops }, (_, i) => 0.2 + ((i * 7) % 10) / 5.5);
  const total = weights.reduce((a, b) => a + b, 0);
  const shopCtx: {
    id: number;
    calendar: ShopCalendar;
    rate: number;
    techs: number[];
    comebackChance: number;
    share: number;
  }[] = [];
  for (let i = 0; i < options.shops; i++) {
    const zone = ZONES[i % ZONES.length]!;
    const hours = HOURS[i % HOURS.length]!;
    const rate = 6_000 + 200 * (i % 12);
    const [row] = await db
      .insert(shops)
      .values({
        regionId: regionRows[i % regionCount]!.id,
        name: `Bench shop ${String(i + 1).padStart(2, '0')}`,
        slug: `bench-shop-${i + 1}`,
        timeZone: zone,
        openingHours: hours,
        closedDates: closed,
        labourRateCents: rate,
        royaltyRateBp: 600,
      })
      .returning({ id: shops.id });
    const techRows = await db
      .insert(users)
      .values(
        Array.from({ length: 3 }, (_, k) => ({
          email: `tech${k + 1}.shop${i + 1}@bench.test`,
          name: `Technician ${k + 1} of shop ${i + 1}`,
          passwordHash: 'x',
          role: 'technician' as const,
          shopId: row!.id,
        })),
      )
      .returning({ id: users.id });
    shopCtx.push({
      id: row!.id,
      calendar: { timeZone: zone, weekly: hours, closedDates: closed },
      rate,
      techs: techRows.map((t) => t.id),
      // One shop in ten has a comeback problem.
      comebackChance: i % 10 === 3 ? 0.1 : 0.035,
      share: weights[i]! / total,
    });
  }

  // The derived figures' triggers would recompute whole shop-months after every batch of random
  // jobs: off while loading, then one rebuild from the loaded jobs (as the demo seed does).
  await setFigureTriggers(db, false);
  const customers = Math.max(1, Math.round(options.jobs / 5));
  await db.execute(sql`
    insert into customers (id, shop_id, name)
    select g, ${shopCtx[0]!.id} + (g % ${options.shops}), 'Customer ' || g
    from generate_series(1, ${customers}) g`);
  await db.execute(sql`
    insert into reels (id, customer_id, kind, maker, model)
    select g, g, 'spinning', 'Benchmaker', 'Model ' || (g % 40) from generate_series(1, ${customers}) g`);

  const jobsBatch = new Batch('jobs', {
    id: 'int4',
    shop_id: 'int4',
    customer_id: 'int4',
    reel_id: 'int4',
    service_type: 'service_type',
    state: 'job_state',
    state_changed_at: 'timestamptz',
    technician_id: 'int4',
    checked_in_at: 'timestamptz',
    promised_at: 'timestamptz',
    ready_at: 'timestamptz',
    collected_at: 'timestamptz',
    labour_cents: 'int4',
    parts_cents: 'int4',
    discount_cents: 'int4',
    comeback_of_job_id: 'int4',
    customer_turnaround_minutes: 'int4',
    bench_turnaround_minutes: 'int4',
    waiting_parts_minutes: 'int4',
    bench_minutes: 'int4',
  });
  const comebackBatch = new Batch('comebacks', {
    job_id: 'int4',
    original_job_id: 'int4',
    original_shop_id: 'int4',
    status: 'comeback_status',
    attribution: 'comeback_attribution',
    detected_at: 'timestamptz',
    days_since_collection: 'int4',
  });
  // Up to 20 jobs per shop and quarter for the audit samples.
  const lots = new Map<string, number[]>();

  let nextId = 1;
  const makeJob = (shopIndex: number, checkedInAt: number, comebackOf?: number) => {
    const shop = shopCtx[shopIndex]!;
    const id = nextId++;
    const wall = Math.min(30 * DAY, r.logNormal(40, 0.8) * HOUR);
    const readyAt = checkedInAt + wall;
    const waits = r.chance(0.25)
      ? [{ from: new Date(checkedInAt + 0.3 * wall), to: new Date(checkedInAt + 0.8 * wall) }]
      : [];
    const ready = readyAt <= nowMs;
    const collected = ready ? readyAt + r.logNormal(2, 0.7) * DAY : Number.POSITIVE_INFINITY;
    const isCollected = collected <= nowMs;
    const t = ready
      ? jobTurnaround(
          { checkedInAt: new Date(checkedInAt), readyAt: new Date(readyAt), waitingSpans: waits },
          shop.calendar,
        )
      : null;
    const bench = r.chance(0.02) ? null : Math.round(Math.min(400, r.logNormal(60, 0.5)));
    const service = comebackOf ? 'repair' : SERVICES[r.int(0, 3)]!;
    const labour = ready && !comebackOf ? Math.round(((bench ?? 30) * shop.rate) / 60) : 0;
    jobsBatch.push({
      id,
      shop_id: shop.id,
      customer_id: r.int(1, customers),
      reel_id: r.int(1, customers),
      service_type: service,
      state: isCollected ? 'collected' : ready ? 'ready' : 'on_bench',
      state_changed_at: new Date(isCollected ? collected : ready ? readyAt : checkedInAt),
      technician_id: shop.techs[r.int(0, shop.techs.length - 1)]!,
      checked_in_at: new Date(checkedInAt),
      promised_at: new Date(checkedInAt + 4 * DAY),
      ready_at: ready ? new Date(readyAt) : null,
      collected_at: isCollected ? new Date(collected) : null,
      labour_cents: labour,
      parts_cents: ready && r.chance(0.3) ? r.int(500, 5_000) : 0,
      discount_cents: ready && labour > 1_000 && r.chance(0.05) ? 500 : 0,
      comeback_of_job_id: comebackOf ?? null,
      customer_turnaround_minutes: t ? Math.round(t.customerMinutes) : null,
      bench_turnaround_minutes: t
        ? Math.round(t.customerMinutes) - Math.round(t.waitingMinutes)
        : null,
      waiting_parts_minutes: t ? Math.round(t.waitingMinutes) : null,
      bench_minutes: ready ? bench : null,
    });
    if (ready) {
      const d = new Date(readyAt);
      const key = `${shopIndex}:${d.getUTCFullYear()}-${Math.floor(d.getUTCMonth() / 3)}`;
      const lot = lots.get(key) ?? [];
      if (lot.length < 20) lot.push(id);
      lots.set(key, lot);
    }
    return { id, collectedAt: isCollected ? collected : null };
  };

  const cumulative: number[] = [];
  let acc = 0;
  for (const s of shopCtx) cumulative.push((acc += s.share));
  while (nextId <= options.jobs) {
    const u = r.next();
    const shopIndex = Math.min(
      shopCtx.length - 1,
      cumulative.findIndex((c) => u < c),
    );
    const at = startMs + Math.floor(r.next() * (nowMs - startMs));
    const job = makeJob(shopIndex, at);
    if (
      job.collectedAt !== null &&
      nextId <= options.jobs &&
      r.chance(shopCtx[shopIndex]!.comebackChance * 1.3)
    ) {
      const days = r.int(2, 88);
      const detected = job.collectedAt + days * DAY;
      if (detected <= nowMs) {
        const back = makeJob(shopIndex, detected, job.id);
        const u2 = r.next();
        const status = u2 < 0.85 ? 'confirmed' : u2 < 0.95 ? 'open' : 'dismissed';
        const u3 = r.next();
        comebackBatch.push({
          job_id: back.id,
          original_job_id: job.id,
          original_shop_id: shopCtx[shopIndex]!.id,
          status,
          attribution:
            status !== 'confirmed'
              ? null
              : u3 < 0.6
                ? 'workmanship'
                : u3 < 0.8
                  ? 'part_failure'
                  : u3 < 0.9
                    ? 'customer_damage'
                    : 'unrelated',
          detected_at: new Date(detected),
          days_since_collection: days,
        });
      }
    }
    if (jobsBatch.size >= BATCH) {
      await jobsBatch.flush(db);
      await comebackBatch.flush(db);
      options.onProgress?.(nextId - 1);
    }
  }
  await jobsBatch.flush(db);
  await comebackBatch.flush(db);
  options.onProgress?.(nextId - 1);

  // One decided audit round per shop and quarter, with its samples.
  const [form] = await db
    .insert(auditForms)
    .values({ version: 1, title: 'Bench form' })
    .returning({ id: auditForms.id });
  const sampleBatch = new Batch('audit_samples', {
    round_id: 'int4',
    job_id: 'int4',
    position: 'int4',
    score: 'numeric',
    verdict: 'audit_verdict',
  });
  for (const [key, jobIds] of lots) {
    const [shopIndex, quarter] = key.split(':') as [string, string];
    const [year, q] = quarter.split('-').map(Number) as [number, number];
    const start = `${year}-${String(q * 3 + 1).padStart(2, '0')}-01`;
    const end = new Date(Date.UTC(year, q * 3 + 3, 0)).toISOString().slice(0, 10);
    if (Date.parse(end) > nowMs) continue;
    const [round] = await db
      .insert(auditRounds)
      .values({
        shopId: shopCtx[Number(shopIndex)]!.id,
        formId: form!.id,
        periodStart: start,
        periodEnd: end,
        status: 'decided',
        severity: 'normal',
        aql: 2.5,
        lotSize: jobIds.length,
        codeLetter: 'D',
        sampleSize: jobIds.length,
        acceptNumber: 1,
        rejectNumber: 2,
        seed: key,
        lotJobIds: jobIds,
        plannedById: owner!.id,
      })
      .returning({ id: auditRounds.id });
    jobIds.forEach((jobId, k) => {
      const u = r.next();
      sampleBatch.push({
        round_id: round!.id,
        job_id: jobId,
        position: k + 1,
        score: u < 0.9 ? 95 : 60,
        verdict: u < 0.9 ? 'meets_standard' : u < 0.98 ? 'needs_work' : 'critical_miss',
      });
    });
  }
  await sampleBatch.flush(db);
  await db.insert(correctiveActions).values(
    shopCtx.flatMap((s, i) =>
      Array.from({ length: i % 3 }, (_, k) => ({
        shopId: s.id,
        source: 'audit' as const,
        title: `Corrective action ${k + 1}`,
        dueOn: new Date(nowMs + (k - 1) * 20 * DAY).toISOString().slice(0, 10),
      })),
    ),
  );
  for (const table of ['jobs', 'customers', 'reels']) {
    await db.execute(
      sql`select setval(pg_get_serial_sequence(${table}, 'id'), (select max(id) from ${sql.identifier(table)}))`,
    );
  }
  await setFigureTriggers(db, true);
  await db.execute(sql`select rebuild_shop_month_figures()`);
  // Statistics for the planner and the visibility map for index-only scans (PGlite has no autovacuum).
  await db.execute(sql`vacuum analyze`);
  return { jobs: nextId - 1, owner: owner!.id };
}

/** Switches the triggers of migration 0003 that keep the derived figures on or off. */
async function setFigureTriggers(db: Db, on: boolean) {
  const verb = sql.raw(on ? 'enable' : 'disable');
  for (const trigger of ['jobs_insert_figures', 'jobs_update_figures', 'jobs_delete_figures']) {
    await db.execute(sql`alter table jobs ${verb} trigger ${sql.identifier(trigger)}`);
  }
  await db.execute(sql`alter table comebacks ${verb} trigger comebacks_copy_collected_at`);
}
