// Runs once when the server starts: validate the environment and bring the database up to date.
import type { env as Env } from './env';

export async function register() {
  if (process.env.NEXT_RUNTIME !== 'nodejs') return;
  let env: typeof Env;
  try {
    ({ env } = await import('./env'));
  } catch (error) {
    // A server that cannot sign sessions or reach its database must not start half-working.
    console.error(error instanceof Error ? error.message : error);
    process.exit(1);
  }
  const { database } = await import('./server/db');
  const { runMigrations } = await import('@reelwright/db/client');
  try {
    const handle = await database();
    const applied = await runMigrations(handle);
    console.log(
      `Reelwright: database ${handle.driver}${env.DATABASE_URL ? '' : ' (embedded)'}, ${applied} migration(s) applied`,
    );
    // An import cut off by a crash is taken back now: on the embedded database nothing else can
    // be running one; on a server, only those whose heartbeat stopped.
    const { takeBackAbandonedImports } = await import('./server/imports/take-back');
    const takenBack = await takeBackAbandonedImports({ all: handle.driver === 'pglite' });
    if (takenBack) console.log(`Reelwright: took back ${takenBack} import(s) cut off part-way`);
    // The job queue and this instance's workers (server/queue): mail, payment events, royalty
    // invoices, nudges and the weekly reminders.
    const { startQueue } = await import('./server/queue');
    await startQueue();
    console.log('Reelwright: job queue started');
  } catch (error) {
    // Exiting lets a supervisor (or the person starting it) see why, instead of a server that
    // answers every request with an error.
    console.error(
      `Reelwright cannot start: ${error instanceof Error ? error.message : String(error)}`,
    );
    process.exit(1);
  }
}
