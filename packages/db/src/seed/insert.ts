import { getTableColumns, getTableName, sql } from 'drizzle-orm';
import { getTableConfig, type PgTable } from 'drizzle-orm/pg-core';
import type { Db } from '../client';

type Executor = Pick<Db, 'execute'>;

function toJson(value: unknown): unknown {
  return value instanceof Date ? value.toISOString() : value;
}

/**
 * Inserts rows keyed by the table's TypeScript property names, `chunk` rows per statement.
 * Each statement sends one array per column, unpacked by unnest (or, for tables with array
 * columns, one jsonb document unpacked by jsonb_to_recordset), so a batch of thousands of rows
 * is one round trip and stays far below the bind-parameter limit.
 */
export async function bulkInsert(
  db: Executor,
  table: PgTable,
  rows: readonly Record<string, unknown>[],
  chunk = 5000,
): Promise<number> {
  if (rows.length === 0) return 0;
  const columns = Object.entries(getTableColumns(table)).filter(([key]) => key in rows[0]!);
  const names = sql.join(
    columns.map(([, c]) => sql.identifier(c.name)),
    sql`, `,
  );
  const types = columns.map(([, c]) => c.getSQLType());
  const viaJson = types.some((t) => t.endsWith(']'));
  for (let i = 0; i < rows.length; i += chunk) {
    const slice = rows.slice(i, i + chunk);
    if (viaJson) {
      const json = JSON.stringify(
        slice.map((row) => {
          const out: Record<string, unknown> = {};
          for (const [key, column] of columns) out[column.name] = toJson(row[key]);
          return out;
        }),
      );
      const defs = sql.raw(columns.map(([, c], k) => `"${c.name}" ${types[k]}`).join(', '));
      await db.execute(
        sql`insert into ${table} (${names}) select ${names} from jsonb_to_recordset(${json}::jsonb) as x(${defs})`,
      );
    } else {
      // Sent as text[] and cast in SQL: drivers serialize text arrays alike, but not enum arrays.
      const arrays = columns.map(([key], k) => {
        const values = slice.map((row) => {
          const v = row[key] ?? null;
          if (v === null) return null;
          if (v instanceof Date) return v.toISOString();
          return typeof v === 'object' ? JSON.stringify(v) : String(v);
        });
        return sql`${sql.param(values)}::text[]::${sql.raw(types[k]!)}[]`;
      });
      await db.execute(
        sql`insert into ${table} (${names}) select * from unnest(${sql.join(arrays, sql`, `)})`,
      );
    }
  }
  return rows.length;
}

/** Moves a table's identity sequence past the explicit ids the seed inserted. */
export async function resetIdentity(db: Executor, table: PgTable): Promise<void> {
  const name = getTableName(table);
  await db.execute(
    sql`select setval(pg_get_serial_sequence(${`"${name}"`}, 'id'), (select coalesce(max(id), 0) + 1 from ${table}), false)`,
  );
}

/**
 * Throws if any row of `tables` references a missing row: the check the foreign keys would
 * have made row by row, done as one anti-join per constraint.
 */
export async function assertForeignKeys(db: Executor, tables: readonly PgTable[]): Promise<void> {
  for (const table of tables) {
    for (const fk of getTableConfig(table).foreignKeys) {
      const ref = fk.reference();
      const [column] = ref.columns;
      const [target] = ref.foreignColumns;
      if (!column || !target || ref.columns.length !== 1) continue;
      const { rows } = await db.execute<{ n: number | string }>(
        sql`select count(*) as n from ${table} t where t.${sql.identifier(column.name)} is not null
          and not exists (select 1 from ${ref.foreignTable} f where f.${sql.identifier(target.name)} = t.${sql.identifier(column.name)})`,
      );
      const missing = Number(rows[0]?.n ?? 0);
      if (missing > 0) {
        throw new Error(
          `Seed bug: ${missing} row(s) of ${getTableName(table)}.${column.name} reference no ${getTableName(ref.foreignTable)} row.`,
        );
      }
    }
  }
}
