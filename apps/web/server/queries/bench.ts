import {
  and,
  asc,
  desc,
  eq,
  gte,
  ilike,
  inArray,
  isNotNull,
  lt,
  or,
  sql,
  type SQL,
  type Tx,
} from '@reelwright/db';
import {
  benchSessions,
  checklistTicks,
  customers,
  jobs,
  partLines,
  reels,
  servicePrices,
  serviceStandardSteps,
  serviceStandards,
  shops,
  users,
  type Job,
} from '@reelwright/db/schema';
import type { JobState } from '~/lib/labels';
import { NEXT_STATES, OPEN_STATES, type JobListQuery } from '~/lib/validators/jobs';
import {
  atLocal,
  localDate,
  nextDate,
  shopCalendar,
  suggestPromise,
  type PromiseSuggestion,
} from '../bench/calendar';
import { benchChargeCents, jobScope } from '../bench/shared';
import { db } from '../db';
import { notFound } from '../errors';
import type { Principal } from '../principal';
import { jobBenchSessions, jobTimeline } from './job-history';
import { shopFilter, shopScope } from './scope';
import * as clock from '~/server/clock';

const DAY = 86_400_000;

export interface JobListRow {
  id: number;
  state: JobState;
  serviceType: Job['serviceType'];
  checkedInAt: Date;
  promisedAt: Date | null;
  stateChangedAt: Date;
  readyAt: Date | null;
  customerName: string;
  reel: string;
  technicianName: string | null;
  shopId: number;
  shopName: string;
  timeZone: string;
  totalCents: number;
  /** Whole days since check-in, for jobs not yet collected. */
  ageDays: number | null;
  /** Whole days in the current state, for jobs not yet collected. */
  daysInState: number | null;
  /** Not ready yet and past the promised time. */
  late: boolean;
}

/**
 * Matching jobs are counted up to this many; beyond it the list says "more than" (`totalExact`
 * false). Counting every row of a shop with years of history costs the database tens of
 * milliseconds a request, paid again on every refresh of the bench.
 */
export const LIST_COUNT_CAP = 10_000;

export interface JobList {
  jobs: JobListRow[];
  /** Matching jobs, at most `LIST_COUNT_CAP`. */
  total: number;
  /** False when more than `LIST_COUNT_CAP` jobs match. */
  totalExact: boolean;
  page: number;
  pageSize: number;
  asOf: Date;
}

function escapeLike(s: string) {
  return s.replace(/[\\%_]/g, (c) => `\\${c}`);
}

interface ScopeShop {
  id: number;
  timeZone: string;
}

interface SearchMatches {
  customerIds: number[];
  reelIds: number[];
  jobId?: number;
}

/**
 * Customers (name, e-mail, phone digits) and reels (maker and model) matching the search, found
 * first in their own tables (thousands of rows, not the jobs) so the jobs are then reached by
 * index. Not limited to the customers' home shops: a customer of one shop may bring a reel to
 * another; the jobs query keeps to the caller's shops.
 */
async function searchMatches(conn: Pick<Tx, 'select'>, text: string): Promise<SearchMatches> {
  const like = `%${escapeLike(text)}%`;
  const digits = text.replace(/\D/g, '');
  const customerMatch: SQL[] = [ilike(customers.name, like), ilike(customers.email, like)];
  if (digits.length >= 3)
    customerMatch.push(
      sql`regexp_replace(${customers.phone}, '[^0-9]', '', 'g') like ${`%${digits}%`}`,
    );
  const [c, r] = await Promise.all([
    conn
      .select({ id: customers.id })
      .from(customers)
      .where(or(...customerMatch)),
    conn
      .select({ id: reels.id })
      .from(reels)
      .where(ilike(sql`${reels.maker} || ' ' || ${reels.model}`, like)),
  ]);
  return {
    customerIds: c.map((x) => x.id),
    reelIds: r.map((x) => x.id),
    jobId: /^\d{1,9}$/.test(text) ? Number(text) : undefined,
  };
}

