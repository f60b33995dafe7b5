// GET /api/health – database driver and migrations applied; no sign-in needed
import { appliedMigrationCount, journaledMigrationCount } from '@reelwright/db/client';
import { database } from '~/server/db';

export const dynamic = 'force-dynamic';

export async function GET() {
  try {
    const handle = await database();
    const applied = await appliedMigrationCount(handle.db);
    const pending = Math.max(0, journaledMigrationCount() - applied);
    return Response.json(
      {
        status: pending === 0 ? 'ok' : 'degraded',
        database: { driver: handle.driver, applied, pending },
      },
      { status: pending === 0 ? 200 : 503 },
    );
  } catch (error) {
    console.error('Health check failed', error);
    return Response.json({ status: 'down', database: null }, { status: 503 });
  }
}
