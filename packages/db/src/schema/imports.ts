import { sql } from 'drizzle-orm';
import { index, integer, jsonb, pgTable, text, uniqueIndex } from 'drizzle-orm/pg-core';
import { createdAt, id, instant } from './columns';
import { importKind, importStatus } from './enums';
import { shops } from './shops';
import { users } from './users';

export interface ImportRowError {
  row: number;
  column?: string;
  message: string;
}

export const importBatches = pgTable(
  'import_batches',
  {
    id: id(),
    shopId: integer('shop_id')
      .notNull()
      .references(() => shops.id),
    kind: importKind('kind').notNull().default('jobs'),
    fileName: text('file_name').notNull(),
    /** sha256 hex of the file's bytes: the same file uploaded twice is detected, not doubled. */
    fileDigest: text('file_digest').notNull(),
    sizeBytes: integer('size_bytes'),
    status: importStatus('status').notNull().default('validating'),
    rowCount: integer('row_count'),
    importedCount: integer('imported_count').notNull().default(0),
    errorCount: integer('error_count').notNull().default(0),
    errors: jsonb('errors').$type<ImportRowError[]>(),
    /** Column mapping chosen on screen: file header → field. */
    columnMap: jsonb('column_map').$type<Record<string, string>>(),
    createdById: integer('created_by_id').references(() => users.id),
    createdAt: createdAt(),
    /**
     * While importing: refreshed with every committed chunk. An import whose heartbeat has
     * stopped was cut off (a crash) and is taken back by the next import or start-up.
     */
    heartbeatAt: instant('heartbeat_at'),
    completedAt: instant('completed_at'),
  },
  (t) => [
    index('import_batches_shop_created_at_idx').on(t.shopId, t.createdAt),
    // A failed attempt does not block a retry of the same file; a successful one does.
    uniqueIndex('import_batches_imported_digest_uq')
      .on(t.shopId, t.kind, t.fileDigest)
      .where(sql`${t.status} = 'imported'`),
  ],
);
export type ImportBatch = typeof importBatches.$inferSelect;
export type NewImportBatch = typeof importBatches.$inferInsert;