function listConditions(
  shopIds: number[] | null,
  q: JobListQuery,
  now: Date,
  zones: ScopeShop[],
  search: SearchMatches | null,
) {
  const conditions: (SQL | undefined)[] = [];
  if (shopIds !== null) conditions.push(inArray(jobs.shopId, shopIds));
  if (q.state?.length) conditions.push(inArray(jobs.state, q.state));
  if (q.technicianId !== undefined) conditions.push(eq(jobs.technicianId, q.technicianId));
  if (q.service) conditions.push(eq(jobs.serviceType, q.service));
  if (q.from || q.to) {
    // Local dates are each shop's own: one instant range per time zone, so the
    // (shop, checked-in) index still applies.
    const byZone = new Map<string, number[]>();
    for (const s of zones) byZone.set(s.timeZone, [...(byZone.get(s.timeZone) ?? []), s.id]);
    const ranges = [...byZone].map(([zone, ids]) =>
      and(
        inArray(jobs.shopId, ids),
        q.from ? gte(jobs.checkedInAt, atLocal(q.from, '00:00', zone)) : undefined,
        q.to ? lt(jobs.checkedInAt, atLocal(nextDate(q.to), '00:00', zone)) : undefined,
      ),
    );
    conditions.push(ranges.length > 0 ? or(...ranges) : sql`false`);
  }
  if (q.waitingDays !== undefined) {
    conditions.push(inArray(jobs.state, [...OPEN_STATES]));
    conditions.push(lt(jobs.stateChangedAt, new Date(now.getTime() - q.waitingDays * DAY)));
  }
  if (q.q && /^#\d{1,9}$/.test(q.q)) {
    // "#123" asks for a job number and nothing else.
    conditions.push(eq(jobs.id, Number(q.q.slice(1))));
  } else if (search) {
    const matching: SQL[] = [
      search.customerIds.length ? inArray(jobs.customerId, search.customerIds) : sql`false`,
      search.reelIds.length ? inArray(jobs.reelId, search.reelIds) : sql`false`,
    ];
    if (search.jobId !== undefined) matching.push(eq(jobs.id, search.jobId));
    conditions.push(or(...matching));
  }
  return conditions;
}

/**
 * One page of the jobs in the caller's shops, filtered and sorted in the database (the list never
 * loads a shop's whole history), with the total count for paging.
 */
