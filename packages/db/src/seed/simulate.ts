import { createHash } from 'node:crypto';
import { jobTurnaround, type ShopCalendar } from '@reelwright/metrics';
import type {
  ComebackAttribution,
  ComebackDisposition,
  JobState,
  ReelKind,
  ServiceType,
} from '../schema/enums';
import {
  addBusinessMinutes,
  buildTimeline,
  localDate,
  monthAt,
  nextOpen,
  placeWork,
  type OpenTimeline,
} from './calendar';
import {
  AUDIT_ITEMS,
  COMPLAINTS,
  CONDITIONS,
  FINDINGS,
  FIRST_NAMES,
  LAST_NAMES,
  PARTS,
  REEL_MODELS,
  RETURN_SYMPTOMS,
  ROOT_CAUSES,
  SAFETY_NOTICE,
  STANDARD_STEPS,
  type PartDef,
  type StepDef,
} from './catalog';
import {
  FORMER,
  holidays,
  INVITED,
  NETWORK_NAME,
  PEOPLE,
  REGIONS,
  SHOPS,
  type ShopDef,
} from './network';
import { Rng } from './random';

const MINUTE = 60_000;
const DAY = 86_400_000;

export interface GenerateOptions {
  seed: string;
  years: number;
  now: Date;
  passwordHash: string;
}

// Row shapes mirror the tables' insert types with explicit ids (see index.ts for the insert).
type Row = Record<string, unknown>;

export interface SeedData {
  regions: Row[];
  shops: Row[];
  servicePrices: Row[];
  users: Row[];
  accountLinks: Row[];
  rootCauses: Row[];
  serviceStandards: Row[];
  serviceStandardSteps: Row[];
  auditForms: Row[];
  auditFormItems: Row[];
  networkSettings: Row[];
  customers: Row[];
  reels: Row[];
  jobs: Row[];
  jobEvents: Row[];
  benchSessions: Row[];
  partLines: Row[];
  checklistTicks: Row[];
  comebacks: Row[];
}

interface ShopCtx {
  id: number;
  index: number;
  def: ShopDef;
  regionId: number;
  calendar: ShopCalendar;
  timeline: OpenTimeline;
  leadId: number;
  staffIds: number[];
  /** Technicians with their share of bench work. */
  benchStaff: { id: number; weight: number }[];
  reels: SimReel[];
  customers: SimCustomer[];
  /** Ternhollow's steady comeback quota (error diffusion keeps every quarter near the rate). */
  quotaCredit: number;
}

interface SimCustomer {
  id: number;
  shopId: number;
  name: string;
  firstAt: number;
}

interface SimReel {
  id: number;
  customer: SimCustomer;
  kind: ReelKind;
  heavy: boolean;
  /** Collection of its latest job; Infinity while a job is open or never collected. */
  freeFrom: number;
  lastReadyAt: number | null;
  lastReadyZone: string;
}

interface SimEvent {
  from: JobState | null;
  to: JobState;
  at: number;
  userId: number;
}

interface SimSession {
  start: number | null;
  end: number | null;
  minutes: number;
}

interface SimJob {
  seq: number;
  id: number;
  shop: ShopCtx;
  reel: SimReel;
  serviceType: ServiceType;
  technicianId: number;
  checkedInAt: number;
  promisedAt: number;
  events: SimEvent[];
  sessions: SimSession[];
  /** Ready and collection times, possibly after `now`. */
  readyAt: number;
  collectedAt: number | null;
  parts: { part: PartDef; quantity: number; at: number }[];
  skipped: Set<string>;
  skipReason: string | null;
  complaint: string;
  condition: string;
  findings: string;
  discountCents: number;
  comeback?: SimComeback;
}

interface SimComeback {
  original: SimJob;
  counted: boolean;
  detectedAt: number;
}

const SERVICE_MIX: { type: ServiceType; weight: number }[] = [
  { type: 'tune_up', weight: 46 },
  { type: 'overhaul', weight: 24 },
  { type: 'repair', weight: 21 },
  { type: 'parts_install', weight: 9 },
];
const BENCH_MEDIAN: Record<ServiceType, number> = {
  tune_up: 48,
  overhaul: 105,
  repair: 70,
  parts_install: 28,
};
const PROMISE_DAYS: Record<ServiceType, number> = {
  tune_up: 1.5,
  overhaul: 3,
  repair: 3,
  parts_install: 1,
};
const WAIT_CHANCE: Record<ServiceType, number> = {
  tune_up: 0.05,
  overhaul: 0.26,
  repair: 0.32,
  parts_install: 0.4,
};
const SKIP_REASONS = [
  'Drag felt smooth at check-in; left as is.',
  'Customer waiting at the counter.',
  'Saturday rush.',
  'Drag washers looked fine.',
];
const DISMISS_REASONS = [
  'Not the same fault.',
  'Not our work: the reel was opened elsewhere since.',
  'Not the same fault: new damage from a drop.',
];
const UNCOUNTED_CHANCE = 0.012;
/** Median days from collection to the return of a reel whose drag stack was not serviced. */
const DRAG_RETURN_DAYS = 5;
/** Chance that a reel whose drag stack was skipped comes back for workmanship… */
const DRAG_COMEBACK_CHANCE = 0.19;
/**
 * …and for those collected in the last three months before "now": Brackwater Flats' new
 * technician skips the drag stack on the heavy reels too, so its latest months are out of line
 * on their own, not only over a year.
 */
