import type { Db } from '@reelwright/db';
import {
  auditForms,
  auditRounds,
  auditSamples,
  comebacks,
  correctiveActions,
  customers,
  jobs,
  networkSettings,
  reels,
  regions,
  shops,
  users,
  type NewJob,
  type OpeningHours,
} from '@reelwright/db/schema';
import { scopeOf, type Principal } from '../principal';

// A small hand-built network for the month-close tests. November 2026 is the month under test:
// Dune and "=SUM(A1)" keep New York time (November runs 2026-11-01T04:00Z to 2026-12-01T05:00Z),
// Reef keeps Chicago time (2026-11-01T05:00Z to 2026-12-01T06:00Z). Warranty: 20 days.

const weekdays: OpeningHours = {
  mon: [{ open: '09:00', close: '17:00' }],
  tue: [{ open: '09:00', close: '17:00' }],
  wed: [{ open: '09:00', close: '17:00' }],
  thu: [{ open: '09:00', close: '17:00' }],
  fri: [{ open: '09:00', close: '17:00' }],
};

const at = (iso: string) => new Date(iso);

export async function buildMonthCloseNetwork(db: Db) {
  await db.insert(networkSettings).values({ id: 1, networkName: 'Test network', warrantyDays: 20 });
  const [north, south] = await db
    .insert(regions)
    .values([
      { name: 'Test North', code: 'tn' },
      { name: 'Test South', code: 'ts' },
    ])
    .returning();
  const shop = (values: {
    regionId: number;
    name: string;
    slug: string;
    timeZone: string;
    rate: number;
  }) => ({
    regionId: values.regionId,
    name: values.name,
    slug: values.slug,
    timeZone: values.timeZone,
    openingHours: weekdays,
    labourRateCents: 6000,
    royaltyRateBp: values.rate,
    seasonStart: '04-01',
    seasonEnd: '11-15',
    email: `${values.slug}@shop.test`,
    phone: '207 555 0100',
  });
  const [dune, formula, reef] = await db
    .insert(shops)
    .values([
      shop({
        regionId: north!.id,
        name: 'Dune Test Shop',
        slug: 'dune',
        timeZone: 'America/New_York',
        rate: 600,
      }),
      // A hostile name: the CSV must show it as text, never run it.
      shop({
        regionId: north!.id,
        name: '=SUM(A1)',
        slug: 'formula',
        timeZone: 'America/New_York',
        rate: 450,
      }),
      shop({
        regionId: south!.id,
        name: 'Reef Test Shop',
        slug: 'reef',
        timeZone: 'America/Chicago',
        rate: 550,
      }),
    ])
    .returning();
  const people = await db
    .insert(users)
    .values([
      { email: 'owner@t.test', name: 'Olive Owner', passwordHash: 'x', role: 'owner' as const },
      {
        email: 'north@t.test',
        name: 'Nora North',
        passwordHash: 'x',
        role: 'regional_manager' as const,
        regionId: north!.id,
      },
      {
        email: 'south@t.test',
        name: 'Sam South',
        passwordHash: 'x',
        role: 'regional_manager' as const,
        regionId: south!.id,
      },
      {
        email: 'lead.dune@t.test',
        name: 'Lena Lead',
        passwordHash: 'x',
        role: 'shop_lead' as const,
        shopId: dune!.id,
      },
      {
        email: 'tech.dune@t.test',
        name: 'Theo Tech',
        passwordHash: 'x',
        role: 'technician' as const,
        shopId: dune!.id,
      },
      {
        email: 'lead.reef@t.test',
        name: 'Rae Lead',
        passwordHash: 'x',
        role: 'shop_lead' as const,
        shopId: reef!.id,
      },
      { email: 'auditor@t.test', name: 'Ari Auditor', passwordHash: 'x', role: 'auditor' as const },
    ])
    .returning();
  const principal = (email: string): Principal => {
    const u = people.find((p) => p.email === email)!;
    return {
      id: u.id,
      name: u.name,
      email: u.email,
      role: u.role,
      shopId: u.shopId,
      regionId: u.regionId,
      scope: scopeOf(u),
    };
  };
  const owner = principal('owner@t.test');

  const cust = await db
    .insert(customers)
    .values([dune!, formula!, reef!].map((s) => ({ shopId: s.id, name: `Customer of ${s.slug}` })))
    .returning();
  const reel = await db
    .insert(reels)
    .values(
      cust.map((c) => ({
        customerId: c.id,
        kind: 'spinning' as const,
        maker: 'Tidewake',
        model: 'Seaspin',
      })),
    )
    .returning();
  const base = (i: number): Pick<NewJob, 'shopId' | 'customerId' | 'reelId' | 'serviceType'> => ({
    shopId: [dune!, formula!, reef!][i]!.id,
    customerId: cust[i]!.id,
    reelId: reel[i]!.id,
    serviceType: 'tune_up',
  });
  const collected = (job: Omit<NewJob, 'state'>): NewJob => ({ ...job, state: 'collected' });
  const [d1, d2, d3] = await db
    .insert(jobs)
    .values([
      // Dune d1: billed 120.00 + 34.50 = 154.50; ready before its promise; came back (workmanship).
      collected({
        ...base(0),
        checkedInAt: at('2026-11-02T14:00:00Z'),
        promisedAt: at('2026-11-04T21:00:00Z'),
        readyAt: at('2026-11-03T18:00:00Z'),
        collectedAt: at('2026-11-05T15:00:00Z'),
        labourCents: 12000,
        partsCents: 3450,
        benchMinutes: 90,
        customerTurnaroundMinutes: 600,
        benchTurnaroundMinutes: 480,
      }),
      // Dune d2: billed 80.00 + 12.75 − 10.00 = 82.75; ready a day late.
      collected({
        ...base(0),
        checkedInAt: at('2026-11-06T14:00:00Z'),
        promisedAt: at('2026-11-09T21:00:00Z'),
        readyAt: at('2026-11-10T18:00:00Z'),
        collectedAt: at('2026-11-12T10:00:00Z'),
        labourCents: 8000,
        partsCents: 1275,
        discountCents: 1000,
        benchMinutes: 60,
        customerTurnaroundMinutes: 1200,
        benchTurnaroundMinutes: 700,
      }),
      // Dune d3: checked in and ready in October, collected in November: billed 45.00.
      collected({
        ...base(0),
        checkedInAt: at('2026-10-28T14:00:00Z'),
        readyAt: at('2026-10-30T18:00:00Z'),
        collectedAt: at('2026-11-02T16:00:00Z'),
        labourCents: 4500,
        benchMinutes: 45,
        customerTurnaroundMinutes: 700,
        benchTurnaroundMinutes: 650,
      }),
      // Dune: collected 23:30 on 31 October New York time — October, not November.
      collected({
        ...base(0),
        checkedInAt: at('2026-10-20T14:00:00Z'),
        readyAt: at('2026-10-22T18:00:00Z'),
        collectedAt: at('2026-11-01T03:30:00Z'),
        labourCents: 9999,
        benchMinutes: 30,
      }),
      // Dune: checked in late November, still on the bench.
      { ...base(0), state: 'on_bench', checkedInAt: at('2026-11-20T14:00:00Z') },
      // "=SUM(A1)": billed 10.00, ready with no promise.
      collected({
        ...base(1),
        checkedInAt: at('2026-11-06T14:00:00Z'),
        readyAt: at('2026-11-08T18:00:00Z'),
        collectedAt: at('2026-11-10T15:00:00Z'),
        labourCents: 1000,
        benchMinutes: 20,
        customerTurnaroundMinutes: 300,
        benchTurnaroundMinutes: 300,
      }),
      // Reef r1: billed 70.00 + 46.00 − 5.00 = 111.00.
      collected({
        ...base(2),
        checkedInAt: at('2026-11-13T15:00:00Z'),
        promisedAt: at('2026-11-16T22:00:00Z'),
        readyAt: at('2026-11-15T20:00:00Z'),
        collectedAt: at('2026-11-18T16:00:00Z'),
        labourCents: 7000,
        partsCents: 4600,
        discountCents: 500,
        benchMinutes: 120,
        customerTurnaroundMinutes: 900,
        benchTurnaroundMinutes: 900,
      }),
      // Reef: 04:30Z on 1 November is 23:30 on 31 October in Chicago — October for Reef.
      collected({
        ...base(2),
        checkedInAt: at('2026-10-25T15:00:00Z'),
        readyAt: at('2026-10-28T20:00:00Z'),
        collectedAt: at('2026-11-01T04:30:00Z'),
        labourCents: 5000,
        benchMinutes: 50,
      }),
    ])
    .returning();
  // d1 came back inside its window for workmanship; d2's return was dismissed (not a comeback).
  const [return1, return2] = await db
    .insert(jobs)
    .values([
      {
        ...base(0),
        state: 'checked_in',
        checkedInAt: at('2026-11-20T14:00:00Z'),
        comebackOfJobId: d1!.id,
      },
      {
        ...base(0),
        state: 'checked_in',
        checkedInAt: at('2026-11-21T14:00:00Z'),
        comebackOfJobId: d2!.id,
      },
    ])
    .returning();
  await db.insert(comebacks).values([
    {
      jobId: return1!.id,
      originalJobId: d1!.id,
      originalShopId: dune!.id,
      status: 'confirmed',
      attribution: 'workmanship',
      detectedAt: at('2026-11-20T14:00:00Z'),
      daysSinceCollection: 15,
    },
    {
      jobId: return2!.id,
      originalJobId: d2!.id,
      originalShopId: dune!.id,
      status: 'dismissed',
      attribution: 'unrelated',
      detectedAt: at('2026-11-21T14:00:00Z'),
      daysSinceCollection: 9,
    },
  ]);
  const [form] = await db
    .insert(auditForms)
    .values({ version: 1, title: 'Audit form v1' })
    .returning();
  const [round] = await db
    .insert(auditRounds)
    .values({
      shopId: dune!.id,
      formId: form!.id,
      periodStart: '2026-11-01',
      periodEnd: '2026-11-30',
      status: 'decided',
      severity: 'normal',
      aql: 2.5,
      lotSize: 40,
      codeLetter: 'D',
      sampleSize: 8,
      acceptNumber: 0,
      rejectNumber: 1,
      seed: 'test-seed',
      lotJobIds: [d3!.id],
      plannedById: owner.id,
      failures: 2,
      decision: 'rejected',
      decidedAt: at('2026-11-25T15:00:00Z'),
    })
    .returning();
  // Two of the three scored samples failed: one needs work, one critical miss.
  await db.insert(auditSamples).values([
    {
      roundId: round!.id,
      jobId: d1!.id,
      position: 1,
      score: 70,
      verdict: 'needs_work',
      completedAt: at('2026-11-24T15:00:00Z'),
    },
    {
      roundId: round!.id,
      jobId: d2!.id,
      position: 2,
      score: 40,
      verdict: 'critical_miss',
      completedAt: at('2026-11-24T16:00:00Z'),
    },
    {
      roundId: round!.id,
      jobId: d3!.id,
      position: 3,
      score: 95,
      verdict: 'meets_standard',
      completedAt: at('2026-11-24T17:00:00Z'),
    },
  ]);
  await db.insert(correctiveActions).values([
    // Open at the end of November: created in November, still open.
    {
      shopId: dune!.id,
      source: 'audit',
      title: 'Retrain drag-stack steps',
      dueOn: '2026-12-10',
      createdAt: at('2026-11-26T15:00:00Z'),
    },
    // Done on 28 November: not open at the end of the month.
    {
      shopId: dune!.id,
      source: 'other',
      title: 'Replace the solvent tray',
      dueOn: '2026-11-30',
      status: 'done',
      createdAt: at('2026-11-10T15:00:00Z'),
      doneAt: at('2026-11-28T15:00:00Z'),
    },
    // Done at 06:00Z on 1 December, after Dune's November ended (05:00Z): open at month end.
    {
      shopId: dune!.id,
      source: 'other',
      title: 'Label the bearing drawers',
      dueOn: '2026-12-01',
      status: 'done',
      createdAt: at('2026-11-10T15:00:00Z'),
      doneAt: at('2026-12-01T06:00:00Z'),
    },
  ]);
  return {
    shops: { dune: dune!, formula: formula!, reef: reef! },
    regions: { north: north!, south: south! },
    jobs: { d1: d1!, d2: d2!, d3: d3! },
    owner,
    north: principal('north@t.test'),
    south: principal('south@t.test'),
    leadDune: principal('lead.dune@t.test'),
    techDune: principal('tech.dune@t.test'),
    auditor: principal('auditor@t.test'),
    principal,
  };
}