export async function listJobs(
  principal: Principal,
  q: JobListQuery,
  options: { now?: Date; countCap?: number } = {},
): Promise<JobList> {
  const now = options.now ?? clock.now();
  const cap = options.countCap ?? LIST_COUNT_CAP;
  const conn = await db();
  await shopFilter(principal, q.shopId, conn);
  const zones = await conn
    .select({ id: shops.id, timeZone: shops.timeZone })
    .from(shops)
    .where(and(shopScope(principal), q.shopId === undefined ? undefined : eq(shops.id, q.shopId)));
  const shopIds =
    q.shopId === undefined && principal.scope.kind === 'network' ? null : zones.map((s) => s.id);
  const search = q.q && !/^#\d{1,9}$/.test(q.q) ? await searchMatches(conn, q.q) : null;
  const where = and(...listConditions(shopIds, q, now, zones, search));
  const direction = q.dir === 'asc' ? asc : desc;
  const sortColumn = {
    checkedInAt: jobs.checkedInAt,
    promisedAt: jobs.promisedAt,
    stateChangedAt: jobs.stateChangedAt,
    customer: customers.name,
    id: jobs.id,
  }[q.sort];
  const nulls = q.sort === 'promisedAt' ? sql` nulls last` : sql``;
  const matching = conn
    .select({ one: sql`1`.as('one') })
    .from(jobs)
    .where(where)
    .limit(cap + 1)
    .as('matching');
  const [counted] = await conn.select({ n: sql<number>`count(*)`.mapWith(Number) }).from(matching);
  const matched = counted?.n ?? 0;
  const total = Math.min(matched, cap);
  // The page's ids come from the jobs table alone (customers joined only to sort by name), so
  // ordering and offset walk an index; the page's 25–100 rows are then joined for display.
  const idQuery = conn.select({ id: jobs.id }).from(jobs);
  const pageIds = (
    await (
      q.sort === 'customer'
        ? idQuery.innerJoin(customers, eq(customers.id, jobs.customerId))
        : idQuery
    )
      .where(where)
      .orderBy(sql`${direction(sortColumn)}${nulls}`, direction(jobs.id))
      .limit(q.pageSize)
      .offset((q.page - 1) * q.pageSize)
  ).map((r) => r.id);
  const found =
    pageIds.length === 0
      ? []
      : await conn
          .select({
            id: jobs.id,
            state: jobs.state,
            serviceType: jobs.serviceType,
            checkedInAt: jobs.checkedInAt,
            promisedAt: jobs.promisedAt,
            stateChangedAt: jobs.stateChangedAt,
            readyAt: jobs.readyAt,
            labourCents: jobs.labourCents,
            partsCents: jobs.partsCents,
            discountCents: jobs.discountCents,
            customerName: customers.name,
            maker: reels.maker,
            model: reels.model,
            size: reels.size,
            technicianName: users.name,
            shopId: shops.id,
            shopName: shops.name,
            timeZone: shops.timeZone,
          })
          .from(jobs)
          .innerJoin(shops, eq(shops.id, jobs.shopId))
          .innerJoin(customers, eq(customers.id, jobs.customerId))
          .innerJoin(reels, eq(reels.id, jobs.reelId))
          .leftJoin(users, eq(users.id, jobs.technicianId))
          .where(inArray(jobs.id, pageIds));
  const byId = new Map(found.map((r) => [r.id, r]));
  const rows = pageIds.map((id) => byId.get(id)!);
  const days = (from: Date) => Math.max(0, Math.floor((now.getTime() - from.getTime()) / DAY));
  return {
    total,
    totalExact: matched <= cap,
    page: q.page,
    pageSize: q.pageSize,
    asOf: now,
    jobs: rows.map((r) => {
      const open = r.state !== 'collected';
      return {
        id: r.id,
        state: r.state,
        serviceType: r.serviceType,
        checkedInAt: r.checkedInAt,
        promisedAt: r.promisedAt,
        stateChangedAt: r.stateChangedAt,
        readyAt: r.readyAt,
        customerName: r.customerName,
        reel: [r.maker, r.model, r.size].filter(Boolean).join(' '),
        technicianName: r.technicianName,
        shopId: r.shopId,
        shopName: r.shopName,
        timeZone: r.timeZone,
        totalCents: r.labourCents + r.partsCents - r.discountCents,
        ageDays: open ? days(r.checkedInAt) : null,
        daysInState: open ? days(r.stateChangedAt) : null,
        late:
          r.readyAt === null &&
          r.promisedAt !== null &&
          r.promisedAt.getTime() < now.getTime() &&
          open,
      };
    }),
  };
}

export interface BenchPerson {
  id: number;
  name: string;
  role: 'technician' | 'shop_lead';
  shopId: number;
}

/** What the list's filters offer: the shops in scope and the people who work their benches. */
export async function benchListOptions(principal: Principal) {
  const conn = await db();
  const shopRows = await conn
    .select({ id: shops.id, name: shops.name, timeZone: shops.timeZone })
    .from(shops)
    .where(shopScope(principal))
    .orderBy(asc(shops.name));
  const people = await benchPeople(shopRows.map((s) => s.id));
  return { shops: shopRows, technicians: people };
}

async function benchPeople(shopIds: number[]): Promise<BenchPerson[]> {
  if (shopIds.length === 0) return [];
  const conn = await db();
  const rows = await conn
    .select({ id: users.id, name: users.name, role: users.role, shopId: users.shopId })
    .from(users)
    .where(
      and(
        inArray(users.shopId, shopIds),
        inArray(users.role, ['technician', 'shop_lead']),
        eq(users.active, true),
      ),
    )
    .orderBy(asc(users.name));
  return rows.map((r) => ({
    id: r.id,
    name: r.name,
    role: r.role as BenchPerson['role'],
    shopId: r.shopId!,
  }));
}

export interface ChecklistStep {
  id: number;
  code: string;
  title: string;
  instructions: string | null;
  safetyCaution: string | null;
  required: boolean;
  ticked: boolean;
  tickedAt: Date | null;
  tickedBy: string | null;
}

