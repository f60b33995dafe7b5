import { desc, eq, isNotNull, sql } from '@reelwright/db';
import {
  activityLog,
  benchSessions,
  customers,
  importBatches,
  jobEvents,
  jobs,
  reels,
  serviceStandards,
  shopMonthFigures,
  type NewJobEvent,
} from '@reelwright/db/schema';
import { jobTurnaround } from '@reelwright/metrics';
import type { JobState } from '~/lib/labels';
import type { ParsedImportRow } from '~/lib/validators/imports';
import { shopCalendar, localDate } from '../bench/calendar';
import { pgError } from '../bench/shared';
import { db } from '../db';
import { conflict } from '../errors';
import type { Principal } from '../principal';
import { bulkInsert } from './bulk';
import { invert, refuseDuplicate, yieldToEventLoop, type PreparedImport } from './prepare';

// The second half of a CSV job import: storing a file prepare.ts has checked.

const PREPARE_BATCH = 1_000;

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

/**
 * Writes a prepared import in ONE transaction: customers and reels found or created, the jobs with
 * their timeline, bench time and business-time turnaround, and the batch. Any failure rolls all of
 * it back. Rows go in with multi-row statements, thousands at a time.
 */
export async function runImport(
  principal: Principal,
  prepared: Extract<PreparedImport, { ok: true }>,
  onProgress: (p: ImportProgress) => void | Promise<void> = () => {},
): Promise<ImportSummary> {
  const started = performance.now();
  const { shop, rows, file } = prepared;
  const calendar = shopCalendar(shop);
  const conn = await db();
  const total = rows.length;
  const note = `Imported from ${file.fileName}`;
  // Work that needs no database is done before the transaction, in slices with a turn for the
  // event loop between them, so that the transaction holds the database only to write.
  const timelines: ReturnType<typeof timeline>[] = [];
  const turnarounds: (ReturnType<typeof jobTurnaround> | null)[] = [];
  for (let i = 0; i < rows.length; i += PREPARE_BATCH) {
    for (const row of rows.slice(i, i + PREPARE_BATCH)) {
      timelines.push(timeline(row));
      turnarounds.push(
        row.readyAt
          ? jobTurnaround(
              {
                checkedInAt: row.checkedInAt,
                readyAt: row.readyAt,
                waitingSpans: row.partsWait ? [row.partsWait] : [],
              },
              calendar,
            )
          : null,
      );
    }
    await yieldToEventLoop();
  }
  // Between statements too: the embedded database answers without giving I/O a turn.
  const progress = async (p: ImportProgress) => {
    await onProgress(p);
    await yieldToEventLoop();
  };

  try {
    const summary = await conn.transaction(async (tx) => {
      const [batch] = await tx
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
        })
        .returning({ id: importBatches.id });
      const batchId = batch!.id;

      await progress({ step: 'customers', fraction: 0, done: 0, total });
      // Customers: the shop's own, matched by e-mail, else phone, else name.
      const known = await tx
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
      for (const row of rows) {
        const key = customerKey(row.customer);
        if (!customerIds.has(key) && !pendingCustomers.has(key))
          pendingCustomers.set(key, row.customer);
      }
      const createdCustomers = await bulkInsert<{
        id: number;
        name: string;
        email: string | null;
        phone: string | null;
      }>(
        tx,
        customers,
        [...pendingCustomers.values()].map((c) => ({ shopId: shop.id, ...c })),
        { returning: 'id, name, email, phone' },
      );
      for (const c of createdCustomers) {
        customerIds.set(customerKey({ ...c, reminderConsent: false }), Number(c.id));
      }
      const customerOf = (row: ParsedImportRow) => customerIds.get(customerKey(row.customer))!;

      // Reels: the customer's own, matched by kind, maker, model and size. A reel's last service
      // is the latest ready date among its jobs, in the shop's calendar.
      const knownReels = await tx
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
      for (const row of rows) {
        const customerId = customerOf(row);
        const key = reelKey(customerId, row.reel);
        if (!reelIds.has(key) && !pendingReels.has(key))
          pendingReels.set(key, { customerId, reel: row.reel });
        if (row.readyAt) {
          const day = localDate(row.readyAt, shop.timeZone);
          const before = servicedOn.get(key);
          if (!before || before < day) servicedOn.set(key, day);
        }
      }
      const createdReels = await bulkInsert<{
        id: number;
        customer_id: number;
        kind: ParsedImportRow['reel']['kind'];
        maker: string;
        model: string;
        size: string | null;
      }>(
        tx,
        reels,
        [...pendingReels].map(([key, { customerId, reel }]) => ({
          customerId,
          ...reel,
          lastServicedOn: servicedOn.get(key) ?? null,
        })),
        { returning: 'id, customer_id, kind, maker, model, size' },
      );
      for (const r of createdReels) {
        reelIds.set(reelKey(Number(r.customer_id), r), Number(r.id));
      }
      // Existing reels serviced later than their record says.
      const updates = knownReels
        .map((r) => [r.id, servicedOn.get(reelKey(r.customerId, r)), r.lastServicedOn] as const)
        .filter((u): u is [number, string, string | null] => !!u[1] && (!u[2] || u[2] < u[1]));
      if (updates.length) {
        await tx.execute(
          sql`update ${reels} set last_serviced_on = v.day
              from unnest(${sql.param(updates.map(([id]) => String(id)))}::text[]::integer[],
                          ${sql.param(updates.map(([, day]) => day))}::text[]::date[]) as v(id, day)
              where ${reels.id} = v.id`,
        );
      }

      // Standards: each job is tied to the version published when it was checked in.
      const standards = await tx
        .select({ id: serviceStandards.id, publishedAt: serviceStandards.publishedAt })
        .from(serviceStandards)
        .where(isNotNull(serviceStandards.publishedAt))
        .orderBy(desc(serviceStandards.publishedAt));
      const standardAt = (at: Date) =>
        standards.find((st) => st.publishedAt!.getTime() <= at.getTime())?.id ?? null;

      const technicianOf = (row: ParsedImportRow) =>
        row.technicianEmail ? (prepared.technicians.get(row.technicianEmail) ?? null) : null;
      const jobRows = rows.map((row, i) => {
        const customerId = customerOf(row);
        const turnaround = turnarounds[i];
        return {
          shopId: shop.id,
          customerId,
          reelId: reelIds.get(reelKey(customerId, row.reel))!,
          serviceType: row.serviceType,
          state: row.state,
          stateChangedAt: timelines[i]!.at(-1)!.at,
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
      const inserted = await bulkInsert<{ id: number; external_ref: string }>(tx, jobs, jobRows, {
        chunk: 2500,
        returning: 'id, external_ref',
        onChunk: (done) =>
          progress({ step: 'jobs', fraction: 0.12 + (0.48 * done) / total, done, total }),
      });
      const jobIdOf = new Map(inserted.map((j) => [j.external_ref, Number(j.id)]));

      const eventRows: NewJobEvent[] = [];
      const sessionRows: (typeof benchSessions.$inferInsert)[] = [];
      rows.forEach((row, i) => {
        const jobId = jobIdOf.get(row.externalRef)!;
        for (const e of timelines[i]!) eventRows.push({ jobId, ...e, userId: null, note });
        const technicianId = technicianOf(row);
        if (row.benchMinutes !== null && technicianId !== null) {
          sessionRows.push({ jobId, technicianId, minutes: row.benchMinutes, note });
        }
      });
      await bulkInsert(tx, jobEvents, eventRows, {
        chunk: 10_000,
        onChunk: (written) =>
          progress({
            step: 'timeline',
            fraction: 0.6 + (0.37 * written) / eventRows.length,
            done: total,
            total,
          }),
      });
      await bulkInsert(tx, benchSessions, sessionRows, {
        chunk: 10_000,
        onChunk: () => yieldToEventLoop(),
      });

      const seconds = (performance.now() - started) / 1000;
      await tx
        .update(importBatches)
        .set({ status: 'imported', importedCount: total, completedAt: new Date() })
        .where(eq(importBatches.id, batchId));
      await tx.insert(activityLog).values({
        userId: principal.id,
        action: 'jobs.import',
        entityType: 'import_batch',
        entityId: batchId,
        shopId: shop.id,
        after: {
          fileName: file.fileName,
          jobs: total,
          customersCreated: createdCustomers.length,
          reelsCreated: createdReels.length,
        },
      });
      return {
        batchId,
        fileName: file.fileName,
        imported: total,
        customersCreated: createdCustomers.length,
        reelsCreated: createdReels.length,
        seconds: Math.round(seconds * 100) / 100,
      };
    });
    await refreshAfterBulkLoad(conn);
    return summary;
  } catch (error) {
    // Another import of the same file finished first: the partial unique index says so.
    if (pgError(error)?.code === '23505') {
      await refuseDuplicate(shop.id, prepared.digest, file.fileName);
      throw conflict(
        'Some of these jobs were imported meanwhile; nothing was imported. Try again.',
      );
    }
    throw error;
  }
}

/**
 * After a bulk load, planner statistics and the visibility map for the tables it wrote (the
 * monthly figures its triggers rewrote among them), so the network view's index-only scans skip
 * the heap: PGlite has no autovacuum, and a server's comes later. VACUUM cannot run in the
 * transaction. The import has committed by now, so a failure here is logged rather than reported
 * as a failed import.
 */
async function refreshAfterBulkLoad(conn: Awaited<ReturnType<typeof db>>) {
  try {
    await conn.execute(
      sql`vacuum (analyze) ${jobs}, ${jobEvents}, ${benchSessions}, ${customers}, ${reels}, ${shopMonthFigures}`,
    );
  } catch (error) {
    console.warn('[import] refreshing statistics after the import failed:', error);
  }
}

/** The state changes an imported job went through, as far as the file tells them. */
function timeline(
  row: ParsedImportRow,
): { fromState: JobState | null; toState: JobState; at: Date }[] {
  const events: { fromState: JobState | null; toState: JobState; at: Date }[] = [];
  const to = (state: JobState, at: Date) =>
    events.push({ fromState: events.at(-1)?.toState ?? null, toState: state, at });
  to('checked_in', row.checkedInAt);
  if (row.state === 'checked_in') return events;
  // When work started is not in the file: the bench begins at check-in.
  to('on_bench', row.checkedInAt);
  if (row.partsWait) {
    to('waiting_parts', row.partsWait.from);
    if (row.partsWait.to) to('on_bench', row.partsWait.to);
  } else if (row.state === 'waiting_parts') {
    to('waiting_parts', row.checkedInAt);
  }
  if (row.readyAt) to('ready', row.readyAt);
  if (row.collectedAt) to('collected', row.collectedAt);
  return events;
}
