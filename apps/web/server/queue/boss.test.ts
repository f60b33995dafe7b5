import { sql } from '@reelwright/db';
import { MEMORY, migrate, openDb, type DbHandle } from '@reelwright/db/client';
import { freshDb, TEST_DATABASE_URL } from '@reelwright/db/test-databases';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { PgBoss } from 'pg-boss';
import { enqueueOn, QUEUES, startBoss } from './boss';

// The server's two shapes: the embedded database in a worker thread behind its socket with a
// node-postgres pool of one (what `next start` opens without DATABASE_URL), and a PostgreSQL
// server (in `npm test`, TEST_DATABASE_URL).
const targets: [string, () => Promise<DbHandle>][] = [
  ['embedded PGlite through the socket', () => openDb({ dataDir: MEMORY, isolate: true })],
];
if (TEST_DATABASE_URL) targets.push(['PostgreSQL', () => freshDb('pg')]);

const until = async (check: () => boolean, ms = 15_000) => {
  const end = Date.now() + ms;
  while (!check() && Date.now() < end) await new Promise((r) => setTimeout(r, 100));
};

describe.each(targets)('job queue on %s', (_name, open) => {
  let handle: DbHandle;
  let boss: PgBoss;
  beforeAll(async () => {
    handle = await open();
    await migrate(handle.db, handle.driver);
    boss = await startBoss(handle);
  }, 120_000);
  afterAll(async () => {
    await boss?.stop({ graceful: false, close: false, timeout: 1000 });
    await handle?.close();
  });

  it('server – a job enqueued in a transaction exists only when it commits, and runs once', async () => {
    const seen: string[] = [];
    const worker = await boss.work<{ n: string }>(
      QUEUES.nudges,
      { pollingIntervalSeconds: 0.5 },
      async ([job]) => {
        seen.push(job!.data.n);
      },
    );
    await handle.db
      .transaction(async (tx) => {
        await enqueueOn(boss, QUEUES.nudges, { n: 'rolled back' }, { tx });
        throw new Error('undo');
      })
      .catch(() => {});
    await handle.db.transaction(async (tx) => {
      await enqueueOn(boss, QUEUES.nudges, { n: 'committed' }, { tx });
    });
    boss.notifyWorker(worker);
    await until(() => seen.length > 0);
    await new Promise((r) => setTimeout(r, 1500));
    expect(seen).toEqual(['committed']);
    await boss.offWork(QUEUES.nudges);
  });

  it('server – a job claimed by an instance that died is given out again after its lease', async () => {
    await boss.createQueue('lease-check', { expireInSeconds: 1, retryLimit: 2 });
    const id = await boss.send('lease-check', { n: 1 });
    // The "dead instance": it fetched the job and never finished it.
    const [claimed] = await boss.fetch('lease-check');
    expect(claimed?.id).toBe(id);
    expect(await boss.fetch('lease-check')).toEqual([]);
    await new Promise((r) => setTimeout(r, 1500));
    // Maintenance (run by whichever instance supervises) expires the lease; the job is due again.
    await boss.supervise('lease-check');
    let again: { id: string }[] = [];
    const end = Date.now() + 15_000;
    while (!again.length && Date.now() < end) {
      again = await boss.fetch('lease-check');
      if (!again.length) await new Promise((r) => setTimeout(r, 250));
    }
    expect(again.map((j) => j.id)).toEqual([id]);
    const { rows } = await handle.db.execute<{ retry_count: number }>(
      sql`select retry_count from pgboss.job where id = ${id}::uuid`,
    );
    expect(rows[0]?.retry_count).toBe(1);
  }, 60_000);
});
