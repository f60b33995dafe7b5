import { importTemplateCsv } from '~/lib/import-template';
import { can } from '~/lib/permissions';
import { NEXT_STATES } from '~/lib/validators/jobs';
import type { RouteSpec } from '../registry';
import type { Kind, Ref, Which } from './objects';
import type { Caller, World } from './world';

// What each route is asked and what it must answer. The object a route names (in its path, a
// filter or a body field) comes from BINDINGS; the answer comes from the rules in `expectedStatus`,
// never from a recorded response.

export const keyOf = (spec: Pick<RouteSpec, 'method' | 'path'>) => `${spec.method} ${spec.path}`;

interface Binding {
  kind: Kind;
  /** Where the id goes: the path (default), a query key or a body field. */
  at?: { query: string } | { body: string };
}

const job: Binding = { kind: 'job' };
const shopQuery = (key: string): Binding => ({ kind: 'shop', at: { query: key } });

export const BINDINGS: Record<string, Binding> = {
  'get /api/audit-rounds': shopQuery('shopId'),
  'post /api/audit-rounds': { kind: 'shop', at: { body: 'shopId' } },
  'get /api/audit-rounds/preview': shopQuery('shopId'),
  'get /api/audit-rounds/{id}': { kind: 'round' },
  'post /api/audit-rounds/{id}/redraw-check': { kind: 'round' },
  'get /api/audit-rounds/{id}/samples/{jobId}': { kind: 'sample' },
  'put /api/audit-rounds/{id}/samples/{jobId}': { kind: 'sample' },
  'get /api/audit-rounds/{id}/samples/{jobId}/photos/{photoId}': { kind: 'samplePhoto' },
  'get /api/comebacks': shopQuery('shop'),
  'get /api/comebacks/{id}': { kind: 'comeback' },
  'patch /api/comebacks/{id}': { kind: 'comeback' },
  'get /api/corrective-actions': shopQuery('shopId'),
  'patch /api/corrective-actions': { kind: 'action', at: { body: 'id' } },
  'get /api/corrective-actions/{id}': { kind: 'action' },
  'patch /api/corrective-actions/{id}': { kind: 'action' },
  'get /api/jobs': shopQuery('shopId'),
  'get /api/jobs/{id}': job,
  'patch /api/jobs/{id}': job,
  'post /api/jobs/{id}/bench-sessions': job,
  'put /api/jobs/{id}/checklist': job,
  'get /api/jobs/{id}/comeback-of': job,
  'post /api/jobs/{id}/comeback-of': { kind: 'returnJob' },
  'post /api/jobs/{id}/parts': job,
  'delete /api/jobs/{id}/parts/{partId}': { kind: 'part' },
  'get /api/jobs/{id}/photos': job,
  'get /api/jobs/{id}/photos/{photoId}': { kind: 'photo' },
  'post /api/jobs/{id}/photos': job,
  'post /api/jobs/{id}/transitions': job,
  'get /api/month-close/{month}': { kind: 'month' },
  'post /api/month-close/{month}/close': { kind: 'month' },
  'post /api/month-close/{month}/invoices': { kind: 'month' },
  'post /api/month-close/{month}/reopen': { kind: 'month' },
  'get /api/network/comparison': { kind: 'region', at: { query: 'region' } },
  'get /api/network/trends': { kind: 'region', at: { query: 'region' } },
  'get /api/reminders/batches': shopQuery('shop'),
  'get /api/reminders/batches/{id}': { kind: 'batch' },
  'get /api/reminders/due': shopQuery('shop'),
  'post /api/reminders/send': { kind: 'shop', at: { body: 'shopId' } },
  'get /api/shops/{id}': { kind: 'shop' },
  'patch /api/shops/{id}': { kind: 'shop' },
  'post /api/shops': { kind: 'region', at: { body: 'regionId' } },
  'patch /api/regions/{id}': { kind: 'region' },
  'post /api/users': { kind: 'shop', at: { body: 'shopId' } },
  'get /api/users/{id}': { kind: 'person' },
  'patch /api/users/{id}': { kind: 'person' },
  'post /api/users/{id}/invite': { kind: 'person' },
  'get /api/shops/{id}/calendar': { kind: 'shop' },
  'put /api/shops/{id}/calendar': { kind: 'shop' },
  'get /api/shops/{id}/metrics': { kind: 'shop' },
  'get /api/shops/{id}/trends': { kind: 'shop' },
};

/**
 * Routes whose own object does not get the route's success status, and why. Only state moves the
 * seeded objects cannot make belong here.
 */
export const OWN_ANSWERS: Record<string, { status: number; why: string }> = {
  'get /api/dev/mail': {
    status: 404,
    why: 'no mail catcher is configured in the tests, and without one the route has nothing to show',
  },
  'post /api/users/{id}/invite': {
    status: 409,
    why: 'every seeded technician has set a password: there is no invitation to resend',
  },
  'put /api/me/password': {
    status: 400,
    why: 'the matrix seeds a placeholder instead of a password hash, so no current password matches',
  },
  'post /api/month-close/{month}/invoices': {
    status: 409,
    why: 'November is not closed in the seeded network, and only a closed month is invoiced',
  },
  'post /api/mail/resend': {
    status: 404,
    why: 'the seeded network has no undelivered (dead) message, and only a dead one is resent',
  },
  'post /api/month-close/{month}/reopen': {
    status: 409,
    why: 'November is not closed in the seeded network: there is nothing to reopen',
  },
};

