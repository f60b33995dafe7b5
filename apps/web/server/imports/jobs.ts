import { desc, eq, isNotNull, sql, type Tx } from '@reelwright/db';
import {
  activityLog,
  benchSessions,
  customers,
  importBatches,
  jobEvents,
  jobs,
  reels,
  serviceStandards,
  type NewJobEvent,
} from '@reelwright/db/schema';
import type { ParsedImportRow } from '~/lib/validators/imports';
import { pgError } from '../bench/shared';
import { db } from '../db';
import { conflict } from '../errors';
import type { Principal } from '../principal';
import { bulkInsert } from './bulk';
import { invert, refuseDuplicate, yieldToEventLoop, type PreparedImport } from './prepare';
import { takeBack, takeBackAbandonedImports } from './take-back';
import { giveWay, inTurns, refreshAfterBulkLoad, slices } from './turns';
import * as clock from '~/server/clock';

// The second half of a CSV job import: storing a file prepare.ts has checked.

/**
 * How far storing has got: `step` says what is being written, `fraction` is the whole import
 * (weighted by how long each step takes), `done` counts jobs stored so far.
 */
export interface ImportProgress {
  step: 'customers' | 'jobs' | 'timeline';
  fraction: number;
  done: number;
  total: number;
}

export interface ImportSummary {
  batchId: number;
  fileName: string;
  imported: number;
  customersCreated: number;
  reelsCreated: number;
  seconds: number;
}

const customerKey = (c: ParsedImportRow['customer']) =>
  c.email
    ? `e:${c.email}`
    : c.phone
      ? `p:${c.phone.replace(/\D/g, '')}`
      : `n:${c.name.toLowerCase()}`;
const reelKey = (
  customerId: number,
  r: Pick<ParsedImportRow['reel'], 'kind' | 'maker' | 'model'> & { size: string | null },
) =>
  `${customerId}|${r.kind}|${r.maker.toLowerCase()}|${r.model.toLowerCase()}|${(r.size ?? '').toLowerCase()}`;

/** Customers or reels per transaction. */
const ROW_CHUNK = 500;
/**
 * Jobs per transaction, each with its timeline and bench time (about six rows a job): a chunk
 * takes about 50 ms on the embedded database, so a request waiting behind one is not held up
 * for long, and each chunk's wait for a quiet moment is paid 330 times for 66,000 jobs.
 */
const JOB_CHUNK = 200;
/** Shop-months of figures recomputed per transaction after the jobs are in (about 50 ms each). */
const FIGURE_MONTHS_CHUNK = 1;

/**
 * Writes a prepared import in short transactions, so that other users' requests are answered
 * between them: the batch first (status `importing`), then customers and reels, then jobs a
 * hundred at a time with their timeline, bench time and business-time turnaround, each chunk
 * refreshing the batch's heartbeat; then the monthly figures of the months it touched are
 * recomputed (the trigger is deferred for the chunks: one recompute instead of one a chunk), and a
 * last transaction brings existing reels' last service up to date and marks the batch imported.
 * While it runs, the jobs written so far are visible, and counted in the figures at the end. Any
 * failure takes the batch's rows back out and marks it failed; an import cut off by a crash is
 * taken back the same way by the next import or start-up (`takeBackAbandonedImports`).
 */
