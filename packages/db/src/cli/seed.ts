// pnpm --filter @reelwright/db seed [--seed=…] [--years=…] [--now=ISO]: migrate, then seed the
// demo network if the database is empty; existing data is never touched.
import { openDb, runMigrations } from '../client';
import { DEFAULT_SEED, DEFAULT_SEED_NOW, isEmpty, seedDemo } from '../seed';
import { databaseOptions, describe, flag, main } from './args';

await main(async () => {
  const handle = await openDb(databaseOptions());
  try {
    const applied = await runMigrations(handle);
    console.log(`› ${describe(handle)}: ${applied} migration(s) applied`);
    if (!(await isEmpty(handle.db))) {
      console.log('› the database already has data; the demo seed leaves it as it is');
      return;
    }
    const years = Number(flag('years') ?? 2);
    const now = flag('now') ? new Date(flag('now')!) : DEFAULT_SEED_NOW;
    if (!(years > 0) || Number.isNaN(now.getTime()))
      throw new Error('--years must be > 0 and --now an ISO date');
    const { counts, milliseconds } = await seedDemo(handle.db, {
      seed: flag('seed') ?? DEFAULT_SEED,
      years,
      now,
    });
    const width = Math.max(...Object.keys(counts).map((k) => k.length));
    console.log(`› seeded the demo network in ${(milliseconds / 1000).toFixed(1)} s:`);
    for (const [table, n] of Object.entries(counts)) {
      console.log(`    ${table.padEnd(width)}  ${n.toLocaleString('en-US').padStart(9)}`);
    }
  } finally {
    await handle.close();
  }
});
