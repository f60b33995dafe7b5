import { eq, inArray } from '@reelwright/db';
import { auditRounds, correctiveActions, jobs, users } from '@reelwright/db/schema';
import { NextRequest } from 'next/server';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import * as auditFormsRoute from '~/app/api/audit-forms/route';
import * as roundRoute from '~/app/api/audit-rounds/[id]/route';
import * as sampleRoute from '~/app/api/audit-rounds/[id]/samples/[jobId]/route';
import * as previewRoute from '~/app/api/audit-rounds/preview/route';
import * as roundsRoute from '~/app/api/audit-rounds/route';
import * as comebackRoute from '~/app/api/comebacks/[id]/route';
import * as comebacksRoute from '~/app/api/comebacks/route';
import * as actionRoute from '~/app/api/corrective-actions/[id]/route';
import * as actionsRoute from '~/app/api/corrective-actions/route';
import * as customersRoute from '~/app/api/customers/route';
import * as importTemplateRoute from '~/app/api/imports/jobs/template/route';
import * as importsRoute from '~/app/api/imports/jobs/route';
import * as comebackOfRoute from '~/app/api/jobs/[id]/comeback-of/route';
import * as jobRoute from '~/app/api/jobs/[id]/route';
import * as jobsRoute from '~/app/api/jobs/route';
import * as meRoute from '~/app/api/me/route';
import * as monthRoute from '~/app/api/month-close/[month]/route';
import * as comparisonRoute from '~/app/api/network/comparison/route';
import * as networkTrendsRoute from '~/app/api/network/trends/route';
import * as batchRoute from '~/app/api/reminders/batches/[id]/route';
import * as batchesRoute from '~/app/api/reminders/batches/route';
import * as dueRoute from '~/app/api/reminders/due/route';
import * as comebackSettingsRoute from '~/app/api/settings/comebacks/route';
import * as calendarRoute from '~/app/api/shops/[id]/calendar/route';
import * as metricsRoute from '~/app/api/shops/[id]/metrics/route';
import * as shopRoute from '~/app/api/shops/[id]/route';
import * as shopTrendsRoute from '~/app/api/shops/[id]/trends/route';
import * as shopsRoute from '~/app/api/shops/route';
import * as usersRoute from '~/app/api/users/route';
import { buildMonthCloseNetwork } from '~/server/month-close/test-network';
import { scopeOf, type Principal } from '~/server/principal';
import { closeMemoryDb, openMemoryDb, testState as state } from '~/server/testing/memory-db';
import { listCorrectiveActions } from './corrective-actions';
import { listRounds } from './audits';
import { shopInScope } from './scope';

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));
vi.mock('~/server/session', () =>
  import('~/server/testing/memory-db').then((m) => m.sessionModule),
);

type Handler = (
  request: NextRequest,
  context: { params: Promise<Record<string, string>> },
) => Promise<Response>;

const MISSING = 987_654;
const PERIOD = 'from=2026-11-01&to=2026-11-30';

let net: Awaited<ReturnType<typeof buildMonthCloseNetwork>>;
let tess: Principal;
let reefRoundId: number;
let reefActionId: number;
let duneRoundId: number;
let duneActionId: number;
let duneComebackId: number;
let reefJobId: number;

beforeAll(async () => {
  await openMemoryDb();
  const db = state.handle!.db;
  net = await buildMonthCloseNetwork(db);
  // A second technician at Dune, so that a colleague's money exists to be hidden.
  const [second] = await db
    .insert(users)
    .values({
      email: 'tess.dune@t.test',
      name: 'Tess Tech',
      passwordHash: 'x',
      role: 'technician',
      shopId: net.shops.dune.id,
    })
    .returning();
  tess = { ...second!, scope: scopeOf(second!) };
  await db.update(jobs).set({ technicianId: net.techDune.id }).where(eq(jobs.id, net.jobs.d1.id));
  await db
    .update(jobs)
    .set({ technicianId: tess.id })
    .where(inArray(jobs.id, [net.jobs.d2.id, net.jobs.d3.id]));
  // Dune's round is the auditor's; Reef gets a round of its own that is not.
  const [duneRound] = await db
    .update(auditRounds)
    .set({ auditorId: net.auditor.id })
    .where(eq(auditRounds.shopId, net.shops.dune.id))
    .returning();
  duneRoundId = duneRound!.id;
  const { id: _id, ...copy } = duneRound!;
  const [reefRound] = await db
    .insert(auditRounds)
    .values({ ...copy, shopId: net.shops.reef.id, auditorId: null, lotJobIds: [] })
    .returning();
  reefRoundId = reefRound!.id;
  const [reefAction] = await db
    .insert(correctiveActions)
    .values({ shopId: net.shops.reef.id, source: 'other', title: 'Reef', dueOn: '2026-12-10' })
    .returning();
  reefActionId = reefAction!.id;
  const [duneAction] = await db
    .select({ id: correctiveActions.id })
    .from(correctiveActions)
    .where(eq(correctiveActions.shopId, net.shops.dune.id))
    .limit(1);
  duneActionId = duneAction!.id;
  const comeback = await state.handle!.db.query.comebacks.findFirst();
  duneComebackId = comeback!.id;
  const [reefJob] = await db
    .select({ id: jobs.id })
    .from(jobs)
    .where(eq(jobs.shopId, net.shops.reef.id))
    .limit(1);
  reefJobId = reefJob!.id;
}, 120_000);

