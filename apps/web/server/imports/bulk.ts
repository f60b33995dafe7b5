import { getTableColumns, sql, type Db, type Tx } from '@reelwright/db';
import type { PgTable } from 'drizzle-orm/pg-core';

type Executor = Pick<Db | Tx, 'execute'>;

/**
 * Inserts rows keyed by the table's property names, `chunk` rows per statement: one text array per
 * column, cast and unpacked by unnest, so thousands of rows are one round trip far below the
 * bind-parameter limit. Array and jsonb columns are not supported (imports write neither).
 * Returned rows come back in no promised order: match them to the input by a key column.
 */
export async function bulkInsert<R extends Record<string, unknown> = Record<string, never>>(
  db: Executor,
  table: PgTable,
  rows: readonly Record<string, unknown>[],
  options: {
    chunk?: number;
    /** Columns to hand back for each inserted row (SQL names), e.g. `id, external_ref`. */
    returning?: string;
    /** Called after each statement; awaited, so it may hand the event loop a turn. */
    onChunk?: (inserted: number) => void | Promise<void>;
  } = {},
): Promise<R[]> {
  const chunk = options.chunk ?? 5000;
  const returned: R[] = [];
  if (rows.length === 0) return returned;
  const columns = Object.entries(getTableColumns(table)).filter(([key]) => key in rows[0]!);
  const names = sql.join(
    columns.map(([, c]) => sql.identifier(c.name)),
    sql`, `,
  );
  for (let i = 0; i < rows.length; i += chunk) {
    const slice = rows.slice(i, i + chunk);
    const arrays = columns.map(([key, column]) => {
      const values = slice.map((row) => {
        const v = row[key] ?? null;
        if (v === null) return null;
        return v instanceof Date ? v.toISOString() : String(v);
      });
      // Sent as text[] and cast in SQL: both drivers serialize text arrays alike, not enum arrays.
      return sql`${sql.param(values)}::text[]::${sql.raw(column.getSQLType())}[]`;
    });
    const statement = sql`insert into ${table} (${names}) select * from unnest(${sql.join(arrays, sql`, `)})`;
    if (options.returning) {
      const { rows: back } = await db.execute<R>(
        sql`${statement} returning ${sql.raw(options.returning)}`,
      );
      returned.push(...(back as R[]));
    } else {
      await db.execute(statement);
    }
    await options.onChunk?.(Math.min(i + chunk, rows.length));
  }
  return returned;
}