export interface JobDetail {
  id: number;
  state: JobState;
  serviceType: Job['serviceType'];
  checkedInAt: Date;
  promisedAt: Date | null;
  promisedOn: string | null;
  stateChangedAt: Date;
  readyAt: Date | null;
  collectedAt: Date | null;
  complaint: string | null;
  condition: string | null;
  findings: string | null;
  incompleteChecklistReason: string | null;
  comebackOfJobId: number | null;
  shop: { id: number; name: string; timeZone: string; labourRateCents: number };
  customer: {
    id: number;
    name: string;
    phone: string | null;
    email: string | null;
    reminderConsent: boolean;
  };
  reel: {
    id: number;
    kind: string;
    maker: string;
    model: string;
    size: string | null;
    bearingCount: number | null;
    gearRatio: string | null;
    useProfile: string;
    water: string;
    lastServicedOn: string | null;
  };
  technician: { id: number; name: string } | null;
  technicians: BenchPerson[];
  money: {
    labourCents: number;
    partsCents: number;
    discountCents: number;
    totalCents: number;
    flatPriceCents: number | null;
    benchChargeCents: number;
    /** What the labour charge matches now: bench time, the flat price, or neither. */
    labourBasis: 'bench_time' | 'flat_price' | 'other';
  };
  /** Logged minutes (stopped timers and manual entries). */
  benchMinutes: number;
  turnaround: {
    customerMinutes: number;
    benchMinutes: number;
    waitingPartsMinutes: number;
  } | null;
  nextStates: JobState[];
  events: {
    id: number;
    fromState: JobState | null;
    toState: JobState;
    at: Date;
    userName: string | null;
    note: string | null;
  }[];
  sessions: {
    id: number;
    technicianId: number;
    technicianName: string;
    startedAt: Date | null;
    endedAt: Date | null;
    minutes: number | null;
    note: string | null;
    createdAt: Date;
  }[];
  /** The caller's own running timer on this job. */
  myRunningSince: Date | null;
  /** Where the caller's timer is running, when it is on another job. */
  myTimerElsewhere: number | null;
  parts: {
    id: number;
    name: string;
    partNumber: string | null;
    quantity: number;
    unitPriceCents: number;
    lineCents: number;
  }[];
  checklist: {
    standard: { id: number; version: number; title: string; safetyNotice: string | null } | null;
    groups: { group: string; steps: ChecklistStep[] }[];
    requiredUnticked: number;
    ticked: number;
    applicable: number;
  };
}

/** Steps of a standard that apply to a reel kind, in the standard's order. */
export async function applicableSteps(
  standardId: number | null,
  kind: string,
  conn: Pick<Tx, 'select'>,
) {
  if (standardId === null) return [];
  const steps = await conn
    .select()
    .from(serviceStandardSteps)
    .where(eq(serviceStandardSteps.standardId, standardId))
    .orderBy(asc(serviceStandardSteps.position));
  return steps.filter((s) => !s.appliesTo || s.appliesTo.includes(kind as never));
}

