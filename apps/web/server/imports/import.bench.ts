// pnpm --filter @reelwright/web exec vitest bench --run server/imports
// Times a CSV import of past jobs on in-memory PGlite: checking the file, then storing it.
import { afterAll, beforeAll, bench, describe, vi } from 'vitest';
import { closeMemoryDb, openMemoryDb, testState as state } from '~/server/testing/memory-db';
import { buildImportNetwork, identityMapping, importRows, toCsv } from './fixture';
import { runImport } from './jobs';
import { prepareImport } from './prepare';

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));

let net: Awaited<ReturnType<typeof buildImportNetwork>>;
const files = new Map<number, Uint8Array>();

beforeAll(async () => {
  await openMemoryDb();
  net = await buildImportNetwork(state.handle!.db);
  for (const n of [5_000, 50_000]) {
    files.set(n, new TextEncoder().encode(toCsv(importRows(n, `B${n}`))));
  }
}, 120_000);

afterAll(async () => {
  await closeMemoryDb();
});

async function importOnce(n: number) {
  const bytes = files.get(n)!;
  const t0 = performance.now();
  const prepared = await prepareImport(net.lead, {
    fileName: `bench-${n}.csv`,
    bytes,
    mapping: identityMapping,
  });
  if (!prepared.ok) throw new Error(JSON.stringify(prepared.errors.slice(0, 3)));
  const t1 = performance.now();
  await runImport(net.lead, prepared);
  const t2 = performance.now();
  console.log(
    `import of ${n.toLocaleString('en-US')} rows (${(bytes.length / 1e6).toFixed(1)} MB): ` +
      `check ${((t1 - t0) / 1000).toFixed(2)} s, store ${((t2 - t1) / 1000).toFixed(2)} s, ` +
      `total ${((t2 - t0) / 1000).toFixed(2)} s`,
  );
}

describe('CSV job import', () => {
  bench('5,000 rows', () => importOnce(5_000), { iterations: 1, warmupIterations: 0, time: 0 });
  bench('50,000 rows', () => importOnce(50_000), {
    iterations: 1,
    warmupIterations: 0,
    time: 0,
  });
});
