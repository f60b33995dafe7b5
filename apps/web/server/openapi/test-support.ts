import { sql } from '@reelwright/db';
import type { NextRequest } from 'next/server';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { testState } from '~/server/testing/memory-db';
import type { Method } from './registry';

// What the OpenAPI and fuzz tests share: the route modules by file, and a fingerprint of every
// table to show that nothing was written.

/** The origin the tests' requests come from and go to, as a browser on the app's own page sends. */
export const ORIGIN = 'http://127.0.0.1:3000';

/** The headers a browser on the app's own page sends with a write: Host, Origin, Sec-Fetch-Site. */
export const SAME_ORIGIN_HEADERS: Readonly<Record<string, string>> = {
  host: new URL(ORIGIN).host,
  origin: ORIGIN,
  'sec-fetch-site': 'same-origin',
};

export const API_DIR = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../app/api');

export type Handler = (
  request: NextRequest,
  context: { params: Promise<Record<string, string>> },
) => Promise<Response>;

/** The route module's handler for a method (`jobs/[id]/route.ts`, 'patch'). */
export async function loadRoute(file: string, method: Method): Promise<Handler> {
  const exports = (await import(path.join(API_DIR, file))) as Record<string, unknown>;
  const handler = exports[method.toUpperCase()];
  if (typeof handler !== 'function') throw new Error(`${file} exports no ${method.toUpperCase()}`);
  return handler as Handler;
}

/** Row count and a digest of every row, per table of the public schema. */
export async function databaseFingerprint(options: { except?: string[] } = {}) {
  const db = testState.handle!.db;
  const tables = await db.execute<{ name: string }>(
    sql`select table_name as name from information_schema.tables
        where table_schema = 'public' and table_type = 'BASE TABLE' order by table_name`,
  );
  const out: Record<string, string> = {};
  for (const { name } of tables.rows) {
    if (options.except?.includes(name)) continue;
    const result = await db.execute<{ n: number; digest: string | null }>(
      sql.raw(
        `select count(*)::int as n, md5(string_agg(md5(t::text), '' order by md5(t::text))) as digest from "${name}" t`,
      ),
    );
    const row = result.rows[0]!;
    out[name] = `${row.n}:${row.digest ?? ''}`;
  }
  return out;
}
