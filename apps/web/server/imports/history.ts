import { desc, eq } from '@reelwright/db';
import { importBatches, users } from '@reelwright/db/schema';
import { db } from '../db';
import type { Principal } from '../principal';

export interface ImportHistoryRow {
  id: number;
  fileName: string;
  status: 'validating' | 'importing' | 'imported' | 'failed';
  rowCount: number | null;
  importedCount: number;
  errorCount: number;
  createdAt: string;
  by: string | null;
}

/** The caller's shop's latest imports, successful or not. */
export async function recentImports(principal: Principal, limit = 10): Promise<ImportHistoryRow[]> {
  if (principal.scope.kind !== 'shop') return [];
  const conn = await db();
  const rows = await conn
    .select({
      id: importBatches.id,
      fileName: importBatches.fileName,
      status: importBatches.status,
      rowCount: importBatches.rowCount,
      importedCount: importBatches.importedCount,
      errorCount: importBatches.errorCount,
      createdAt: importBatches.createdAt,
      by: users.name,
    })
    .from(importBatches)
    .leftJoin(users, eq(users.id, importBatches.createdById))
    .where(eq(importBatches.shopId, principal.scope.shopId))
    .orderBy(desc(importBatches.createdAt), desc(importBatches.id))
    .limit(limit);
  return rows.map((r) => ({ ...r, createdAt: r.createdAt.toISOString() }));
}