export async function runImport(
  principal: Principal,
  prepared: Extract<PreparedImport, { ok: true }>,
  onProgress: (p: ImportProgress) => void | Promise<void> = () => {},
): Promise<ImportSummary> {
  const started = performance.now();
  const { shop, rows, file } = prepared;
  const conn = await db();
  const total = rows.length;
  const note = `Imported from ${file.fileName}`;
  const progress = async (p: ImportProgress) => {
    await onProgress(p);
    await yieldToEventLoop();
  };

  await takeBackAbandonedImports();
  const [batch] = await conn
    .insert(importBatches)
    .values({
      shopId: shop.id,
      fileName: file.fileName,
      fileDigest: prepared.digest,
      sizeBytes: file.bytes.length,
      status: 'importing',
      rowCount: total,
      columnMap: invert(file.mapping),
      createdById: principal.id,
      heartbeatAt: new Date(),
    })
    .returning({ id: importBatches.id });
  const batchId = batch!.id;
  /**
   * One chunk: its own transaction, which also says the import is alive. `deferFigures` for jobs:
   * the monthly figures are recomputed once, after the last chunk (below).
   */
  const chunk = async <T>(write: (tx: Tx) => Promise<T>, options = { deferFigures: false }) => {
    await giveWay(conn);
    return conn.transaction(async (tx) => {
      // A chunk needs no flush of its own: a crash takes the whole import back anyway, and the
      // last transaction (the batch marked imported) commits synchronously, flushing them all.
      // Both settings in one statement: a round trip less per chunk.
      await tx.execute(
        sql`select set_config('synchronous_commit', 'off', true),
                   set_config('reelwright.defer_figures', ${options.deferFigures ? 'on' : 'off'}, true)`,
      );
      const out = await write(tx);
      await tx
        .update(importBatches)
        .set({ heartbeatAt: new Date() })
        .where(eq(importBatches.id, batchId));
      return out;
    });
  };

  try {
    await progress({ step: 'customers', fraction: 0, done: 0, total });
    // Customers: the shop's own, matched by e-mail, else phone, else name.
    const known = await conn
      .select({
        id: customers.id,
        name: customers.name,
        email: customers.email,
        phone: customers.phone,
      })
      .from(customers)
      .where(eq(customers.shopId, shop.id));
    const customerIds = new Map<string, number>();
    for (const c of known) {
      customerIds.set(customerKey({ ...c, reminderConsent: false }), c.id);
      if (c.email) customerIds.set(`e:${c.email.toLowerCase()}`, c.id);
    }
    const pendingCustomers = new Map<string, ParsedImportRow['customer']>();
    await inTurns(rows, (row) => {
      const key = customerKey(row.customer);
      if (!customerIds.has(key) && !pendingCustomers.has(key))
        pendingCustomers.set(key, row.customer);
    });
    let customersCreated = 0;
    for (const slice of slices([...pendingCustomers.values()], ROW_CHUNK)) {
      const created = await chunk((tx) =>
        bulkInsert<{ id: number; name: string; email: string | null; phone: string | null }>(
          tx,
          customers,
          slice.map((c) => ({ shopId: shop.id, ...c, importBatchId: batchId })),
          { returning: 'id, name, email, phone' },
        ),
      );
      for (const c of created) {
        customerIds.set(customerKey({ ...c, reminderConsent: false }), Number(c.id));
      }
      customersCreated += created.length;
      await yieldToEventLoop();
    }
    const customerOf = (row: ParsedImportRow) => customerIds.get(customerKey(row.customer))!;

    // Reels: the customer's own, matched by kind, maker, model and size. A reel's last service
    // is the latest ready date among its jobs, in the shop's calendar.
    const knownReels = await conn
      .select({
        id: reels.id,
        customerId: reels.customerId,
        kind: reels.kind,
        maker: reels.maker,
        model: reels.model,
        size: reels.size,
        lastServicedOn: reels.lastServicedOn,
      })
      .from(reels)
      .innerJoin(customers, eq(customers.id, reels.customerId))
      .where(eq(customers.shopId, shop.id));
    const reelIds = new Map(knownReels.map((r) => [reelKey(r.customerId, r), r.id]));
    const servicedOn = new Map<string, string>();
    const pendingReels = new Map<string, { customerId: number; reel: ParsedImportRow['reel'] }>();
    await inTurns(rows, (row) => {
      const customerId = customerOf(row);
      const key = reelKey(customerId, row.reel);
      if (!reelIds.has(key) && !pendingReels.has(key))
        pendingReels.set(key, { customerId, reel: row.reel });
      const day = row.readyDay;
      if (day) {
        const before = servicedOn.get(key);
        if (!before || before < day) servicedOn.set(key, day);
      }
    });
    let reelsCreated = 0;
    for (const slice of slices([...pendingReels], ROW_CHUNK)) {
      const created = await chunk((tx) =>
        bulkInsert<{
          id: number;
          customer_id: number;
          kind: ParsedImportRow['reel']['kind'];
          maker: string;
          model: string;
          size: string | null;
        }>(
          tx,
          reels,
          slice.map(([key, { customerId, reel }]) => ({
            customerId,
            ...reel,
            lastServicedOn: servicedOn.get(key) ?? null,
            importBatchId: batchId,
          })),
          { returning: 'id, customer_id, kind, maker, model, size' },
        ),
      );
      for (const r of created) reelIds.set(reelKey(Number(r.customer_id), r), Number(r.id));
      reelsCreated += created.length;
      await yieldToEventLoop();
    }
    await progress({ step: 'customers', fraction: 0.12, done: 0, total });

    // Standards: each job is tied to the version published when it was checked in.
    const standards = await conn
      .select({ id: serviceStandards.id, publishedAt: serviceStandards.publishedAt })
      .from(serviceStandards)
      .where(isNotNull(serviceStandards.publishedAt))
      .orderBy(desc(serviceStandards.publishedAt));
    const standardAt = (at: Date) =>
      standards.find((st) => st.publishedAt!.getTime() <= at.getTime())?.id ?? null;
    const technicianOf = (row: ParsedImportRow) =>
      row.technicianEmail ? (prepared.technicians.get(row.technicianEmail) ?? null) : null;

    for (let from = 0; from < total; from += JOB_CHUNK) {
      const to = Math.min(from + JOB_CHUNK, total);
      const part = rows.slice(from, to);
      const jobRows = part.map((row) => {
        const customerId = customerOf(row);
        const turnaround = row.turnaround;
        return {
          shopId: shop.id,
          customerId,
          reelId: reelIds.get(reelKey(customerId, row.reel))!,
          serviceType: row.serviceType,
          state: row.state,
          stateChangedAt: row.timeline.at(-1)!.at,
          technicianId: technicianOf(row),
          serviceStandardId: standardAt(row.checkedInAt),
          complaint: row.complaint,
          findings: row.findings,
          checkedInAt: row.checkedInAt,
          promisedAt: row.promisedAt,
          readyAt: row.readyAt,
          collectedAt: row.collectedAt,
          labourCents: row.labourCents,
          partsCents: row.partsCents,
          discountCents: row.discountCents,
          customerTurnaroundMinutes: turnaround ? turnaround.customerMinutes : null,
          benchTurnaroundMinutes: turnaround ? turnaround.benchMinutes : null,
          waitingPartsMinutes: turnaround ? turnaround.waitingMinutes : null,
          benchMinutes: row.benchMinutes,
          importBatchId: batchId,
          externalRef: row.externalRef,
        } satisfies typeof jobs.$inferInsert;
      });
      await chunk(
        async (tx) => {
          const inserted = await bulkInsert<{ id: number; external_ref: string }>(
            tx,
            jobs,
            jobRows,
            {
              chunk: JOB_CHUNK,
              returning: 'id, external_ref',
            },
          );
          const jobIdOf = new Map(inserted.map((j) => [j.external_ref, Number(j.id)]));
          const eventRows: NewJobEvent[] = [];
          const sessionRows: (typeof benchSessions.$inferInsert)[] = [];
          part.forEach((row) => {
            const jobId = jobIdOf.get(row.externalRef)!;
            for (const e of row.timeline) eventRows.push({ jobId, ...e, userId: null, note });
            const technicianId = technicianOf(row);
            if (row.benchMinutes !== null && technicianId !== null) {
              sessionRows.push({ jobId, technicianId, minutes: row.benchMinutes, note });
            }
          });
          await bulkInsert(tx, jobEvents, eventRows, { chunk: 10_000 });
          await bulkInsert(tx, benchSessions, sessionRows, { chunk: 10_000 });
        },
        { deferFigures: true },
      );
      await progress({ step: 'jobs', fraction: 0.12 + (0.85 * to) / total, done: to, total });
    }

    // The monthly figures of the months the jobs were ready or collected in, a few months a
    // transaction, computed from the jobs table as the trigger would have.
    const months = new Map<string, Date>();
    await inTurns(rows, (row) => {
      if (row.readyAt) months.set(row.readyDay!.slice(0, 7), row.readyAt);
      if (row.collectedAt) months.set(row.collectedDay!.slice(0, 7), row.collectedAt);
    });
    for (const group of slices([...months.values()], FIGURE_MONTHS_CHUNK)) {
      await chunk((tx) =>
        tx.execute(
          sql`select refresh_shop_month_figures(
                ${sql.param(group.map(() => String(shop.id)))}::text[]::integer[],
                ${sql.param(group.map((at) => at.toISOString()))}::text[]::timestamptz[])`,
        ),
      );
      await yieldToEventLoop();
    }

    // Existing reels serviced later than their record says, and the batch: one last
    // transaction, so that a failure before it leaves nobody's records changed.
    const updates = knownReels
      .map((r) => [r.id, servicedOn.get(reelKey(r.customerId, r)), r.lastServicedOn] as const)
      .filter((u): u is [number, string, string | null] => !!u[1] && (!u[2] || u[2] < u[1]));
    const seconds = (performance.now() - started) / 1000;
    await conn.transaction(async (tx) => {
      if (updates.length) {
        await tx.execute(
          sql`update ${reels} set last_serviced_on = v.day
              from unnest(${sql.param(updates.map(([id]) => String(id)))}::text[]::integer[],
                          ${sql.param(updates.map(([, day]) => day))}::text[]::date[]) as v(id, day)
              where ${reels.id} = v.id`,
        );
      }
      await tx
        .update(importBatches)
        .set({
          status: 'imported',
          importedCount: total,
          completedAt: clock.now(),
          heartbeatAt: null,
        })
        .where(eq(importBatches.id, batchId));
      await tx.insert(activityLog).values({
        userId: principal.id,
        action: 'jobs.import',
        entityType: 'import_batch',
        entityId: batchId,
        shopId: shop.id,
        after: { fileName: file.fileName, jobs: total, customersCreated, reelsCreated },
      });
    });
    await refreshAfterBulkLoad(conn);
    return {
      batchId,
      fileName: file.fileName,
      imported: total,
      customersCreated,
      reelsCreated,
      seconds: Math.round(seconds * 100) / 100,
    };
  } catch (error) {
    const duplicate = pgError(error)?.code === '23505';
    await takeBack(batchId, duplicate ? 'Imported meanwhile by another upload' : 'Storing failed');
    // Another import of the same file finished first: the partial unique index says so.
    if (duplicate) {
      await refuseDuplicate(shop.id, prepared.digest, file.fileName);
      throw conflict(
        'Some of these jobs were imported meanwhile; nothing was imported. Try again.',
      );
    }
    throw error;
  }
}