afterAll(async () => {
  await closeMemoryDb();
});

async function get(
  handler: Handler,
  path: string,
  params: Record<string, string | number> = {},
): Promise<Response> {
  return handler(new NextRequest(`http://127.0.0.1${path}`), {
    params: Promise.resolve(
      Object.fromEntries(Object.entries(params).map(([k, v]) => [k, `${v}`])),
    ),
  });
}

async function as(principal: Principal, handler: Handler, path: string, params = {}) {
  state.principal = principal;
  return get(handler, path, params);
}

async function expectProblem(response: Response, status: number) {
  expect(response.status).toBe(status);
  expect(response.headers.get('content-type')).toContain('application/problem+json');
  expect(await response.json()).toMatchObject({ status });
}

describe('auditor – sees a shop only through their rounds', () => {
  it('auditor – gets 403 from every shop route, own round shop, other shop and missing shop alike', async () => {
    for (const id of [net.shops.dune.id, net.shops.reef.id, MISSING]) {
      await expectProblem(await as(net.auditor, shopRoute.GET, `/api/shops/${id}`, { id }), 403);
      await expectProblem(
        await as(net.auditor, metricsRoute.GET, `/api/shops/${id}/metrics?${PERIOD}`, { id }),
        403,
      );
      await expectProblem(
        await as(
          net.auditor,
          shopTrendsRoute.GET,
          `/api/shops/${id}/trends?${PERIOD}&metric=revenue`,
          {
            id,
          },
        ),
        403,
      );
    }
    await expectProblem(await as(net.auditor, shopsRoute.GET, '/api/shops'), 403);
  });

  it('auditor – still reads /api/me, with the rounds scope', async () => {
    const me = await as(net.auditor, meRoute.GET, '/api/me');
    expect(me.status).toBe(200);
    expect(await me.json()).toMatchObject({ role: 'auditor', scope: { kind: 'rounds' } });
  });

  it('auditor – lists their rounds, filters by their round shop, and gets 404 for another shop', async () => {
    const mine = await as(net.auditor, roundsRoute.GET, '/api/audit-rounds');
    expect(((await mine.json()) as { rounds: { id: number }[] }).rounds.map((r) => r.id)).toEqual([
      duneRoundId,
    ]);
    const own = await as(
      net.auditor,
      roundsRoute.GET,
      `/api/audit-rounds?shopId=${net.shops.dune.id}`,
    );
    expect(own.status).toBe(200);
    await expectProblem(
      await as(net.auditor, roundsRoute.GET, `/api/audit-rounds?shopId=${net.shops.reef.id}`),
      404,
    );
    await expectProblem(
      await as(net.auditor, roundRoute.GET, `/api/audit-rounds/${reefRoundId}`, {
        id: reefRoundId,
      }),
      404,
    );
  });
});

