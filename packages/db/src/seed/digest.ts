import { createHash } from 'node:crypto';
import { getTableColumns, getTableName, sql } from 'drizzle-orm';
import { getTableConfig, type PgTable } from 'drizzle-orm/pg-core';
import type { Db } from '../client';
import * as s from '../schema';

/** Tables the demo seed writes, in a fixed order. */
export const SEEDED_TABLES: readonly PgTable[] = [
  s.regions,
  s.shops,
  s.servicePrices,
  s.users,
  s.accountLinks,
  s.rootCauses,
  s.serviceStandards,
  s.serviceStandardSteps,
  s.auditForms,
  s.auditFormItems,
  s.networkSettings,
  s.customers,
  s.reels,
  s.jobs,
  s.jobEvents,
  s.benchSessions,
  s.partLines,
  s.checklistTicks,
  s.comebacks,
];

// Salted hashes differ on every run; row-creation stamps are bookkeeping, not data.
const EXCLUDED = new Set(['password_hash', 'created_at', 'updated_at']);

/** The table's key columns: `id`, or the composite primary key. */
export function keyColumns(table: PgTable): string[] {
  const columns = Object.values(getTableColumns(table));
  if (columns.some((c) => c.name === 'id')) return ['id'];
  const { primaryKeys } = getTableConfig(table);
  return primaryKeys[0]?.columns.map((c) => c.name) ?? columns.map((c) => c.name);
}

function orderOf(table: PgTable) {
  return sql.join(
    keyColumns(table).map((name) => sql.identifier(name)),
    sql`, `,
  );
}

/**
 * sha256 over a canonical dump (rows ordered by id, columns in schema order, instants as epoch
 * milliseconds so the session time zone cannot change the text) of every seeded table.
 */
export async function seedDigest(db: Pick<Db, 'execute'>): Promise<string> {
  const outer = createHash('sha256');
  for (const table of SEEDED_TABLES) {
    const cells = Object.values(getTableColumns(table))
      .filter((c) => !EXCLUDED.has(c.name))
      .map((c) => {
        const col = sql.identifier(c.name);
        const text = c.getSQLType().startsWith('timestamp')
          ? sql`(extract(epoch from ${col}) * 1000)::bigint::text`
          : sql`${col}::text`;
        return sql`coalesce(${text}, '\\N')`;
      });
    const { rows } = await db.execute<{ h: string; n: number | string }>(
      sql`select encode(sha256(convert_to(coalesce(string_agg(concat_ws(E'\\t', ${sql.join(cells, sql`, `)}), E'\\n' order by ${orderOf(table)}), ''), 'UTF8')), 'hex') as h, count(*) as n from ${table}`,
    );
    outer.update(`${getTableName(table)}:${rows[0]?.n}:${rows[0]?.h}\n`);
  }
  return outer.digest('hex');
}