const DRAG_COMEBACK_CHANCE_RECENT = 0.3;
const RECENT_MS = 91 * DAY;

function clamp(x: number, lo: number, hi: number): number {
  return Math.min(hi, Math.max(lo, x));
}

function phone(rng: Rng, area: number): string {
  return `(${area}) 555-01${String(rng.int(0, 99)).padStart(2, '0')}`;
}

export function generate(options: GenerateOptions): SeedData {
  const rng = new Rng(options.seed);
  const nowMs = options.now.getTime();
  const startMs = nowMs - Math.round(options.years * 365.25 * DAY);
  const setupAt = new Date(startMs - 60 * DAY);
  const firstYear = new Date(startMs).getUTCFullYear();
  const lastYear = new Date(nowMs).getUTCFullYear() + 2;

  const data: SeedData = {
    regions: [],
    shops: [],
    servicePrices: [],
    users: [],
    accountLinks: [],
    rootCauses: [],
    serviceStandards: [],
    serviceStandardSteps: [],
    auditForms: [],
    auditFormItems: [],
    networkSettings: [],
    customers: [],
    reels: [],
    jobs: [],
    jobEvents: [],
    benchSessions: [],
    partLines: [],
    checklistTicks: [],
    comebacks: [],
  };

  // ---- network, people, standards ----
  REGIONS.forEach((r, i) =>
    data.regions.push({ id: i + 1, name: r.name, code: r.code, createdAt: setupAt }),
  );
  const regionId = (code: string) => REGIONS.findIndex((r) => r.code === code) + 1;

  const shops: ShopCtx[] = SHOPS.map((def, index) => {
    const region = REGIONS.find((r) => r.code === def.region)!;
    const closed = new Set<string>();
    for (let y = firstYear; y <= lastYear; y++) {
      for (const d of holidays(y, def.longHolidays)) closed.add(d);
      for (const [m, d] of def.ownClosures) {
        closed.add(`${y}-${String(m).padStart(2, '0')}-${String(d).padStart(2, '0')}`);
      }
    }
    const closedDates = [...closed].sort();
    const calendar: ShopCalendar = {
      timeZone: region.timeZone,
      weekly: def.hours,
      closedDates,
    };
    const id = index + 1;
    data.shops.push({
      id,
      regionId: regionId(def.region),
      name: def.name,
      slug: def.slug,
      timeZone: region.timeZone,
      openingHours: def.hours,
      closedDates,
      labourRateCents: def.labourRateCents,
      royaltyRateBp: def.royaltyRateBp,
      seasonStart: def.seasonStart,
      seasonEnd: def.seasonEnd,
      email: `${def.key}@saltwick.test`,
      phone: phone(rng, def.region === 'north' ? 207 : 251),
      active: true,
      createdAt: setupAt,
    });
    const prices: [ServiceType, number | null][] = [
      ['tune_up', def.flatPrices.tune_up],
      ['overhaul', def.flatPrices.overhaul],
      ['repair', null],
      ['parts_install', def.flatPrices.parts_install],
    ];
    for (const [serviceType, flatPriceCents] of prices) {
      data.servicePrices.push({
        id: data.servicePrices.length + 1,
        shopId: id,
        serviceType,
        flatPriceCents,
      });
    }
    return {
      id,
      index,
      def,
      regionId: regionId(def.region),
      calendar,
      timeline: buildTimeline(calendar, startMs - 14 * DAY, nowMs + 420 * DAY),
      leadId: 0,
      staffIds: [],
      benchStaff: [],
      reels: [],
      customers: [],
      quotaCredit: 0.5,
    };
  });
  const shopBySlug = new Map(shops.map((s) => [s.def.slug, s]));

  PEOPLE.forEach((p, i) => {
    const id = i + 1;
    const shop = p.shop ? shopBySlug.get(p.shop) : undefined;
    data.users.push({
      id,
      email: p.email,
      name: p.name,
      passwordHash: options.passwordHash,
      role: p.role,
      shopId: shop?.id ?? null,
      regionId: p.region ? regionId(p.region) : null,
      isDemo: true,
      active: true,
      createdAt: setupAt,
    });
    if (shop) {
      shop.staffIds.push(id);
      if (p.role === 'shop_lead') shop.leadId = id;
    }
  });
  // Beside the bench staff, so the jobs do not change: someone invited who has not set a password
  // yet (their link was sent yesterday), and a technician who has left.
  const invitedId = PEOPLE.length + 1;
  data.users.push(
    {
      id: invitedId,
      email: INVITED.email,
      name: INVITED.name,
      passwordHash: null,
      role: 'technician',
      shopId: shopBySlug.get(INVITED.shop)!.id,
      regionId: null,
      isDemo: false,
      active: true,
      createdAt: new Date(nowMs - DAY),
    },
    {
      id: PEOPLE.length + 2,
      email: FORMER.email,
      name: FORMER.name,
      passwordHash: options.passwordHash,
      role: 'technician',
      shopId: shopBySlug.get(FORMER.shop)!.id,
      regionId: null,
      isDemo: false,
      active: false,
      createdAt: setupAt,
    },
  );
  data.accountLinks.push({
    id: 1,
    userId: invitedId,
    purpose: 'invitation',
    // Nobody holds the token: the owner resends the invitation to get a working link.
    tokenHash: createHash('sha256').update(`seed:${options.seed}:invitation`).digest('hex'),
    createdById: 1,
    createdAt: new Date(nowMs - DAY),
    expiresAt: new Date(nowMs + 6 * DAY),
  });
  for (const shop of shops) {
    const techs = shop.staffIds.filter((id) => id !== shop.leadId);
    const leadShare = techs.length >= 2 ? 0.2 : 0.4;
    shop.benchStaff = [
      { id: shop.leadId, weight: leadShare },
      ...techs.map((id) => ({ id, weight: (1 - leadShare) / techs.length })),
    ];
  }

  ROOT_CAUSES.forEach((c, i) =>
    data.rootCauses.push({
      id: i + 1,
      code: c.code,
      label: c.label,
      position: i + 1,
      active: true,
      createdAt: setupAt,
    }),
  );
  const rootCauseId = (code: string) => ROOT_CAUSES.findIndex((c) => c.code === code) + 1;

  const ownerId = 1;
  data.serviceStandards.push({
    id: 1,
    version: 1,
    title: 'Reel service standard, version 1',
    safetyNotice: SAFETY_NOTICE,
    publishedAt: setupAt,
    createdById: ownerId,
    createdAt: setupAt,
  });
  STANDARD_STEPS.forEach((s, i) =>
    data.serviceStandardSteps.push({
      id: i + 1,
      standardId: 1,
      group: s.group,
      position: i + 1,
      code: s.code,
      title: s.title,
      instructions: s.instructions,
      safetyCaution: s.safetyCaution ?? null,
      required: s.required,
      appliesTo: s.appliesTo ? [...s.appliesTo] : null,
    }),
  );
  const stepId = (code: string) => STANDARD_STEPS.findIndex((s) => s.code === code) + 1;
  const stepsByKind = new Map<ReelKind, StepDef[]>();
  const stepsFor = (kind: ReelKind): StepDef[] => {
    let steps = stepsByKind.get(kind);
    if (!steps) {
      steps = STANDARD_STEPS.filter((s) => !s.appliesTo || s.appliesTo.includes(kind));
      stepsByKind.set(kind, steps);
    }
    return steps;
  };
  const stepIds = new Map(STANDARD_STEPS.map((s, i) => [s.code, i + 1]));
  const requiredCodes = new Set(STANDARD_STEPS.filter((s) => s.required).map((s) => s.code));

  data.auditForms.push({
    id: 1,
    version: 1,
    title: 'Job audit form, version 1',
    publishedAt: setupAt,
    createdById: ownerId,
    createdAt: setupAt,
  });
  AUDIT_ITEMS.forEach((item, i) =>
    data.auditFormItems.push({ id: i + 1, formId: 1, position: i + 1, ...item }),
  );

  data.networkSettings.push({
    id: 1,
    networkName: NETWORK_NAME,
    warrantyDays: 90,
    countedAttributions: ['workmanship', 'part_failure'],
    reviewDeadlineDays: 7,
    defaultAql: 2.5,
    defaultInspectionLevel: 'II',
    auditPassMark: 85,
    correctiveActionDueDays: 14,
    currency: 'USD',
    updatedById: ownerId,
    updatedAt: setupAt,
  });

  // ---- customers and reels, created as jobs need them ----
  const newCustomer = (shop: ShopCtx, at: number): SimCustomer => {
    const first = rng.pick(FIRST_NAMES);
    const last = rng.pick(LAST_NAMES);
    const id = data.customers.length + 1;
    const hasEmail = rng.chance(0.72);
    data.customers.push({
      id,
      shopId: shop.id,
      name: `${first} ${last}`,
      phone: rng.chance(0.9) ? phone(rng, shop.def.region === 'north' ? 207 : 251) : null,
      email: hasEmail ? `${first}.${last}${id}@example.com`.toLowerCase() : null,
      reminderConsent: hasEmail && rng.chance(0.62),
      createdAt: new Date(at),
    });
    const customer = { id, shopId: shop.id, name: `${first} ${last}`, firstAt: at };
    shop.customers.push(customer);
    return customer;
  };

  const newReel = (shop: ShopCtx, customer: SimCustomer, at: number): SimReel => {
    const kinds = Object.entries(shop.def.kinds) as [ReelKind, number][];
    const kind = rng.weighted(kinds, ([, w]) => w)[0];
    const model = rng.pick(REEL_MODELS[kind]);
    const offshore = kind === 'conventional' || kind === 'lever_drag';
    const salt =
      kind === 'spincast'
        ? false
        : rng.chance(
            offshore
              ? Math.min(1, shop.def.saltShare + 0.2)
              : shop.def.saltShare * (kind === 'fly' ? 0.4 : 1),
          );
    const heavy = rng.chance(
      offshore ? Math.min(0.9, shop.def.heavyShare + 0.25) : shop.def.heavyShare,
    );
    const id = data.reels.length + 1;
    data.reels.push({
      id,
      customerId: customer.id,
      kind,
      maker: model.maker,
      model: model.model,
      size: rng.pick(model.sizes),
      bearingCount: rng.pick(model.bearings),
      gearRatio: rng.pick(model.ratios),
      useProfile: heavy ? 'heavy' : 'light',
      water: salt ? 'salt' : 'fresh',
      serialNumber: rng.chance(0.5)
        ? `${model.maker.replace(/[^A-Z]/g, '')}${rng.int(100000, 999999)}`
        : null,
      lastServicedOn: null,
      createdAt: new Date(at),
    });
    const reel: SimReel = {
      id,
      customer,
      kind,
      heavy,
      freeFrom: Number.POSITIVE_INFINITY,
      lastReadyAt: null,
      lastReadyZone: shop.calendar.timeZone,
    };
    shop.reels.push(reel);
    return reel;
  };

  const reelFor = (shop: ShopCtx, at: number): SimReel => {
    if (shop.reels.length > 0 && rng.chance(0.42)) {
      for (let tries = 0; tries < 10; tries++) {
        const reel = rng.pick(shop.reels);
        // A reel back inside the warranty window would be a comeback; base visits stay outside it.
        if (reel.freeFrom + 100 * DAY < at && (reel.heavy || rng.chance(0.5))) return reel;
      }
    }
    const customer =
      shop.customers.length > 0 && rng.chance(0.25)
        ? rng.pick(shop.customers)
        : newCustomer(shop, at);
    return newReel(shop, customer, at);
  };

  // ---- one job's whole life, whether or not it has happened by `now` ----
  let seq = 0;
  const simulateJob = (
    shop: ShopCtx,
    t0: number,
    reel: SimReel,
    serviceType: ServiceType,
    comeback?: SimComeback,
  ): SimJob => {
    const tl = shop.timeline;
    const month = monthAt(tl, t0);
    const load = shop.def.season[month - 1] ?? 1;
    const technicianId = rng.weighted(shop.benchStaff, (s) => s.weight).id;
    const counterId = rng.pick(shop.staffIds);
    const events: SimEvent[] = [{ from: null, to: 'checked_in', at: t0, userId: counterId }];
    const promiseDays = PROMISE_DAYS[serviceType] * (load > 1.5 ? 2.2 : load > 1.1 ? 1.4 : 1);
    const promisedAt = addBusinessMinutes(tl, t0, promiseDays * tl.minutesPerOpenDay);

    const queueMedian = comeback ? 90 : shop.def.queueMedian * load * load;
    const t1 = addBusinessMinutes(tl, t0, clamp(rng.logNormal(queueMedian, 0.6), 10, 6000));
    events.push({ from: 'checked_in', to: 'on_bench', at: t1, userId: technicianId });

    const bench = Math.round(clamp(rng.logNormal(BENCH_MEDIAN[serviceType], 0.3), 10, 400));
    const waits: number[] = [];
    if (rng.chance(Math.min(0.9, WAIT_CHANCE[serviceType] * shop.def.waitChance))) {
      waits.push(clamp(rng.logNormal(shop.def.waitMedian, 0.6), 60, 30_000));
      if (rng.chance(0.12))
        waits.push(clamp(rng.logNormal(shop.def.waitMedian * 0.6, 0.6), 60, 20_000));
    }
    // Work chunks separated by the waits: teardown and inspection come before the first one.
    const chunks: number[] = [];
    if (waits.length === 0) chunks.push(bench);
    else if (waits.length === 1) {
      const first = Math.max(5, Math.round(bench * 0.45));
      chunks.push(first, Math.max(5, bench - first));
    } else {
      const first = Math.max(5, Math.round(bench * 0.4));
      const second = Math.max(5, Math.round(bench * 0.2));
      chunks.push(first, second, Math.max(5, bench - first - second));
    }

    const sessions: SimSession[] = [];
    let at = t1;
    chunks.forEach((minutes, i) => {
      const parts =
        minutes > 60 && rng.chance(0.45)
          ? [Math.round(minutes * 0.5), minutes - Math.round(minutes * 0.5)]
          : [minutes];
      parts.forEach((m, j) => {
        if (j > 0) at = addBusinessMinutes(tl, at, rng.logNormal(80, 0.8));
        for (const [s, e] of placeWork(tl, at, m)) {
          sessions.push({ start: s, end: e, minutes: Math.round((e - s) / MINUTE) });
          at = e;
        }
      });
      const wait = waits[i];
      if (wait !== undefined) {
        events.push({ from: 'on_bench', to: 'waiting_parts', at, userId: technicianId });
        at = addBusinessMinutes(tl, at, wait);
        events.push({ from: 'waiting_parts', to: 'on_bench', at, userId: technicianId });
      }
    });
    const readyAt = addBusinessMinutes(tl, at, rng.int(5, 40));
    events.push({ from: 'on_bench', to: 'ready', at: readyAt, userId: technicianId });

    let collectedAt: number | null = null;
    if (!rng.chance(0.004)) {
      const delay = clamp(rng.logNormal(3, 0.9), 0.05, 60) * DAY;
      collectedAt = addBusinessMinutes(tl, nextOpen(tl, readyAt + delay), rng.int(0, 240));
      events.push({
        from: 'ready',
        to: 'collected',
        at: collectedAt,
        userId: rng.pick(shop.staffIds),
      });
    }

    // Timers left to one manual entry: common at the small shop, rare elsewhere.
    if (rng.chance(shop.def.slug === 'ternhollow-lake' ? 0.5 : 0.07)) {
      const total = sessions.reduce((n, s) => n + s.minutes, 0);
      sessions.length = 0;
      sessions.push({ start: null, end: null, minutes: total });
    }

    const candidates = PARTS.filter((p) => !p.kinds || p.kinds.includes(reel.kind));
    const partCount =
      serviceType === 'tune_up'
        ? rng.chance(0.25)
          ? 1
          : 0
        : serviceType === 'parts_install'
          ? rng.int(1, 2)
          : rng.chance(serviceType === 'repair' ? 0.9 : 0.8)
            ? rng.int(1, 3)
            : 0;
    const parts: SimJob['parts'] = [];
    const used = new Set<string>();
    for (let i = 0; i < Math.max(partCount, waits.length > 0 ? 1 : 0); i++) {
      const pool = i === 0 && waits.length > 0 ? candidates.filter((p) => p.special) : candidates;
      const part = rng.pick(pool.length > 0 ? pool : candidates);
      if (used.has(part.partNumber)) continue;
      used.add(part.partNumber);
      parts.push({
        part,
        quantity: part.priceCents < 800 ? rng.int(1, 3) : 1,
        at: t1 + rng.int(5, 60) * MINUTE,
      });
    }

    const skipped = new Set<string>();
    let skipReason: string | null = null;
    if (rng.chance(shop.def.dragSkip)) {
      skipped.add('drag.washers').add('drag.stack_order');
      if (rng.chance(0.5)) skipped.add('drag.setting');
      skipReason = rng.pick(SKIP_REASONS);
    } else if (rng.chance(0.015)) {
      const required = stepsFor(reel.kind).filter((s) => s.required);
      skipped.add(rng.pick(required).code);
      skipReason = 'Step done but not ticked at the time.';
    }
    for (const code of ['reassembly.photograph', 'test_crank.advice']) {
      if (rng.chance(code === 'reassembly.photograph' ? 0.25 : 0.15)) skipped.add(code);
    }

    const discountCents = rng.chance(0.08) ? rng.pick([500, 750, 1000, 1500]) : 0;
    const job: SimJob = {
      seq: seq++,
      id: 0,
      shop,
      reel,
      serviceType,
      technicianId,
      checkedInAt: t0,
      promisedAt,
      events,
      sessions,
      readyAt,
      collectedAt,
      parts,
      skipped,
      skipReason,
      complaint: comeback ? rng.pick(RETURN_SYMPTOMS) : rng.pick(COMPLAINTS[serviceType]),
      condition: rng.pick(CONDITIONS),
      findings: rng.pick(FINDINGS),
      discountCents,
      comeback,
    };
    reel.freeFrom = collectedAt ?? Number.POSITIVE_INFINITY;
    return job;
  };

  // ---- arrivals: Poisson over opening hours, shaped by season and growth ----
  interface Arrival {
    at: number;
    shop: ShopCtx;
    comeback?: SimComeback;
    reel?: SimReel;
  }
  const arrivals: Arrival[] = [];
  for (const shop of shops) {
    const tl = shop.timeline;
    const weights: number[] = [];
    let total = 0;
    for (let i = 0; i < tl.starts.length; i++) {
      const a = tl.starts[i]!;
      if (a < startMs || a >= nowMs) {
        weights.push(0);
        continue;
      }
      const month = tl.months[i]!;
      const growth = 1 + 0.08 * ((a - startMs) / (365.25 * DAY));
      const w = ((tl.ends[i]! - a) / MINUTE) * (shop.def.season[month - 1] ?? 1) * growth;
      weights.push(w);
      total += w;
    }
    const expected = shop.def.jobsPerTwoYears * (options.years / 2);
    for (let i = 0; i < weights.length; i++) {
      const w = weights[i]!;
      if (w === 0) continue;
      const n = rng.poisson((expected * w) / total);
      const a = tl.starts[i]!;
      const b = Math.min(tl.ends[i]!, nowMs);
      for (let k = 0; k < n; k++) {
        arrivals.push({ at: a + Math.floor(rng.float() * ((b - a) / MINUTE)) * MINUTE, shop });
      }
    }
  }
  arrivals.sort((x, y) => x.at - y.at || x.shop.index - y.shop.index);

  // Returns join the arrival stream as they fall due.
  const pending: Arrival[] = [];
  const schedule = (a: Arrival) => {
    let lo = 0;
    let hi = pending.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (pending[mid]!.at <= a.at) lo = mid + 1;
      else hi = mid;
    }
    pending.splice(lo, 0, a);
  };

  const jobs: SimJob[] = [];
  const decideComeback = (job: SimJob) => {
    if (job.comeback || job.collectedAt === null || job.collectedAt > nowMs) return;
    const def = job.shop.def;
    let counted: boolean;
    if (def.slug === 'ternhollow-lake') {
      job.shop.quotaCredit += def.comebackCounted;
      counted = job.shop.quotaCredit >= 1;
      if (counted) job.shop.quotaCredit -= 1;
    } else if (def.slug === 'brackwater-flats') {
      counted = rng.chance(
        !job.skipped.has('drag.washers')
          ? def.comebackCounted
          : job.collectedAt >= nowMs - RECENT_MS
            ? DRAG_COMEBACK_CHANCE_RECENT
            : DRAG_COMEBACK_CHANCE,
      );
    } else {
      counted = rng.chance(def.comebackCounted);
    }
    const uncounted = !counted && rng.chance(UNCOUNTED_CHANCE);
    if (!counted && !uncounted) return;
    // A drag stack left dry and glazed slips on the first hard run, so those reels come back
    // within days; other faults show over weeks.
    const median = !counted
      ? 35
      : job.skipped.has('drag.washers')
        ? DRAG_RETURN_DAYS
        : def.returnMedianDays;
    const days = Math.round(clamp(rng.logNormal(median, 0.7), 2, 88));
    const region = shops.filter(
      (s) => s.regionId === job.shop.regionId && s !== job.shop && s.def.jobsPerTwoYears > 1000,
    );
    const shop = rng.chance(0.9) || region.length === 0 ? job.shop : rng.pick(region);
    const at = addBusinessMinutes(
      shop.timeline,
      nextOpen(shop.timeline, job.collectedAt + days * DAY),
      rng.int(0, 200),
    );
    if (at > nowMs || at - job.collectedAt >= 90 * DAY) return;
    schedule({ at, shop, reel: job.reel, comeback: { original: job, counted, detectedAt: at } });
  };

  let next = 0;
  while (next < arrivals.length || pending.length > 0) {
    const base = arrivals[next];
    const due = pending[0];
    let arrival: Arrival;
    if (due && (!base || due.at <= base.at)) arrival = pending.shift()!;
    else {
      arrival = base!;
      next++;
    }
    const reel = arrival.reel ?? reelFor(arrival.shop, arrival.at);
    const serviceType = arrival.comeback
      ? 'repair'
      : rng.weighted(SERVICE_MIX, (s) => s.weight).type;
    const job = simulateJob(arrival.shop, arrival.at, reel, serviceType, arrival.comeback);
    jobs.push(job);
    decideComeback(job);
  }

  // ---- rows, with ids in check-in order ----
  jobs.sort((a, b) => a.checkedInAt - b.checkedInAt || a.seq - b.seq);
  jobs.forEach((j, i) => (j.id = i + 1));

  for (const job of jobs) {
    const shop = job.shop;
    const events = job.events.filter((e) => e.at <= nowMs);
    const last = events[events.length - 1]!;
    const state = last.to;
    const readyAt = job.readyAt <= nowMs ? job.readyAt : null;
    const collectedAt =
      job.collectedAt !== null && job.collectedAt <= nowMs ? job.collectedAt : null;
    const benchStarted = events.length > 1;

    const sessions = job.sessions.filter((s) =>
      s.start === null ? readyAt !== null : s.end !== null && s.end <= nowMs,
    );
    for (const s of sessions) {
      data.benchSessions.push({
        id: data.benchSessions.length + 1,
        jobId: job.id,
        technicianId: job.technicianId,
        startedAt: s.start === null ? null : new Date(s.start),
        endedAt: s.end === null ? null : new Date(s.end),
        minutes: s.minutes,
        note: s.start === null ? 'Entered by hand.' : null,
        createdAt: new Date(s.end ?? readyAt ?? job.checkedInAt),
      });
    }
    const benchMinutes = sessions.length > 0 ? sessions.reduce((n, s) => n + s.minutes, 0) : null;

    const parts = benchStarted ? job.parts.filter((p) => p.at <= nowMs) : [];
    for (const p of parts) {
      data.partLines.push({
        id: data.partLines.length + 1,
        jobId: job.id,
        name: p.part.name,
        partNumber: p.part.partNumber,
        quantity: p.quantity,
        unitPriceCents: p.part.priceCents,
        createdAt: new Date(p.at),
      });
    }
    const partsList = parts.reduce((n, p) => n + p.quantity * p.part.priceCents, 0);

    // Checklist ticks spread along the bench work, in the standard's order.
    const steps = stepsFor(job.reel.kind).filter((s) => !job.skipped.has(s.code));
    const pieces = job.sessions.filter((s) => s.start !== null) as {
      start: number;
      end: number;
      minutes: number;
    }[];
    const totalWork = pieces.reduce((n, s) => n + (s.end - s.start), 0);
    steps.forEach((step, k) => {
      let at: number;
      if (pieces.length === 0 || totalWork === 0) {
        at = job.readyAt - (steps.length - k) * MINUTE;
      } else {
        let offset = ((k + 0.5) / steps.length) * totalWork;
        at = pieces[pieces.length - 1]!.end;
        for (const piece of pieces) {
          const len = piece.end - piece.start;
          if (offset <= len) {
            at = piece.start + Math.floor(offset / MINUTE) * MINUTE;
            break;
          }
          offset -= len;
        }
      }
      if (
        at > nowMs ||
        (readyAt === null && !['teardown', 'cleaning', 'inspection'].includes(step.group))
      )
        return;
      data.checklistTicks.push({
        jobId: job.id,
        stepId: stepIds.get(step.code),
        userId: job.technicianId,
        tickedAt: new Date(at),
        note: null,
      });
    });

    let customerTurnaroundMinutes: number | null = null;
    let benchTurnaroundMinutes: number | null = null;
    let waitingPartsMinutes: number | null = null;
    if (readyAt !== null) {
      const waitingSpans = [];
      for (let i = 0; i < job.events.length; i++) {
        const e = job.events[i]!;
        if (e.to === 'waiting_parts') {
          waitingSpans.push({ from: new Date(e.at), to: new Date(job.events[i + 1]!.at) });
        }
      }
      const t = jobTurnaround(
        { checkedInAt: new Date(job.checkedInAt), readyAt: new Date(readyAt), waitingSpans },
        shop.calendar,
      );
      customerTurnaroundMinutes = Math.round(t.customerMinutes);
      waitingPartsMinutes = Math.round(t.waitingMinutes);
      benchTurnaroundMinutes = customerTurnaroundMinutes - waitingPartsMinutes;
    }

    // Comeback review, and what the return job is charged.
    let free = false;
    const cb = job.comeback;
    if (cb) {
      const original = cb.original;
      // Leads review within the network's seven-day deadline, a few late ones aside.
      const lag =
        clamp(
          rng.logNormal(original.shop.def.reviewMedianDays, 0.7),
          0.2,
          rng.chance(0.05) ? 40 : 7,
        ) * DAY;
      const reviewedAt = cb.detectedAt + lag <= nowMs ? cb.detectedAt + lag : null;
      let status: 'open' | 'confirmed' | 'dismissed' = 'open';
      let attribution: ComebackAttribution | null = null;
      let rootCause: string | null = null;
      let step: string | null = null;
      let disposition: ComebackDisposition | null = null;
      let dismissReason: string | null = null;
      if (reviewedAt !== null) {
        if (cb.counted) {
          status = 'confirmed';
          if (original.skipped.has('drag.washers')) {
            attribution = 'workmanship';
            rootCause = 'drag_stack_not_serviced';
            step = rng.pick(['drag.washers', 'drag.stack_order']);
          } else if (rng.chance(0.7)) {
            attribution = 'workmanship';
            const pickCause = rng.weighted(
              [
                ['lubrication_missed', 'lubrication.gears', 35],
                ['reassembly_error', 'reassembly.reassemble', 25],
                ['bearing_not_replaced', 'cleaning.bearings', 25],
                ['drag_stack_not_serviced', 'drag.washers', 15],
              ] as const,
              (c) => c[2],
            );
            rootCause = pickCause[0];
            step = stepsFor(original.reel.kind).some((s) => s.code === pickCause[1])
              ? pickCause[1]
              : null;
          } else {
            attribution = 'part_failure';
            rootCause = rng.chance(0.7) ? 'part_defect' : 'wrong_part';
          }
          disposition = rng.weighted(
            [
              ['redone_free', 80],
              ['charged', 12],
              ['refunded', 8],
            ] as const,
            (d) => d[1],
          )[0];
        } else if (rng.chance(0.4)) {
          status = 'dismissed';
          dismissReason = rng.pick(DISMISS_REASONS);
        } else {
          status = 'confirmed';
          attribution = rng.weighted(
            [
              ['customer_damage', 45],
              ['unrelated', 35],
              ['undetermined', 20],
            ] as const,
            (a) => a[1],
          )[0];
          rootCause =
            attribution === 'customer_damage'
              ? rng.pick(['salt_intrusion', 'other'])
              : attribution === 'undetermined'
                ? null
                : 'other';
          disposition = rng.chance(0.85) ? 'charged' : 'redone_free';
        }
      }
      free = disposition === 'redone_free' || disposition === 'refunded';
      const redoCostCents =
        status === 'confirmed' && readyAt !== null
          ? Math.round(((benchMinutes ?? 0) / 60) * shop.def.labourRateCents) + partsList
          : null;
      data.comebacks.push({
        id: data.comebacks.length + 1,
        jobId: job.id,
        originalJobId: original.id,
        originalShopId: original.shop.id,
        status,
        detection: rng.chance(0.92) ? 'automatic' : 'manual',
        symptom: job.complaint,
        attribution,
        rootCauseId: rootCause ? rootCauseId(rootCause) : null,
        rootCauseNote:
          rootCause === 'drag_stack_not_serviced'
            ? 'Drag washers dry and glazed; the stack was not serviced.'
            : null,
        checklistStepId: step ? stepId(step) : null,
        disposition,
        redoCostCents,
        dismissReason,
        assigneeId: null,
        reviewerId: reviewedAt !== null ? original.shop.leadId : null,
        detectedAt: new Date(cb.detectedAt),
        notifiedAt: new Date(cb.detectedAt + MINUTE),
        reviewedAt: reviewedAt !== null ? new Date(reviewedAt) : null,
        daysSinceCollection: Math.floor((cb.detectedAt - original.collectedAt!) / DAY),
        createdAt: new Date(cb.detectedAt),
        updatedAt: new Date(reviewedAt ?? cb.detectedAt),
      });
    }

    let labourCents = 0;
    if (readyAt !== null && !free) {
      const flat = job.shop.def.flatPrices;
      labourCents =
        job.serviceType === 'repair' || (job.comeback && !free)
          ? Math.round((Math.ceil((benchMinutes ?? 0) / 15) * 15 * shop.def.labourRateCents) / 60)
          : flat[job.serviceType as keyof typeof flat];
    }
    const partsCents = free ? 0 : partsList;
    const discountCents =
      readyAt !== null ? Math.min(job.discountCents, labourCents + partsCents) : 0;

    data.jobs.push({
      id: job.id,
      shopId: shop.id,
      customerId: job.reel.customer.id,
      reelId: job.reel.id,
      serviceType: job.serviceType,
      state,
      stateChangedAt: new Date(last.at),
      technicianId: benchStarted ? job.technicianId : null,
      serviceStandardId: 1,
      complaint: job.complaint,
      condition: job.condition,
      findings: readyAt !== null ? job.findings : null,
      checkedInAt: new Date(job.checkedInAt),
      promisedAt: new Date(job.promisedAt),
      readyAt: readyAt !== null ? new Date(readyAt) : null,
      collectedAt: collectedAt !== null ? new Date(collectedAt) : null,
      labourCents,
      partsCents,
      discountCents,
      comebackOfJobId: job.comeback ? job.comeback.original.id : null,
      incompleteChecklistReason:
        readyAt !== null && [...job.skipped].some((c) => requiredCodes.has(c))
          ? job.skipReason
          : null,
      customerTurnaroundMinutes,
      benchTurnaroundMinutes,
      waitingPartsMinutes,
      benchMinutes,
      createdAt: new Date(job.checkedInAt),
      updatedAt: new Date(last.at),
    });
    for (const e of events) {
      data.jobEvents.push({
        id: data.jobEvents.length + 1,
        jobId: job.id,
        fromState: e.from,
        toState: e.to,
        at: new Date(e.at),
        userId: e.userId,
        note: e.to === 'waiting_parts' ? 'Waiting on a part from the supplier.' : null,
      });
    }
    if (readyAt !== null && (job.reel.lastReadyAt === null || readyAt > job.reel.lastReadyAt)) {
      job.reel.lastReadyAt = readyAt;
      job.reel.lastReadyZone = shop.calendar.timeZone;
    }
  }

  for (const shop of shops) {
    for (const reel of shop.reels) {
      if (reel.lastReadyAt !== null) {
        data.reels[reel.id - 1]!.lastServicedOn = localDate(reel.lastReadyAt, reel.lastReadyZone);
      }
    }
  }
  return data;
}
