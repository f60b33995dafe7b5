// GET /api/health – database driver and migrations applied; no sign-in needed
import { migrationStatus } from '@reelwright/db/client';
import { database } from '~/server/db';

export const dynamic = 'force-dynamic';

export async function GET() {
  try {
    const handle = await database();
    const status = await migrationStatus(handle);
    const ok = status.pending === 0;
    return Response.json(
      { status: ok ? 'ok' : 'degraded', database: { driver: handle.driver, ...status } },
      { status: ok ? 200 : 503 },
    );
  } catch (error) {
    console.error('Health check failed', error);
    return Response.json({ status: 'down', database: null }, { status: 503 });
  }
}
