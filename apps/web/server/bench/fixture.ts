import type { Db } from '@reelwright/db';
import {
  customers,
  regions,
  reels,
  servicePrices,
  serviceStandardSteps,
  serviceStandards,
  shops,
  users,
  type OpeningHours,
} from '@reelwright/db/schema';
import { scopeOf, type Principal } from '../principal';

// A small hand-built network for the bench tests: two regions, three shops, their people, one
// published service standard and a customer with a reel at each bench shop.

const weekdays: OpeningHours = {
  mon: [{ open: '09:00', close: '17:00' }],
  tue: [{ open: '09:00', close: '17:00' }],
  wed: [{ open: '09:00', close: '17:00' }],
  thu: [{ open: '09:00', close: '17:00' }],
  fri: [{ open: '09:00', close: '17:00' }],
};

export async function buildNetwork(db: Db) {
  const [north, south] = await db
    .insert(regions)
    .values([
      { name: 'Test North', code: 'tn' },
      { name: 'Test South', code: 'ts' },
    ])
    .returning();
  const [dune, kelp, reef] = await db
    .insert(shops)
    .values([
      {
        regionId: north!.id,
        name: 'Dune Test Shop',
        slug: 'dune',
        timeZone: 'America/New_York',
        openingHours: weekdays,
        closedDates: ['2026-11-26'],
        labourRateCents: 6000,
        royaltyRateBp: 500,
        phone: '207 555 0100',
        email: 'dune@shop.test',
      },
      {
        regionId: north!.id,
        name: 'Kelp Test Shop',
        slug: 'kelp',
        timeZone: 'America/New_York',
        openingHours: weekdays,
        labourRateCents: 7200,
        royaltyRateBp: 500,
      },
      {
        regionId: south!.id,
        name: 'Reef Test Shop',
        slug: 'reef',
        timeZone: 'America/Chicago',
        openingHours: weekdays,
        labourRateCents: 6600,
        royaltyRateBp: 500,
      },
    ])
    .returning();
  await db.insert(servicePrices).values([
    { shopId: dune!.id, serviceType: 'tune_up', flatPriceCents: 4500 },
    { shopId: dune!.id, serviceType: 'overhaul', flatPriceCents: 9000 },
    { shopId: dune!.id, serviceType: 'repair', flatPriceCents: null },
    { shopId: kelp!.id, serviceType: 'tune_up', flatPriceCents: 5000 },
  ]);
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
        email: 'tech2.dune@t.test',
        name: 'Tess Tech',
        passwordHash: 'x',
        role: 'technician' as const,
        shopId: dune!.id,
      },
      {
        email: 'tech.kelp@t.test',
        name: 'Kit Kelp',
        passwordHash: 'x',
        role: 'technician' as const,
        shopId: kelp!.id,
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
  const [standard] = await db
    .insert(serviceStandards)
    .values({
      version: 1,
      title: 'Test standard v1',
      safetyNotice: 'Follow the safety data sheets.',
      publishedAt: new Date('2026-01-01T00:00:00Z'),
    })
    .returning();
  // A later draft must never be used for check-ins.
  await db.insert(serviceStandards).values({ version: 2, title: 'Draft v2' });
  const steps = await db
    .insert(serviceStandardSteps)
    .values([
      {
        standardId: standard!.id,
        group: 'teardown' as const,
        position: 1,
        code: 'teardown.photo',
        title: 'Photograph before teardown',
        required: true,
      },
      {
        standardId: standard!.id,
        group: 'cleaning' as const,
        position: 2,
        code: 'cleaning.degrease',
        title: 'Degrease the parts',
        safetyCaution: 'Gloves and ventilation with degreasers.',
        required: true,
      },
      {
        standardId: standard!.id,
        group: 'drag' as const,
        position: 3,
        code: 'drag.washers',
        title: 'Service the drag washers',
        required: true,
      },
      {
        standardId: standard!.id,
        group: 'inspection' as const,
        position: 4,
        code: 'inspection.bail',
        title: 'Check the bail spring',
        required: true,
        appliesTo: ['spinning' as const],
      },
      {
        standardId: standard!.id,
        group: 'test_crank' as const,
        position: 5,
        code: 'test.crank',
        title: 'Test-crank under load',
        required: false,
      },
    ])
    .returning();
  const [ada, kai] = await db
    .insert(customers)
    .values([
      {
        shopId: dune!.id,
        name: 'Ada Testcustomer',
        phone: '(207) 555-0134',
        email: 'ada@example.test',
      },
      { shopId: kelp!.id, name: 'Kai Kelpcustomer', phone: '207 555 0999' },
    ])
    .returning();
  const [adaReel, kaiReel] = await db
    .insert(reels)
    .values([
      {
        customerId: ada!.id,
        kind: 'baitcasting' as const,
        maker: 'Testmaker',
        model: 'Caster 100',
      },
      {
        customerId: kai!.id,
        kind: 'spinning' as const,
        maker: 'Othermaker',
        model: 'Spinner 3000',
      },
    ])
    .returning();
  return {
    shops: { dune: dune!, kelp: kelp!, reef: reef! },
    regions: { north: north!, south: south! },
    standard: standard!,
    steps,
    customers: { ada: ada!, kai: kai! },
    reels: { ada: adaReel!, kai: kaiReel! },
    as: {
      owner: principal('owner@t.test'),
      north: principal('north@t.test'),
      south: principal('south@t.test'),
      lead: principal('lead.dune@t.test'),
      tech: principal('tech.dune@t.test'),
      tech2: principal('tech2.dune@t.test'),
      kelpTech: principal('tech.kelp@t.test'),
      auditor: principal('auditor@t.test'),
    },
  };
}

export type Network = Awaited<ReturnType<typeof buildNetwork>>;
