import { asc, eq, type Tx } from '@reelwright/db';
import { benchSessions, jobEvents, users } from '@reelwright/db/schema';

// Reads of a job's history shared by the bench job page and the audit's job record; the
// caller has already checked that the job is in its scope.

/** The job's state timeline, oldest first, with the name of whoever made each move. */
export function jobTimeline(conn: Pick<Tx, 'select'>, jobId: number) {
  return conn
    .select({
      id: jobEvents.id,
      fromState: jobEvents.fromState,
      toState: jobEvents.toState,
      at: jobEvents.at,
      note: jobEvents.note,
      userName: users.name,
    })
    .from(jobEvents)
    .leftJoin(users, eq(users.id, jobEvents.userId))
    .where(eq(jobEvents.jobId, jobId))
    .orderBy(asc(jobEvents.at), asc(jobEvents.id));
}

/** The job's bench sessions (timers and minutes logged by hand) in the order they were logged. */
export function jobBenchSessions(conn: Pick<Tx, 'select'>, jobId: number) {
  return conn
    .select({
      id: benchSessions.id,
      technicianId: benchSessions.technicianId,
      technicianName: users.name,
      startedAt: benchSessions.startedAt,
      endedAt: benchSessions.endedAt,
      minutes: benchSessions.minutes,
      note: benchSessions.note,
      createdAt: benchSessions.createdAt,
    })
    .from(benchSessions)
    .innerJoin(users, eq(users.id, benchSessions.technicianId))
    .where(eq(benchSessions.jobId, jobId))
    .orderBy(asc(benchSessions.createdAt), asc(benchSessions.id));
}
