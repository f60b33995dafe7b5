import type * as NextServer from 'next/server';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { env } from '~/env';
import type * as Storage from '~/server/storage';
import {
  closeMemoryDb,
  openTargetDb,
  TEST_TARGET,
  testState as state,
} from '~/server/testing/memory-db';
import { chooseObject, type Which } from './access-matrix/objects';
import {
  BINDINGS,
  expectedStatus,
  inputFor,
  keyOf,
  NOT_IN_MATRIX,
  OWN_ANSWERS,
} from './access-matrix/plan';
import { requestOf, rolledBack, send, type Answer } from './access-matrix/run';
import { buildWorld, MATRIX_NOW, type World } from './access-matrix/world';
import { ROUTES, routeFileOf, type RouteSpec } from './registry';
import { databaseFingerprint, loadRoute } from './test-support';

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));
vi.mock('~/server/session', () =>
  import('~/server/testing/memory-db').then((m) => m.sessionModule),
);
// `after()` needs Next's request scope; the reminder send's follow-up work starts after the
// answer, which is all the matrix looks at.
vi.mock('~/server/storage', async (original) => ({
  ...(await original<typeof Storage>()),
  ...(await import('./access-matrix/object-store')),
}));
vi.mock('next/server', async (original) => ({
  ...(await original<typeof NextServer>()),
  after: () => undefined,
}));

// Every route of the registry × every demo account and signed out × an object in the caller's
// scope, one outside it and one that does not exist (objects.ts says how each is chosen). The
// expected status follows from the rules alone (plan.ts): 401 signed out, 403 without the
// route's permission, 404 out of scope or missing (both alike), else the route's own status.
// Refusals must write nothing: one fingerprint of every table per route; successful writes run
// in a transaction that is rolled back. Runs on PGlite, and on PostgreSQL with TEST_DATABASE_URL.

let world: World;
let fingerprint: Record<string, string>;
const counts = new Map<number, number>();
let cases = 0;
let unexpected = 0;

beforeAll(async () => {
  // Upload URLs are signed for this address; nothing is sent there (object-store.ts).
  Object.assign(env, {
    S3_ENDPOINT: 'http://127.0.0.1:9',
    S3_BUCKET: 'matrix-photos',
    S3_ACCESS_KEY_ID: 'S3RVER',
    S3_SECRET_ACCESS_KEY: 'S3RVER',
  });
  vi.useFakeTimers({ toFake: ['Date'], now: MATRIX_NOW });
  await openTargetDb();
  world = await buildWorld();
  fingerprint = await databaseFingerprint();
}, 600_000);

afterAll(async () => {
  vi.useRealTimers();
  await closeMemoryDb();
  const byStatus = [...counts.entries()]
    .sort(([a], [b]) => a - b)
    .map(([status, n]) => `${status}: ${n}`)
    .join(', ');
  console.log(
    `access matrix (${TEST_TARGET}): ${cases} cases, ${byStatus}; ${unexpected} unexpected`,
  );
});

const inMatrix = ROUTES.filter((spec) => !NOT_IN_MATRIX[keyOf(spec)]);

function objectsOf(spec: RouteSpec): (Which | 'none')[] {
  return BINDINGS[keyOf(spec)] ? ['own', 'other', 'missing'] : ['none'];
}

describe(`access matrix (${TEST_TARGET}) – every route × caller × own, other and missing object`, () => {
  it('binds every route with a path id to a kind of object, and names only real routes', () => {
    const keys = new Set(ROUTES.map(keyOf));
    for (const key of [...Object.keys(BINDINGS), ...Object.keys(OWN_ANSWERS)])
      expect(keys.has(key), key).toBe(true);
    const unbound = inMatrix
      .filter((s) => !s.catchAll && s.path.includes('{') && !BINDINGS[keyOf(s)])
      .map(keyOf);
    expect(unbound).toEqual([]);
  });

  it.each(inMatrix.map((spec) => [keyOf(spec).toUpperCase(), spec] as const))(
    '%s',
    async (_name, spec) => {
      const handler = await loadRoute(routeFileOf(spec), spec.method);
      const binding = BINDINGS[keyOf(spec)];
      const wrong: string[] = [];
      for (const caller of world.callers) {
        const answers: Partial<Record<Which, Answer>> = {};
        for (const which of objectsOf(spec)) {
          const ref =
            which === 'none'
              ? undefined
              : chooseObject(world, caller.principal, binding!.kind, which);
          if (which !== 'none' && !ref) {
            // Only the owner, who sees everything, may lack an object; everyone has their own.
            if (which === 'own') wrong.push(`${caller.name}: no own ${binding!.kind} in the seed`);
            continue;
          }
          state.principal = caller.principal;
          const input = inputFor(spec, world, caller, ref);
          const expected = expectedStatus(spec, caller, which);
          const request = requestOf(spec, input);
          const writes = spec.method !== 'get' && expected < 300;
          const answer = writes
            ? await rolledBack(() => send(handler, request, input.params))
            : await send(handler, request, input.params);
          cases += 1;
          counts.set(answer.status, (counts.get(answer.status) ?? 0) + 1);
          if (which !== 'none') answers[which] = answer;
          const what = `${caller.name} × ${which} ${JSON.stringify(ref ?? {})}`;
          if (answer.status !== expected)
            wrong.push(
              `${what}: expected ${expected}, got ${answer.status} ${answer.problemType ?? ''} ${answer.detail ?? ''}`,
            );
          else if (answer.status >= 400 && !answer.contentType.includes('application/problem+json'))
            wrong.push(
              `${what}: ${answer.status} as ${answer.contentType}, not a problem document`,
            );
        }
        const { other, missing } = answers;
        if (
          other &&
          missing &&
          (other.status !== missing.status || other.problemType !== missing.problemType)
        )
          wrong.push(
            `${caller.name}: out of scope (${other.status} ${other.problemType}) and missing ` +
              `(${missing.status} ${missing.problemType}) answer differently`,
          );
      }
      unexpected += wrong.length;
      expect(wrong).toEqual([]);
      // Refusals and reads ran on the seeded data itself: none of them may have written.
      const after = await databaseFingerprint();
      const changed = Object.keys(after).filter((t) => after[t] !== fingerprint[t]);
      fingerprint = after;
      expect(changed, 'tables written by a refused request or a read').toEqual([]);
    },
    300_000,
  );
});
