// Benchmark: prints timings for 1,000,000 synthetic jobs. Run with `pnpm bench`.
import seedrandom from 'seedrandom';
import {
  businessMinutes,
  type ComebackAttribution,
  comebackEstimate,
  comebackReference,
  comebackRate,
  type ComebackRateJob,
  compareRatios,
  compareShops,
  type FollowUpRow,
  followUpTable,
  jobTurnaround,
  mergeSurvivalTables,
  type OpeningSpan,
  revenuePerBenchHour,
  type ShopCalendar,
  turnaroundSummary,
} from '../src/index';

const JOBS = Number(process.argv[2] ?? 1_000_000);
const SHOPS = 60;
const HOUR = 3_600_000;
const DAY = 24 * HOUR;
const random = seedrandom('reelwright-bench-v1');

const zones = ['America/New_York', 'America/Chicago', 'Europe/London', 'Australia/Lord_Howe'];
const split: OpeningSpan[] = [
  { open: '08:30', close: '12:00' },
  { open: '13:00', close: '17:30' },
];
const calendars: ShopCalendar[] = Array.from({ length: SHOPS }, (_, i) => ({
  timeZone: zones[i % zones.length]!,
  weekly: {
    mon: split,
    tue: split,
    wed: split,
    thu: split,
    fri: split,
    sat: [{ open: '09:00', close: '13:00' }],
  },
  closedDates: ['2024-01-01', '2024-07-04', '2024-12-25', '2025-01-01', '2025-07-04', '2025-12-25'],
}));

interface SyntheticJob {
  shop: number;
  checkedInAt: Date;
  readyAt: Date;
  waitingSpans: { from: Date; to: Date }[];
  revenueCents: number;
  benchMinutes: number;
  rate: ComebackRateJob;
}

const start = Date.UTC(2024, 0, 1);
const attributions: ComebackAttribution[] = [
  'workmanship',
  'part_failure',
  'customer_damage',
  'unrelated',
  'undetermined',
];
const generated = performance.now();
const jobs: SyntheticJob[] = new Array<SyntheticJob>(JOBS);
for (let i = 0; i < JOBS; i++) {
  const checkedIn = start + Math.floor(random() * 700 * DAY);
  const ready = checkedIn + Math.floor((1 + random() * 14 * 24) * HOUR);
  const waitingSpans =
    random() < 0.3
      ? [
          {
            from: new Date(checkedIn + 2 * HOUR),
            to: new Date(checkedIn + (2 + random() * 72) * HOUR),
          },
        ]
      : [];
  const collected = ready + Math.floor(random() * 5 * DAY);
  const cameBack = random() < 0.04;
  jobs[i] = {
    shop: Math.floor(random() * SHOPS),
    checkedInAt: new Date(checkedIn),
    readyAt: new Date(ready),
    waitingSpans,
    revenueCents: 2500 + Math.floor(random() * 15000),
    benchMinutes: 20 + Math.floor(random() * 160),
    rate: {
      collectedAt: new Date(collected),
      comebacks: cameBack
        ? [
            {
              attribution: attributions[Math.floor(random() * 5)]!,
              reportedAt: new Date(collected + random() * 80 * DAY),
            },
          ]
        : [],
    },
  };
}
const generationMs = performance.now() - generated;

const results: [string, number, number][] = [];
const collectGarbage = (globalThis as { gc?: () => void }).gc;
function time<T>(label: string, count: number, run: () => T): T {
  // Collect the previous step's garbage first so each step pays only for its own.
  collectGarbage?.();
  const t0 = performance.now();
  const value = run();
  results.push([label, performance.now() - t0, count]);
  return value;
}

const customer = new Float64Array(JOBS);
time('businessMinutes, first pass (builds caches)', JOBS, () => {
  for (let i = 0; i < JOBS; i++) {
    const j = jobs[i]!;
    customer[i] = businessMinutes(j.checkedInAt, j.readyAt, calendars[j.shop]!);
  }
});
time('businessMinutes, warm', JOBS, () => {
  for (let i = 0; i < JOBS; i++) {
    const j = jobs[i]!;
    customer[i] = businessMinutes(j.checkedInAt, j.readyAt, calendars[j.shop]!);
  }
});
const bench = time('jobTurnaround (customer, waiting, bench)', JOBS, () =>
  jobs.map((j) => jobTurnaround(j, calendars[j.shop]!).benchMinutes),
);

const byShop = Array.from({ length: SHOPS }, () => [] as number[]);
jobs.forEach((j, i) => byShop[j.shop]!.push(i));
time('turnaroundSummary, 60 shops × customer and bench', JOBS, () =>
  byShop.map((idx) => [
    turnaroundSummary(idx.map((i) => customer[i]!)),
    turnaroundSummary(idx.map((i) => bench[i]!)),
  ]),
);
const asOf = new Date(start + 730 * DAY);
const rates = time('comebackRate, 60 shops', JOBS, () =>
  byShop.map((idx) =>
    comebackRate(
      idx.map((i) => jobs[i]!.rate),
      { asOf, warrantyDays: 90 },
    ),
  ),
);
time('compareShops (Wilson + 95% and 99.8% funnels), 60 shops', SHOPS, () =>
  compareShops(rates.map((r, s) => ({ shopId: `shop-${s}`, events: r.events, trials: r.trials }))),
);
const counted = new Set<ComebackAttribution>(['workmanship', 'part_failure']);
const followRows: FollowUpRow[][] = byShop.map((idx) =>
  idx.map((i) => {
    const r = jobs[i]!.rate;
    const back = r.comebacks.find((c) => counted.has(c.attribution));
    return { collectedAt: r.collectedAt!, comebackAt: back?.reportedAt ?? null };
  }),
);
const tables = time('followUpTable (whole days since collection), 60 shops', JOBS, () =>
  followRows.map((rows) => followUpTable(rows, { asOf, warrantyDays: 90 })),
);
time('Kaplan–Meier + Nelson–Aalen + O/E per shop, compareRatios, 60 shops', SHOPS, () => {
  const reference = comebackReference(mergeSurvivalTables(tables), 90);
  const estimates = tables.map((t) => comebackEstimate(t, { warrantyDays: 90, reference }));
  return compareRatios(
    estimates.map((e, s) => ({
      shopId: `shop-${s}`,
      observed: e.ratio!.observed,
      expected: e.ratio!.expected,
    })),
  );
});
time('revenuePerBenchHour, 60 shops', JOBS, () =>
  byShop.map((idx) => revenuePerBenchHour(idx.map((i) => jobs[i]!))),
);

const fmt = (n: number, digits = 1): string =>
  n.toLocaleString('en-US', { maximumFractionDigits: digits, minimumFractionDigits: digits });
console.log(
  `@reelwright/metrics benchmark — ${JOBS.toLocaleString('en-US')} jobs, ${SHOPS} shops, Node ${process.version}`,
);
console.log(`(generating the jobs took ${fmt(generationMs, 0)} ms)`);
console.log('| step | total ms | ns per item |');
console.log('| --- | ---: | ---: |');
for (const [label, ms, count] of results)
  console.log(`| ${label} | ${fmt(ms)} | ${fmt((ms * 1e6) / count, 0)} |`);
