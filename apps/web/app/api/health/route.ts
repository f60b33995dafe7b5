// GET /api/health – database driver and migrations applied; no sign-in needed
import { appliedMigrationCount, journaledMigrationCount } from '@reelwright/db/client';
import { database } from '~/server/db';
import { otherMethods } from '~/server/method-not-allowed';

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
    // The handle is not cached when opening failed, so the next check tries again.
    console.error('Health check failed:', error instanceof Error ? error.message : error);
    return Response.json(
      {
        type: '/problems/database-unavailable',
        title: 'Database unavailable',
        status: 503,
        detail: 'The database cannot be reached; see the server log.',
        instance: '/api/health',
      },
      {
        status: 503,
        headers: { 'content-type': 'application/problem+json', 'retry-after': '5' },
      },
    );
  }
}

export const { DELETE, PATCH, POST, PUT, OPTIONS } = otherMethods(['GET']);