/** The job with everything the job page shows; 404 outside the caller's shops. */
export async function getJobDetail(principal: Principal, id: number): Promise<JobDetail> {
  const conn = await db();
  const [row] = await conn
    .select({ job: jobs, shop: shops, customer: customers, reel: reels })
    .from(jobs)
    .innerJoin(shops, eq(shops.id, jobs.shopId))
    .innerJoin(customers, eq(customers.id, jobs.customerId))
    .innerJoin(reels, eq(reels.id, jobs.reelId))
    .where(and(eq(jobs.id, id), jobScope(principal)));
  if (!row) throw notFound('job');
  const { job, shop, customer, reel } = row;

  const [events, sessions, parts, ticks, steps, standard, price, people, myTimer] =
    await Promise.all([
      jobTimeline(conn, id),
      jobBenchSessions(conn, id),
      conn
        .select()
        .from(partLines)
        .where(eq(partLines.jobId, id))
        .orderBy(asc(partLines.createdAt), asc(partLines.id)),
      conn
        .select({
          stepId: checklistTicks.stepId,
          tickedAt: checklistTicks.tickedAt,
          userName: users.name,
        })
        .from(checklistTicks)
        .leftJoin(users, eq(users.id, checklistTicks.userId))
        .where(eq(checklistTicks.jobId, id)),
      applicableSteps(job.serviceStandardId, reel.kind, conn),
      job.serviceStandardId === null
        ? Promise.resolve([])
        : conn
            .select()
            .from(serviceStandards)
            .where(eq(serviceStandards.id, job.serviceStandardId)),
      conn
        .select({ cents: servicePrices.flatPriceCents })
        .from(servicePrices)
        .where(
          and(eq(servicePrices.shopId, shop.id), eq(servicePrices.serviceType, job.serviceType)),
        ),
      benchPeople([shop.id]),
      conn
        .select({ jobId: benchSessions.jobId, startedAt: benchSessions.startedAt })
        .from(benchSessions)
        .where(
          and(
            eq(benchSessions.technicianId, principal.id),
            isNotNull(benchSessions.startedAt),
            sql`${benchSessions.endedAt} is null`,
          ),
        ),
    ]);

  const tickByStep = new Map(ticks.map((t) => [t.stepId, t]));
  const groups: JobDetail['checklist']['groups'] = [];
  let requiredUnticked = 0;
  for (const step of steps) {
    const tick = tickByStep.get(step.id);
    if (step.required && !tick) requiredUnticked++;
    let group = groups[groups.length - 1];
    if (!group || group.group !== step.group) {
      group = { group: step.group, steps: [] };
      groups.push(group);
    }
    group.steps.push({
      id: step.id,
      code: step.code,
      title: step.title,
      instructions: step.instructions,
      safetyCaution: step.safetyCaution,
      required: step.required,
      ticked: !!tick,
      tickedAt: tick?.tickedAt ?? null,
      tickedBy: tick?.userName ?? null,
    });
  }

  const flatPriceCents = price[0]?.cents ?? null;
  const logged = job.benchMinutes ?? 0;
  const benchCharge = benchChargeCents(logged, shop.labourRateCents);
  const technician = job.technicianId
    ? (people.find((p) => p.id === job.technicianId) ??
      (await conn
        .select({ id: users.id, name: users.name })
        .from(users)
        .where(eq(users.id, job.technicianId))
        .then((r) => r[0] ?? null)))
    : null;
  const running = myTimer[0];
  const std = standard[0];

  return {
    id: job.id,
    state: job.state,
    serviceType: job.serviceType,
    checkedInAt: job.checkedInAt,
    promisedAt: job.promisedAt,
    promisedOn: job.promisedAt ? localDate(job.promisedAt, shop.timeZone) : null,
    stateChangedAt: job.stateChangedAt,
    readyAt: job.readyAt,
    collectedAt: job.collectedAt,
    complaint: job.complaint,
    condition: job.condition,
    findings: job.findings,
    incompleteChecklistReason: job.incompleteChecklistReason,
    comebackOfJobId: job.comebackOfJobId,
    shop: {
      id: shop.id,
      name: shop.name,
      timeZone: shop.timeZone,
      labourRateCents: shop.labourRateCents,
    },
    customer: {
      id: customer.id,
      name: customer.name,
      phone: customer.phone,
      email: customer.email,
      reminderConsent: customer.reminderConsent,
    },
    reel: {
      id: reel.id,
      kind: reel.kind,
      maker: reel.maker,
      model: reel.model,
      size: reel.size,
      bearingCount: reel.bearingCount,
      gearRatio: reel.gearRatio,
      useProfile: reel.useProfile,
      water: reel.water,
      lastServicedOn: reel.lastServicedOn,
    },
    technician: technician ? { id: technician.id, name: technician.name } : null,
    technicians: people,
    money: {
      labourCents: job.labourCents,
      partsCents: job.partsCents,
      discountCents: job.discountCents,
      totalCents: job.labourCents + job.partsCents - job.discountCents,
      flatPriceCents,
      benchChargeCents: benchCharge,
      labourBasis:
        flatPriceCents !== null && job.labourCents === flatPriceCents
          ? 'flat_price'
          : job.labourCents === benchCharge
            ? 'bench_time'
            : 'other',
    },
    benchMinutes: logged,
    turnaround:
      job.customerTurnaroundMinutes === null
        ? null
        : {
            customerMinutes: job.customerTurnaroundMinutes,
            benchMinutes: job.benchTurnaroundMinutes ?? 0,
            waitingPartsMinutes: job.waitingPartsMinutes ?? 0,
          },
    nextStates: [...NEXT_STATES[job.state]],
    events,
    sessions: sessions.map((s) => ({ ...s })),
    myRunningSince: running && running.jobId === id ? running.startedAt : null,
    myTimerElsewhere: running && running.jobId !== id ? running.jobId : null,
    parts: parts.map((p) => ({
      id: p.id,
      name: p.name,
      partNumber: p.partNumber,
      quantity: p.quantity,
      unitPriceCents: p.unitPriceCents,
      lineCents: p.quantity * p.unitPriceCents,
    })),
    checklist: {
      standard: std
        ? { id: std.id, version: std.version, title: std.title, safetyNotice: std.safetyNotice }
        : null,
      groups,
      requiredUnticked,
      ticked: steps.filter((s) => tickByStep.has(s.id)).length,
      applicable: steps.length,
    },
  };
}

