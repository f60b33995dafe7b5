import { sql, type SQL } from 'drizzle-orm';
import type { Db } from './client';

export interface PgStyleResult {
  rows: Record<string, unknown>[];
  rowCount: number;
}

/** The slice of node-postgres' client that libraries taking "a pg client" call. */
export interface PgStyleClient {
  query(query: { text: string; values?: unknown[]; name?: string }): Promise<PgStyleResult>;
}

/**
 * A node-postgres-style `query({ text, values })` over the Drizzle handle, so a library written
 * for a pg Pool (rate-limiter-flexible's PostgreSQL store) runs on PGlite and PostgreSQL alike.
 * Statement names are ignored: each driver caches its own plans.
 */
export function pgStyleClient(db: Db): PgStyleClient {
  return {
    async query({ text, values = [] }) {
      const result = (await db.execute(positional(text, values))) as {
        rows: Record<string, unknown>[];
        rowCount?: number | null;
        affectedRows?: number;
      };
      return {
        rows: result.rows,
        rowCount: result.rowCount ?? result.affectedRows ?? result.rows.length,
      };
    },
  };
}

/**
 * `$1`…`$n` placeholders turned into Drizzle parameters. Placeholders only: a `$n` inside a string
 * literal or a dollar-quoted body would be taken for one.
 */
export function positional(text: string, values: readonly unknown[]): SQL {
  const chunks: SQL[] = [];
  let last = 0;
  for (const match of text.matchAll(/\$(\d+)/g)) {
    const index = Number(match[1]) - 1;
    if (index < 0 || index >= values.length) {
      throw new RangeError(`No value for placeholder ${match[0]}`);
    }
    chunks.push(sql.raw(text.slice(last, match.index)), sql`${values[index]}`);
    last = match.index + match[0].length;
  }
  chunks.push(sql.raw(text.slice(last)));
  return sql.join(chunks);
}
