import { and, eq, isNotNull } from '@reelwright/db';
import { importBatches, jobs, shops, users } from '@reelwright/db/schema';
import { createHash } from 'node:crypto';
import type { ImportRowError } from '~/lib/validators/imports';
import {
  IMPORT_MAX_ROWS,
  type ColumnMapping,
  type ImportField,
} from '~/lib/validators/import-columns';
import { shopCalendar } from '../bench/calendar';
import { db } from '../db';
import { badRequest, conflict, forbidden } from '../errors';
import type { Principal } from '../principal';
import * as clock from '~/server/clock';
import type { CheckedRow } from './check';
import { checkFileOffThread } from './check-thread';

// The first half of a CSV job import: reading and checking the whole file before anything is
// written (jobs.ts stores what passes).

export interface ImportFile {
  fileName: string;
  bytes: Uint8Array;
  mapping: ColumnMapping;
}

export type PreparedImport =
  | { ok: false; batchId: number; rowCount: number; errors: ImportRowError[] }
  | {
      ok: true;
      shop: typeof shops.$inferSelect;
      file: ImportFile;
      digest: string;
      rows: CheckedRow[];
      technicians: Map<string, number>;
    };

/** The shop an import goes into: the shop lead's own. */
async function importShop(principal: Principal) {
  if (principal.scope.kind !== 'shop') throw forbidden('Jobs are imported by a shop’s own lead.');
  const conn = await db();
  const [shop] = await conn.select().from(shops).where(eq(shops.id, principal.scope.shopId));
  if (!shop) throw forbidden('Your shop could not be found.');
  return shop;
}

/** The header row's columns by field, turned round: field by header, as the batch records it. */
export const invert = (mapping: ColumnMapping) =>
  Object.fromEntries(Object.entries(mapping).map(([field, header]) => [header, field]));

export const digestOf = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

/** A file this shop has already imported is refused, naming the earlier import. */
export async function refuseDuplicate(shopId: number, digest: string, fileName: string) {
  const conn = await db();
  const [earlier] = await conn
    .select({
      id: importBatches.id,
      fileName: importBatches.fileName,
      importedCount: importBatches.importedCount,
      completedAt: importBatches.completedAt,
      by: users.name,
    })
    .from(importBatches)
    .leftJoin(users, eq(users.id, importBatches.createdById))
    .where(
      and(
        eq(importBatches.shopId, shopId),
        eq(importBatches.kind, 'jobs'),
        eq(importBatches.fileDigest, digest),
        eq(importBatches.status, 'imported'),
      ),
    )
    .limit(1);
  if (!earlier) return;
  const when = earlier.completedAt ? earlier.completedAt.toISOString().slice(0, 10) : 'earlier';
  throw conflict(
    `This file was already imported on ${when}${earlier.by ? ` by ${earlier.by}` : ''} ` +
      `(import #${earlier.id}, “${earlier.fileName}”, ${earlier.importedCount} jobs). ` +
      `Nothing was imported again${fileName !== earlier.fileName ? ` from “${fileName}”` : ''}.`,
  );
}

/**
 * Reads and checks the whole file before anything is written: the CSV, the column mapping, every
 * row (lib/validators/imports.ts), then what only the database knows (job numbers already in the
 * shop, technicians' e-mails). A file that fails is recorded as a failed import with its errors.
 */
export async function prepareImport(
  principal: Principal,
  file: ImportFile,
  now = clock.now(),
): Promise<PreparedImport> {
  const shop = await importShop(principal);
  const digest = digestOf(file.bytes);
  await refuseDuplicate(shop.id, digest, file.fileName);

  const parsed = await checkFileOffThread({
    bytes: file.bytes,
    mapping: file.mapping,
    timeZone: shop.timeZone,
    calendar: shopCalendar(shop),
    now,
  });
  if (parsed.missing.length) {
    throw badRequest(
      'The column mapping names columns the file does not have.',
      parsed.missing.map(([field, header]) => ({
        field: `mapping.${field}`,
        message: `The file has no column “${header}”`,
      })),
    );
  }
  if (parsed.rowCount === 0) throw badRequest('The file has no rows under its headings.');
  if (parsed.rowCount > IMPORT_MAX_ROWS) {
    throw badRequest(
      `The file has ${parsed.rowCount} rows; import at most ${IMPORT_MAX_ROWS} at a time.`,
    );
  }
  const { valid, errors, rowCount } = parsed;

  // What only the database can tell.
  const conn = await db();
  const staff = await conn
    .select({ id: users.id, email: users.email })
    .from(users)
    .where(and(eq(users.shopId, shop.id), eq(users.active, true)));
  const technicians = new Map(staff.map((s) => [s.email, s.id]));
  const existing = await conn
    .select({ ref: jobs.externalRef })
    .from(jobs)
    .where(and(eq(jobs.shopId, shop.id), isNotNull(jobs.externalRef)));
  const existingRefs = new Set(existing.map((r) => r.ref));
  const column = (field: ImportField) => file.mapping[field] ?? field;
  for (const row of valid) {
    if (existingRefs.has(row.externalRef)) {
      errors.push({
        row: row.row,
        column: column('external_ref'),
        message: `Job ${row.externalRef} is already in Reelwright`,
      });
    }
    if (row.technicianEmail && !technicians.has(row.technicianEmail)) {
      errors.push({
        row: row.row,
        column: column('technician_email'),
        message: `No one at ${shop.name} signs in as ${row.technicianEmail}`,
      });
    }
  }

  if (errors.length) {
    errors.sort((a, b) => a.row - b.row);
    const [batch] = await conn
      .insert(importBatches)
      .values({
        shopId: shop.id,
        fileName: file.fileName,
        fileDigest: digest,
        sizeBytes: file.bytes.length,
        status: 'failed',
        rowCount,
        errorCount: errors.length,
        errors,
        columnMap: invert(file.mapping),
        createdById: principal.id,
        completedAt: clock.now(),
      })
      .returning({ id: importBatches.id });
    return { ok: false, batchId: batch!.id, rowCount, errors };
  }
  return { ok: true, shop, file, digest, rows: valid, technicians };
}

export const yieldToEventLoop = () => new Promise<void>((resolve) => setImmediate(resolve));