export interface CustomerMatch {
  id: number;
  name: string;
  phone: string | null;
  email: string | null;
  reminderConsent: boolean;
  shopName: string;
  reels: {
    id: number;
    kind: string;
    maker: string;
    model: string;
    size: string | null;
    bearingCount: number | null;
    gearRatio: string | null;
    useProfile: string;
    water: string;
    lastServicedOn: string | null;
  }[];
}

/** Customers of the caller's shops whose name, phone or e-mail matches, with their reels. */
export async function searchCustomers(
  principal: Principal,
  query: string,
  limit = 12,
): Promise<CustomerMatch[]> {
  const conn = await db();
  const like = `%${escapeLike(query)}%`;
  const digits = query.replace(/\D/g, '');
  const matches: SQL[] = [ilike(customers.name, like), ilike(customers.email, like)];
  if (digits.length >= 3)
    matches.push(sql`regexp_replace(${customers.phone}, '[^0-9]', '', 'g') like ${`%${digits}%`}`);
  const found = await conn
    .select({
      id: customers.id,
      name: customers.name,
      phone: customers.phone,
      email: customers.email,
      reminderConsent: customers.reminderConsent,
      shopName: shops.name,
    })
    .from(customers)
    .innerJoin(shops, eq(shops.id, customers.shopId))
    .where(and(shopScope(principal), or(...matches)))
    .orderBy(asc(customers.name), asc(customers.id))
    .limit(limit);
  if (found.length === 0) return [];
  const reelRows = await conn
    .select()
    .from(reels)
    .where(
      inArray(
        reels.customerId,
        found.map((c) => c.id),
      ),
    )
    .orderBy(asc(reels.id));
  return found.map((c) => ({
    ...c,
    reels: reelRows
      .filter((r) => r.customerId === c.id)
      .map((r) => ({
        id: r.id,
        kind: r.kind,
        maker: r.maker,
        model: r.model,
        size: r.size,
        bearingCount: r.bearingCount,
        gearRatio: r.gearRatio,
        useProfile: r.useProfile,
        water: r.water,
        lastServicedOn: r.lastServicedOn,
      })),
  }));
}

/** Bench turnaround minutes of the shop's jobs that became ready: the last 90 days, and the latest 200. */
async function turnaroundSample(shopId: number, now: Date) {
  const conn = await db();
  const since = new Date(now.getTime() - 90 * DAY);
  const base = and(
    eq(jobs.shopId, shopId),
    isNotNull(jobs.readyAt),
    isNotNull(jobs.benchTurnaroundMinutes),
    lt(jobs.readyAt, now),
  );
  const [recent, history] = await Promise.all([
    conn
      .select({ m: jobs.benchTurnaroundMinutes })
      .from(jobs)
      .where(and(base, gte(jobs.readyAt, since))),
    conn
      .select({ m: jobs.benchTurnaroundMinutes })
      .from(jobs)
      .where(base)
      .orderBy(desc(jobs.readyAt))
      .limit(200),
  ]);
  return { recent: recent.map((r) => r.m!), history: history.map((r) => r.m!) };
}

/** The promised date offered at check-in for the caller's shop (see `suggestPromise`). */
export async function promiseSuggestion(
  principal: Principal,
  shopId: number,
  options: { now?: Date } = {},
): Promise<PromiseSuggestion & { today: string; timeZone: string }> {
  const now = options.now ?? clock.now();
  const conn = await db();
  const [shop] = await conn
    .select()
    .from(shops)
    .where(and(eq(shops.id, shopId), shopScope(principal)));
  if (!shop) throw notFound('shop');
  const calendar = shopCalendar(shop);
  const suggestion = suggestPromise(calendar, await turnaroundSample(shopId, now), now);
  return { ...suggestion, today: localDate(now, shop.timeZone), timeZone: shop.timeZone };
}