/** Routes the matrix leaves out, and why; every other route of the registry is in it. */
export const NOT_IN_MATRIX: Record<string, string> = {
  'get /api/auth/{nextauth}': 'next-auth’s own handler, public; sign-in is tested end to end',
  'post /api/auth/{nextauth}': 'next-auth’s own handler, public; sign-in is tested end to end',
  'post /api/auth/password-reset/confirm':
    'public: the token in the body is the proof; its own tests send good, used, expired and unknown tokens',
  'post /api/webhooks/payments':
    'public and signed: who calls it is the signature, which its own tests check',
  'get /api/unsubscribe/{token}':
    'public: the token in the link is the proof; its own tests send good, used and unknown tokens',
  'post /api/unsubscribe/{token}':
    'public: the token in the link is the proof; its own tests send good, used and unknown tokens',
};

/** The status the rules give: 401 signed out, 403 without the permission, 404 out of scope. */
export function expectedStatus(spec: RouteSpec, caller: Caller, which: Which | 'none'): number {
  if (spec.permission === 'public') return spec.status;
  if (!caller.principal) return 401;
  if (!can(caller.principal.role, spec.permission)) return 403;
  if (which === 'other' || which === 'missing') return 404;
  return OWN_ANSWERS[keyOf(spec)]?.status ?? spec.status;
}

export interface Input {
  params: Record<string, string>;
  query: Record<string, string>;
  body?: unknown;
  form?: FormData;
}

const SEPTEMBER = { from: '2026-09-01', to: '2026-09-30' };

/** A request the route takes for the caller's own object: its example, with ids that exist. */
export function inputFor(
  spec: RouteSpec,
  world: World,
  caller: Caller,
  ref: Ref | undefined,
): Input {
  const binding = BINDINGS[keyOf(spec)];
  const params: Record<string, string> = { ...(spec.example?.params ?? {}) };
  let query: Record<string, string> = { ...(spec.example?.query ?? {}) };
  let body: unknown = bodyFor(spec, world, caller, ref);
  if (binding && ref) {
    const at = binding.at;
    if (!at) Object.assign(params, ref);
    else if ('query' in at) query = { ...queryFor(spec), [at.query]: ref.id! };
    else body = { ...(body as object), [at.body]: Number(ref.id) };
  }
  if (spec.bodyType === 'multipart') return { params, query, form: importForm() };
  return { params, query, body };
}

function queryFor(spec: RouteSpec): Record<string, string> {
  // The job list's other filters (a technician, a search) would only narrow an empty answer.
  if (spec.path === '/api/jobs') return {};
  return { ...(spec.example?.query ?? {}) };
}

function bodyFor(spec: RouteSpec, world: World, caller: Caller, ref: Ref | undefined): unknown {
  const id = Number(ref?.id);
  switch (keyOf(spec)) {
    case 'post /api/audit-rounds':
      return { ...SEPTEMBER, aql: 2.5, level: 'II', auditorId: world.auditorId };
    case 'put /api/audit-rounds/{id}/samples/{jobId}': {
      const round = world.rounds.find((r) => r.id === id) ?? world.rounds[0]!;
      return { answers: round.itemIds.map((itemId) => ({ itemId, result: 'pass' })), final: false };
    }
    case 'patch /api/comebacks/{id}':
      return { symptom: 'Drag slips again under load' };
    case 'patch /api/corrective-actions':
    case 'patch /api/corrective-actions/{id}':
      // The lead moves an action along; a manager or the owner edits it (and verifies it later).
      return caller.principal?.role === 'shop_lead'
        ? { status: 'in_progress' }
        : { dueOn: '2026-12-24' };
    case 'post /api/jobs': {
      const shopId = caller.principal?.shopId;
      const tech = world.technicians.find((t) => t.shopId === shopId);
      const example = spec.example!.body as Record<string, unknown>;
      return { ...example, technicianId: tech?.id ?? null, promisedOn: '2026-12-18' };
    }
    case 'patch /api/jobs/{id}':
      return { findings: 'Drag washers glazed; replaced' };
    case 'put /api/jobs/{id}/checklist':
      return { stepIds: [] };
    case 'post /api/jobs/{id}/comeback-of': {
      const ret = world.returnJobs.find((j) => j.id === id);
      return { originalJobId: ret?.originalJobId ?? id, symptom: 'Drag slips again' };
    }
    case 'post /api/jobs/{id}/transitions': {
      // The job's first allowed move: on the bench from checked in, waiting for parts from there.
      const state = world.openJobs.find((j) => j.id === id)?.state ?? 'checked_in';
      return { to: NEXT_STATES[state][0] };
    }
    case 'post /api/reminders/send':
      return { weeks: 4 };
    case 'put /api/settings/comebacks': {
      const example = spec.example!.body as Record<string, unknown>;
      return { ...example, rootCauses: world.rootCauses };
    }
    default:
      return spec.example?.body;
  }
}

function importForm(): FormData {
  const csv = importTemplateCsv();
  const headers = csv.split(/\r?\n/)[0]!.split(',');
  const form = new FormData();
  form.set('file', new File([csv], 'jobs.csv', { type: 'text/csv' }));
  // The template's example names a Marram Point technician: not a column every shop can take.
  const mapped = headers.filter((h) => h !== 'technician_email');
  form.set('mapping', JSON.stringify(Object.fromEntries(mapped.map((h) => [h, h]))));
  return form;
}