describe('technician – sees their own figures, not colleagues’ money', () => {
  it('technician – gets only their own revenue row in the shop figures', async () => {
    const response = await as(
      net.techDune,
      metricsRoute.GET,
      `/api/shops/${net.shops.dune.id}/metrics?${PERIOD}`,
      { id: net.shops.dune.id },
    );
    expect(response.status).toBe(200);
    const body = (await response.json()) as {
      byTechnician: { key: string; revenueCents: number }[];
      ownTechnicianOnly: boolean;
      figures: { revenue: { revenueCents: number } };
    };
    // d1 (Theo's): 120.00 + 34.50; Tess's d2 never appears.
    expect(body.byTechnician).toEqual([
      expect.objectContaining({ key: String(net.techDune.id), revenueCents: 15450 }),
    ]);
    expect(body.ownTechnicianOnly).toBe(true);
    // The shop's own total stays: it is the shop's figure, not a colleague's.
    expect(body.figures.revenue.revenueCents).toBe(15450 + 8275);
  });

  it('technician – a colleague sees only theirs too', async () => {
    const response = await as(
      tess,
      metricsRoute.GET,
      `/api/shops/${net.shops.dune.id}/metrics?${PERIOD}`,
      {
        id: net.shops.dune.id,
      },
    );
    const body = (await response.json()) as {
      byTechnician: { key: string; revenueCents: number }[];
    };
    expect(body.byTechnician).toEqual([
      expect.objectContaining({ key: String(tess.id), revenueCents: 8275 }),
    ]);
  });

  it('shop lead – still sees every technician of the shop', async () => {
    const response = await as(
      net.leadDune,
      metricsRoute.GET,
      `/api/shops/${net.shops.dune.id}/metrics?${PERIOD}`,
      { id: net.shops.dune.id },
    );
    const body = (await response.json()) as {
      byTechnician: { key: string }[];
      ownTechnicianOnly: boolean;
    };
    expect(body.byTechnician.map((g) => g.key).sort()).toEqual(
      [String(net.techDune.id), String(tess.id)].sort(),
    );
    expect(body.ownTechnicianOnly).toBe(false);
  });
});

describe('shop filters – another shop or a missing one is a 404', () => {
  const filtered: { name: string; handler: Handler; path: (shop: number) => string }[] = [
    {
      name: 'corrective actions',
      handler: actionsRoute.GET,
      path: (s) => `/api/corrective-actions?shopId=${s}`,
    },
    {
      name: 'audit rounds',
      handler: roundsRoute.GET,
      path: (s) => `/api/audit-rounds?shopId=${s}`,
    },
    { name: 'comebacks', handler: comebacksRoute.GET, path: (s) => `/api/comebacks?shop=${s}` },
    { name: 'jobs', handler: jobsRoute.GET, path: (s) => `/api/jobs?shopId=${s}` },
  ];

  for (const f of filtered) {
    it(`regional manager – ${f.name}: own shop 200, another region's shop and a missing shop 404`, async () => {
      const own = await as(net.north, f.handler, f.path(net.shops.dune.id));
      expect(own.status).toBe(200);
      await expectProblem(await as(net.north, f.handler, f.path(net.shops.reef.id)), 404);
      await expectProblem(await as(net.north, f.handler, f.path(MISSING)), 404);
    });
  }

  it('shop lead – reminders: own shop 200, another shop and a missing shop 404', async () => {
    for (const path of ['/api/reminders/due?shop=', '/api/reminders/batches?shop=']) {
      const handler = path.includes('due') ? dueRoute.GET : batchesRoute.GET;
      expect((await as(net.leadDune, handler, `${path}${net.shops.dune.id}`)).status).toBe(200);
      await expectProblem(await as(net.leadDune, handler, `${path}${net.shops.reef.id}`), 404);
      await expectProblem(await as(net.leadDune, handler, `${path}${MISSING}`), 404);
    }
  });

  it('owner – a missing shop filter is a 404, an existing one 200', async () => {
    expect(
      (await listCorrectiveActions(net.owner, { shopId: net.shops.reef.id })).map((a) => a.id),
    ).toEqual([reefActionId]);
    await expect(listCorrectiveActions(net.owner, { shopId: MISSING })).rejects.toMatchObject({
      status: 404,
    });
    expect((await listRounds(net.owner, { shopId: net.shops.reef.id })).map((r) => r.id)).toEqual([
      reefRoundId,
    ]);
    await expect(listRounds(net.owner, { shopId: MISSING })).rejects.toMatchObject({ status: 404 });
  });

  it('every role – shopInScope answers alike for a shop outside the scope and a missing one', async () => {
    const cases: [Principal, number][] = [
      [net.north, net.shops.reef.id],
      [net.south, net.shops.dune.id],
      [net.leadDune, net.shops.formula.id],
      [net.techDune, net.shops.reef.id],
      [net.auditor, net.shops.reef.id],
    ];
    for (const [who, other] of cases) {
      const outside = await shopInScope(who, other).catch((e: unknown) => e);
      const missing = await shopInScope(who, MISSING).catch((e: unknown) => e);
      expect(outside, who.email).toMatchObject({
        status: 404,
        detail: (missing as Error & { detail: string }).detail,
      });
    }
    expect(await shopInScope(net.auditor, net.shops.dune.id)).toMatchObject({
      name: 'Dune Test Shop',
    });
  });
});

