import { asc, count, eq, sql } from '@reelwright/db';
import {
  activityLog,
  benchSessions,
  customers,
  importBatches,
  jobEvents,
  jobs,
  reels,
} from '@reelwright/db/schema';
import { jobTurnaround } from '@reelwright/metrics';
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from 'vitest';
import { closeMemoryDb, openMemoryDb, testState as state } from '~/server/testing/memory-db';
import { ApiError } from '../errors';
import { shopCalendar } from '../bench/calendar';
import { buildImportNetwork, identityMapping, importRows, toCsv } from './fixture';
import { runImport } from './jobs';
import { takeBackAbandonedImports } from './take-back';
import { prepareImport } from './prepare';

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));

let net: Awaited<ReturnType<typeof buildImportNetwork>>;
const db = () => state.handle!.db;
const file = (csv: string, fileName = 'old-system.csv') => ({
  fileName,
  bytes: new TextEncoder().encode(csv),
  mapping: identityMapping,
});
const countOf = async (
  table: typeof jobs | typeof customers | typeof reels | typeof jobEvents | typeof benchSessions,
) => (await db().select({ n: count() }).from(table))[0]!.n;

async function importCsv(csv: string, fileName?: string) {
  const prepared = await prepareImport(net.lead, file(csv, fileName));
  if (!prepared.ok) throw new Error(`unexpected errors: ${JSON.stringify(prepared.errors)}`);
  return runImport(net.lead, prepared);
}

beforeAll(async () => {
  await openMemoryDb();
}, 60_000);

beforeEach(async () => {
  // A fresh network per test: tables emptied in dependency order.
  const conn = db();
  for (const t of [
    'activity_log',
    'bench_sessions',
    'job_events',
    'jobs',
    'reels',
    'customers',
    'import_batches',
    'users',
    'shops',
    'regions',
  ]) {
    await conn.execute(`delete from ${t}` as never);
  }
  net = await buildImportNetwork(conn);
});

afterAll(async () => {
  await closeMemoryDb();
});

