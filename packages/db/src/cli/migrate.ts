// pnpm --filter @reelwright/db migrate: apply the committed migrations.
import { openDb, runMigrations } from '../client';
import { databaseOptions, describe, main } from './args';

await main(async () => {
  const handle = await openDb(databaseOptions());
  try {
    const applied = await runMigrations(handle);
    console.log(`› ${describe(handle)}: ${applied} migration(s) applied`);
  } finally {
    await handle.close();
  }
});
