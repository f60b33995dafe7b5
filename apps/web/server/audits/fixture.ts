import type { Db } from '@reelwright/db';
import {
  auditFormItems,
  auditForms,
  customers,
  jobs,
  networkSettings,
  reels,
  regions,
  shops,
  users,
  type OpeningHours,
} from '@reelwright/db/schema';
import { scopeOf, type Principal } from '../principal';

// A small hand-built network for the audit tests: two regions, three shops, their people, two
// auditors, an audit form with a critical item, and ready jobs placed at chosen local times.

const hours: OpeningHours = {
  mon: [{ open: '09:00', close: '17:00' }],
  tue: [{ open: '09:00', close: '17:00' }],
  wed: [{ open: '09:00', close: '17:00' }],
  thu: [{ open: '09:00', close: '17:00' }],
  fri: [{ open: '09:00', close: '17:00' }],
};

export async function buildAuditNetwork(db: Db) {
  const [north, south] = await db
    .insert(regions)
    .values([
      { name: 'Audit North', code: 'an' },
      { name: 'Audit South', code: 'as' },
    ])
    .returning();
  const shopRows = await db
    .insert(shops)
    .values([
      {
        regionId: north!.id,
        name: 'Dune Audit Shop',
        slug: 'dune-audit',
        timeZone: 'America/New_York',
        openingHours: hours,
        labourRateCents: 6000,
        royaltyRateBp: 500,
      },
      {
        regionId: north!.id,
        name: 'Kelp Audit Shop',
        slug: 'kelp-audit',
        timeZone: 'America/New_York',
        openingHours: hours,
        labourRateCents: 6000,
        royaltyRateBp: 500,
      },
      {
        regionId: south!.id,
        name: 'Reef Audit Shop',
        slug: 'reef-audit',
        timeZone: 'America/Chicago',
        openingHours: hours,
        labourRateCents: 6000,
        royaltyRateBp: 500,
      },
    ])
    .returning();
  const [dune, kelp, reef] = shopRows as [
    (typeof shopRows)[number],
    (typeof shopRows)[number],
    (typeof shopRows)[number],
  ];
  const person = (
    email: string,
    name: string,
    role: 'owner' | 'regional_manager' | 'shop_lead' | 'technician' | 'auditor',
    scope: { shopId?: number; regionId?: number } = {},
  ) => ({
    email,
    name,
    role,
    passwordHash: 'x',
    shopId: scope.shopId ?? null,
    regionId: scope.regionId ?? null,
  });
  const people = await db
    .insert(users)
    .values([
      person('owner@a.test', 'Odile Owner', 'owner'),
      person('north@a.test', 'Nils North', 'regional_manager', { regionId: north!.id }),
      person('south@a.test', 'Sable South', 'regional_manager', { regionId: south!.id }),
      person('lead.dune@a.test', 'Dara Lead', 'shop_lead', { shopId: dune.id }),
      person('tech.dune@a.test', 'Tam Tech', 'technician', { shopId: dune.id }),
      person('lead.reef@a.test', 'Rory Lead', 'shop_lead', { shopId: reef.id }),
      person('auditor.a@a.test', 'Ada Auditor', 'auditor'),
      person('auditor.b@a.test', 'Bo Auditor', 'auditor'),
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
  await db.insert(networkSettings).values({
    id: 1,
    networkName: 'Audit test network',
    defaultAql: 2.5,
    defaultInspectionLevel: 'II',
    auditPassMark: 85,
    correctiveActionDueDays: 14,
  });
  const [form] = await db
    .insert(auditForms)
    .values({ version: 1, title: 'Test form v1', publishedAt: new Date('2026-01-01T00:00:00Z') })
    .returning();
  const items = await db
    .insert(auditFormItems)
    .values([
      {
        formId: form!.id,
        position: 1,
        code: 'checkin.complete',
        title: 'Check-in complete',
        weight: 20,
        critical: false,
      },
      {
        formId: form!.id,
        position: 2,
        code: 'drag.serviced',
        title: 'Drag serviced',
        weight: 30,
        critical: true,
      },
      {
        formId: form!.id,
        position: 3,
        code: 'billing.correct',
        title: 'Billing adds up',
        weight: 30,
        critical: false,
      },
      {
        formId: form!.id,
        position: 4,
        code: 'findings.recorded',
        title: 'Findings written up',
        weight: 20,
        critical: false,
      },
    ])
    .returning();
  const [customer] = await db
    .insert(customers)
    .values({ shopId: dune.id, name: 'Test Angler' })
    .returning();
  const [reel] = await db
    .insert(reels)
    .values({ customerId: customer!.id, kind: 'spinning', maker: 'Testmaker', model: 'Spin 3000' })
    .returning();

  /** Inserts ready jobs at the given instants for a shop; returns their ids in order. */
  const readyJobs = async (shopId: number, readyAt: Date[]) => {
    if (!readyAt.length) return [];
    const rows = await db
      .insert(jobs)
      .values(
        readyAt.map((at) => ({
          shopId,
          customerId: customer!.id,
          reelId: reel!.id,
          serviceType: 'tune_up' as const,
          state: 'ready' as const,
          checkedInAt: new Date(at.getTime() - 3 * 86_400_000),
          readyAt: at,
          labourCents: 4500,
          findings: 'Cleaned and greased.',
        })),
      )
      .returning({ id: jobs.id });
    return rows.map((r) => r.id);
  };

  return {
    regions: { north: north!, south: south! },
    shops: { dune, kelp, reef },
    people,
    principal,
    form: form!,
    items,
    readyJobs,
  };
}

export type AuditNetwork = Awaited<ReturnType<typeof buildAuditNetwork>>;

/** Noon on a local date in New York, as an instant (EST or EDT as the date has it). */
export function newYorkNoon(date: string): Date {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number];
  // Probe both offsets; New York is UTC−4 in summer and UTC−5 in winter.
  const edt = new Date(Date.UTC(y, m - 1, d, 16));
  const parts = new Intl.DateTimeFormat('en-US', {
    timeZone: 'America/New_York',
    hour: 'numeric',
    hour12: false,
  }).format(edt);
  return Number(parts) === 12 ? edt : new Date(Date.UTC(y, m - 1, d, 17));
}