// Every GET route, with every role, for an object of their own, of another shop and a missing one:
// nothing leaves outside the caller's shops, and "other" answers exactly as "missing".
describe('sweep – every GET route × role × own, other and missing ids', () => {
  interface Target {
    shop: number;
    region: number;
    job: number;
    round: number;
    action: number;
    comeback: number;
  }
  const routes: {
    name: string;
    handler: Handler;
    call: (t: Target) => [string, Record<string, string | number>?];
  }[] = [
    { name: 'me', handler: meRoute.GET, call: () => ['/api/me'] },
    { name: 'shops', handler: shopsRoute.GET, call: () => ['/api/shops'] },
    { name: 'shop', handler: shopRoute.GET, call: (t) => [`/api/shops/${t.shop}`, { id: t.shop }] },
    {
      name: 'shop metrics',
      handler: metricsRoute.GET,
      call: (t) => [`/api/shops/${t.shop}/metrics?${PERIOD}`, { id: t.shop }],
    },
    {
      name: 'shop trends',
      handler: shopTrendsRoute.GET,
      call: (t) => [`/api/shops/${t.shop}/trends?${PERIOD}&metric=revenue`, { id: t.shop }],
    },
    {
      name: 'shop calendar',
      handler: calendarRoute.GET,
      call: (t) => [`/api/shops/${t.shop}/calendar`, { id: t.shop }],
    },
    {
      name: 'comparison',
      handler: comparisonRoute.GET,
      call: (t) => [`/api/network/comparison?${PERIOD}&region=${t.region}`],
    },
    {
      name: 'network trends',
      handler: networkTrendsRoute.GET,
      call: (t) => [`/api/network/trends?${PERIOD}&metric=revenue&region=${t.region}`],
    },
    { name: 'jobs', handler: jobsRoute.GET, call: (t) => [`/api/jobs?shopId=${t.shop}`] },
    { name: 'job', handler: jobRoute.GET, call: (t) => [`/api/jobs/${t.job}`, { id: t.job }] },
    {
      name: 'comeback-of',
      handler: comebackOfRoute.GET,
      call: (t) => [`/api/jobs/${t.job}/comeback-of`, { id: t.job }],
    },
    {
      name: 'customers',
      handler: customersRoute.GET,
      call: () => ['/api/customers?query=Customer'],
    },
    {
      name: 'comebacks',
      handler: comebacksRoute.GET,
      call: (t) => [`/api/comebacks?shop=${t.shop}`],
    },
    {
      name: 'comeback',
      handler: comebackRoute.GET,
      call: (t) => [`/api/comebacks/${t.comeback}`, { id: t.comeback }],
    },
    {
      name: 'corrective actions',
      handler: actionsRoute.GET,
      call: (t) => [`/api/corrective-actions?shopId=${t.shop}`],
    },
    {
      name: 'corrective action',
      handler: actionRoute.GET,
      call: (t) => [`/api/corrective-actions/${t.action}`, { id: t.action }],
    },
    {
      name: 'rounds',
      handler: roundsRoute.GET,
      call: (t) => [`/api/audit-rounds?shopId=${t.shop}`],
    },
    {
      name: 'round',
      handler: roundRoute.GET,
      call: (t) => [`/api/audit-rounds/${t.round}`, { id: t.round }],
    },
    {
      name: 'round sample',
      handler: sampleRoute.GET,
      call: (t) => [`/api/audit-rounds/${t.round}/samples/${t.job}`, { id: t.round, jobId: t.job }],
    },
    {
      name: 'round preview',
      handler: previewRoute.GET,
      call: (t) => [`/api/audit-rounds/preview?shopId=${t.shop}&${PERIOD}`],
    },
    { name: 'audit forms', handler: auditFormsRoute.GET, call: () => ['/api/audit-forms'] },
    {
      name: 'month close',
      handler: monthRoute.GET,
      call: () => ['/api/month-close/2026-11', { month: '2026-11' }],
    },
    {
      name: 'due reminders',
      handler: dueRoute.GET,
      call: (t) => [`/api/reminders/due?shop=${t.shop}`],
    },
    {
      name: 'reminder batches',
      handler: batchesRoute.GET,
      call: (t) => [`/api/reminders/batches?shop=${t.shop}`],
    },
    {
      name: 'reminder batch',
      handler: batchRoute.GET,
      call: () => [`/api/reminders/batches/${MISSING}`, { id: MISSING }],
    },
    { name: 'imports', handler: importsRoute.GET, call: () => ['/api/imports/jobs'] },
    {
      name: 'import template',
      handler: importTemplateRoute.GET,
      call: () => ['/api/imports/jobs/template'],
    },
    { name: 'users', handler: usersRoute.GET, call: () => ['/api/users'] },
    {
      name: 'comeback settings',
      handler: comebackSettingsRoute.GET,
      call: () => ['/api/settings/comebacks'],
    },
  ];

  const dune = (): Target => ({
    shop: net.shops.dune.id,
    region: net.regions.north.id,
    job: net.jobs.d1.id,
    round: duneRoundId,
    action: duneActionId,
    comeback: duneComebackId,
  });
  const reef = (): Target => ({
    shop: net.shops.reef.id,
    region: net.regions.south.id,
    job: reefJobId,
    round: reefRoundId,
    action: reefActionId,
    comeback: MISSING,
  });
  const missing: Target = {
    shop: MISSING,
    region: MISSING,
    job: MISSING,
    round: MISSING,
    action: MISSING,
    comeback: MISSING,
  };

  /** Every shop id a body mentions: `shopId`, `originalShopId` and the `id` of any `shop` object. */
  function shopIdsIn(value: unknown, out = new Set<number>()): Set<number> {
    if (Array.isArray(value)) for (const v of value) shopIdsIn(v, out);
    else if (value && typeof value === 'object') {
      for (const [key, v] of Object.entries(value)) {
        if ((key === 'shopId' || key === 'originalShopId') && typeof v === 'number') out.add(v);
        if (
          key === 'shop' &&
          v &&
          typeof v === 'object' &&
          typeof (v as { id?: unknown }).id === 'number'
        )
          out.add((v as { id: number }).id);
        shopIdsIn(v, out);
      }
    }
    return out;
  }

  const callers = () => [
    {
      who: net.owner,
      mine: [net.shops.dune.id, net.shops.formula.id, net.shops.reef.id],
      own: dune(),
      other: null,
    },
    { who: net.north, mine: [net.shops.dune.id, net.shops.formula.id], own: dune(), other: reef() },
    { who: net.south, mine: [net.shops.reef.id], own: reef(), other: dune() },
    { who: net.leadDune, mine: [net.shops.dune.id], own: dune(), other: reef() },
    { who: net.techDune, mine: [net.shops.dune.id], own: dune(), other: reef() },
    {
      who: net.principal('lead.reef@t.test'),
      mine: [net.shops.reef.id],
      own: reef(),
      other: dune(),
    },
    { who: net.auditor, mine: [net.shops.dune.id], own: dune(), other: reef() },
  ];

  it('every role – no 5xx, other-shop answers as missing, and 200s name only the caller’s shops', async () => {
    const failures: string[] = [];
    for (const c of callers()) {
      for (const r of routes) {
        const run = async (t: Target) => {
          const [path, params] = r.call(t);
          const response = await as(c.who, r.handler, path, params ?? {});
          const type = response.headers.get('content-type') ?? '';
          const body: unknown = type.includes('json')
            ? await response.json()
            : await response.text();
          return { path, status: response.status, body, type };
        };
        const own = await run(c.own);
        const miss = await run(missing);
        const label = `${c.who.email} ${r.name}`;
        for (const res of [own, miss]) {
          if (res.status >= 500) failures.push(`${label} ${res.path}: ${res.status}`);
          if (res.status >= 400 && !res.type.includes('application/problem+json'))
            failures.push(`${label} ${res.path}: ${res.status} not problem+json`);
        }
        // A missing shop, region or object named in the path or a filter never answers 200.
        if (miss.status === 200 && miss.path.includes(String(MISSING)))
          failures.push(`${label} ${miss.path}: 200 for a missing id`);
        if (own.status === 200) {
          const outside = [...shopIdsIn(own.body)].filter((id) => !c.mine.includes(id));
          if (outside.length)
            failures.push(`${label} ${own.path}: names shops ${outside.join(',')}`);
          if (c.who.role === 'technician' && own.body && typeof own.body === 'object') {
            const rows = (own.body as { byTechnician?: { key: string }[] | null }).byTechnician;
            if (rows?.some((g) => g.key !== String(c.who.id)))
              failures.push(`${label} ${own.path}: a colleague's revenue row`);
          }
        }
        if (c.other) {
          const other = await run(c.other);
          if (other.status >= 500) failures.push(`${label} ${other.path}: ${other.status}`);
          if (other.status === 200) {
            const outside = [...shopIdsIn(other.body)].filter((id) => !c.mine.includes(id));
            if (outside.length)
              failures.push(`${label} ${other.path}: names shops ${outside.join(',')}`);
          }
          // An id outside the caller's shops answers exactly as one that does not exist.
          if (other.status !== miss.status)
            failures.push(`${label}: other ${other.status} ≠ missing ${miss.status}`);
        }
      }
    }
    expect(failures).toEqual([]);
  });
});
