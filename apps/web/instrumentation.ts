// Runs once when the server starts: validate the environment and bring the database up to date.
export async function register() {
  if (process.env.NEXT_RUNTIME !== 'nodejs') return;
  const { env } = await import('./env');
  const { database } = await import('./server/db');
  const { runMigrations } = await import('@reelwright/db/client');
  const handle = await database();
  const applied = await runMigrations(handle);
  console.log(
    `Reelwright: database ${handle.driver}${env.DATABASE_URL ? '' : ' (embedded)'}, ${applied} migration(s) applied`,
  );
}