describe('CSV import of past jobs', () => {
  it('imports every row with customers and reels found or created, timeline and turnaround', async () => {
    const rows = importRows(40);
    // One row belongs to a customer the shop already has (matched by e-mail, any case).
    rows[5] = { ...rows[5]!, customer_name: 'K. Angler', customer_email: 'KNOWN@example.test' };
    const summary = await importCsv(toCsv(rows));
    expect(summary).toMatchObject({ imported: 40, fileName: 'old-system.csv' });

    expect(await countOf(jobs)).toBe(40);
    // 40 rows by 4 customers (one per ten rows) plus the known one; no duplicates.
    const people = await db().select().from(customers).orderBy(asc(customers.id));
    expect(people.map((c) => c.name)).toEqual([
      'Known Angler',
      'Angler 0',
      'Angler 1',
      'Angler 2',
      'Angler 3',
    ]);
    expect(summary.customersCreated).toBe(4);

    const job = (await db().select().from(jobs).where(eq(jobs.externalRef, 'T-6')))[0]!;
    expect(job.customerId).toBe(net.knownCustomer.id);
    expect(job).toMatchObject({
      shopId: net.shop.id,
      state: 'collected',
      serviceType: 'overhaul',
      importBatchId: summary.batchId,
      labourCents: 5000,
      partsCents: 1550,
      technicianId: net.tech.id,
    });

    // Turnaround from @reelwright/metrics on the shop's calendar, waiting on parts taken out.
    const expected = jobTurnaround(
      { checkedInAt: job.checkedInAt, readyAt: job.readyAt!, waitingSpans: [] },
      shopCalendar(net.shop),
    );
    expect(job.customerTurnaroundMinutes).toBe(expected.customerMinutes);
    const waited = (await db().select().from(jobs).where(eq(jobs.externalRef, 'T-5')))[0]!;
    expect(waited.waitingPartsMinutes).toBeGreaterThan(0);
    expect(waited.benchTurnaroundMinutes).toBe(
      waited.customerTurnaroundMinutes! - waited.waitingPartsMinutes!,
    );

    const timeline = await db()
      .select({ from: jobEvents.fromState, to: jobEvents.toState, note: jobEvents.note })
      .from(jobEvents)
      .where(eq(jobEvents.jobId, waited.id))
      .orderBy(asc(jobEvents.at), asc(jobEvents.id));
    expect(timeline.map((e) => `${e.from ?? '·'}→${e.to}`)).toEqual([
      '·→checked_in',
      'checked_in→on_bench',
      'on_bench→waiting_parts',
      'waiting_parts→on_bench',
      'on_bench→ready',
      'ready→collected',
    ]);
    expect(timeline[0]!.note).toBe('Imported from old-system.csv');

    // Bench time becomes a session for the named technician.
    const sessions = await db()
      .select()
      .from(benchSessions)
      .where(eq(benchSessions.technicianId, net.tech.id));
    expect(sessions).toHaveLength(20);
    const [batch] = await db().select().from(importBatches);
    expect(batch).toMatchObject({ status: 'imported', rowCount: 40, importedCount: 40 });
    expect(batch!.fileDigest).toMatch(/^[0-9a-f]{64}$/);
    const [log] = await db()
      .select()
      .from(activityLog)
      .where(eq(activityLog.action, 'jobs.import'));
    expect(log).toMatchObject({ userId: net.lead.id, entityId: summary.batchId });
  });

  it('leaves planner statistics and a set visibility map, so the network view reads indexes alone', async () => {
    await importCsv(toCsv(importRows(3000)));
    const { rows } = await db().execute<{ pages: number; visible: number; estimate: number }>(
      sql`select relpages as pages, relallvisible as visible, reltuples::float as estimate
        from pg_class where relname = 'jobs'`,
    );
    expect(rows[0]!.pages).toBeGreaterThan(10);
    expect(rows[0]!.visible).toBe(rows[0]!.pages);
    expect(rows[0]!.estimate).toBe(3000);
    // The monthly figures the network view reads were recomputed for the months the load touched.
    const { rows: months } = await db().execute<{ ready: number; jobs: number }>(
      sql`select (select sum(jobs_ready)::int from shop_month_figures) as ready,
        (select count(*)::int from jobs where ready_at is not null) as jobs`,
    );
    expect(months[0]!.ready).toBe(months[0]!.jobs);
    expect(months[0]!.jobs).toBeGreaterThan(0);
  }, 30_000);

  it('imports nothing when one row is bad, and lists that row and column', async () => {
    const rows = importRows(30);
    rows[17] = { ...rows[17]!, reel_kind: 'trolling' };
    rows[25] = { ...rows[25]!, technician_email: 'tech.tern@t.test' };
    const prepared = await prepareImport(net.lead, file(toCsv(rows)));
    expect(prepared.ok).toBe(false);
    expect(!prepared.ok && prepared.errors).toEqual([
      {
        row: 19,
        column: 'reel_kind',
        message:
          '“trolling” is not one of: spinning, baitcasting, conventional, lever-drag, fly, spincast',
      },
      // Someone at another shop is not this shop's technician.
      {
        row: 27,
        column: 'technician_email',
        message: 'No one at Gull Test Shop signs in as tech.tern@t.test',
      },
    ]);
    expect(await countOf(jobs)).toBe(0);
    expect(await countOf(customers)).toBe(1);
    const [batch] = await db().select().from(importBatches);
    expect(batch).toMatchObject({ status: 'failed', errorCount: 2, importedCount: 0 });
  });

  it('numbers a bad row by its place in the whole file, however far in (parsed in pieces)', async () => {
    const rows = importRows(6000);
    rows[4999] = { ...rows[4999]!, reel_kind: 'trolling' };
    const csv = toCsv(rows);
    expect(csv.length).toBeGreaterThan(3 * 512 * 1024);
    const prepared = await prepareImport(net.lead, file(csv));
    expect(!prepared.ok && prepared.errors.map((e) => [e.row, e.column])).toEqual([
      [5001, 'reel_kind'],
    ]);
  }, 30_000);

  it('takes everything back when storing fails part-way, and says so in the history', async () => {
    const prepared = await prepareImport(net.lead, file(toCsv(importRows(6000))));
    if (!prepared.ok) throw new Error('expected a clean file');
    const reelsBefore = await db().select().from(reels);
    await expect(
      runImport(net.lead, prepared, (p) => {
        if (p.done >= 2500) throw new Error('the disk filled up');
      }),
    ).rejects.toThrow('the disk filled up');
    expect(await countOf(jobs)).toBe(0);
    expect(await db().select().from(reels)).toEqual(reelsBefore);
    expect(await countOf(customers)).toBe(1);
    expect(await countOf(jobEvents)).toBe(0);
    expect(await countOf(benchSessions)).toBe(0);
    const [batch] = await db().select().from(importBatches);
    expect(batch).toMatchObject({
      status: 'failed',
      importedCount: 0,
      errors: [{ row: 0, message: 'Storing failed; nothing was kept.' }],
    });
    // The monthly figures the triggers kept up follow the rows out again.
    const { rows } = await db().execute<{ n: number }>(
      sql`select coalesce(sum(jobs_ready), 0)::int as n from shop_month_figures`,
    );
    expect(rows[0]!.n).toBe(0);
  }, 30_000);

  it('takes back an import cut off by a crash, at the next import or start-up', async () => {
    const [cutOff] = await db()
      .insert(importBatches)
      .values({
        shopId: net.shop.id,
        fileName: 'cut-off.csv',
        fileDigest: 'f'.repeat(64),
        status: 'importing',
        rowCount: 1,
        heartbeatAt: new Date(Date.now() - 10 * 60_000),
      })
      .returning({ id: importBatches.id });
    const [live] = await db()
      .insert(importBatches)
      .values({
        shopId: net.shop.id,
        fileName: 'running.csv',
        fileDigest: 'e'.repeat(64),
        status: 'importing',
        rowCount: 1,
        heartbeatAt: new Date(),
      })
      .returning({ id: importBatches.id });
    const [customer] = await db()
      .insert(customers)
      .values({ shopId: net.shop.id, name: 'Cut Off', importBatchId: cutOff!.id })
      .returning();
    const [reel] = await db()
      .insert(reels)
      .values({
        customerId: customer!.id,
        kind: 'spinning',
        maker: 'Any',
        model: 'One',
        importBatchId: cutOff!.id,
      })
      .returning();
    await db().insert(jobs).values({
      shopId: net.shop.id,
      customerId: customer!.id,
      reelId: reel!.id,
      serviceType: 'tune_up',
      state: 'checked_in',
      checkedInAt: new Date(),
      importBatchId: cutOff!.id,
      externalRef: 'CUT-1',
    });
    // A live import elsewhere (fresh heartbeat) is left alone; the cut-off one is taken back.
    expect(await takeBackAbandonedImports()).toBe(1);
    expect(await countOf(jobs)).toBe(0);
    expect(await countOf(reels)).toBe(0);
    expect(await countOf(customers)).toBe(1);
    const statuses = await db()
      .select({ id: importBatches.id, status: importBatches.status, errors: importBatches.errors })
      .from(importBatches)
      .orderBy(asc(importBatches.id));
    expect(statuses).toEqual([
      {
        id: cutOff!.id,
        status: 'failed',
        errors: [{ row: 0, message: 'The server stopped during the import; nothing was kept.' }],
      },
      { id: live!.id, status: 'importing', errors: null },
    ]);
    // At start-up on the embedded database, nothing else can be importing.
    expect(await takeBackAbandonedImports({ all: true })).toBe(1);
  }, 30_000);

  it('refuses the same file a second time instead of doubling it', async () => {
    const csv = toCsv(importRows(12));
    const first = await importCsv(csv, 'march.csv');
    const again = await prepareImport(net.lead, file(csv, 'march-copy.csv')).catch((e) => e);
    expect(again).toBeInstanceOf(ApiError);
    expect(again.status).toBe(409);
    expect(again.detail).toMatch(
      new RegExp(
        `^This file was already imported on \\d{4}-\\d{2}-\\d{2} by Gale Lead \\(import #${first.batchId}, “march.csv”, 12 jobs\\)\\. Nothing was imported again from “march-copy.csv”\\.$`,
      ),
    );
    expect(await countOf(jobs)).toBe(12);
  });

  it('refuses job numbers already imported from a different file', async () => {
    await importCsv(toCsv(importRows(5)));
    const prepared = await prepareImport(net.lead, file(toCsv(importRows(6)), 'more.csv'));
    expect(!prepared.ok && prepared.errors.map((e) => e.message)).toEqual([
      'Job T-1 is already in Reelwright',
      'Job T-2 is already in Reelwright',
      'Job T-3 is already in Reelwright',
      'Job T-4 is already in Reelwright',
      'Job T-5 is already in Reelwright',
    ]);
    expect(await countOf(jobs)).toBe(5);
  });

  it('lets a failed file be imported once it is fixed, and only by a shop’s lead', async () => {
    const rows = importRows(3);
    const bad = toCsv([{ ...rows[0]!, state: 'lost' }, ...rows.slice(1)]);
    expect((await prepareImport(net.lead, file(bad))).ok).toBe(false);
    await importCsv(toCsv(rows));
    expect(await countOf(jobs)).toBe(3);
    const owner = {
      ...net.lead,
      role: 'owner' as const,
      shopId: null,
      scope: { kind: 'network' as const },
    };
    await expect(prepareImport(owner, file(toCsv(rows)))).rejects.toMatchObject({ status: 403 });
  });
});
