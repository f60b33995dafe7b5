import type { Db } from '@reelwright/db';
import { customers, regions, shops, users, type OpeningHours } from '@reelwright/db/schema';
import Papa from 'papaparse';
import { IMPORT_FIELD_KEYS, type ImportField } from '~/lib/validators/import-columns';
import { scopeOf, type Principal } from '../principal';

// A small hand-built network for the import tests and benchmark: one region, two shops (the
// second only to show an import stays in its own shop), a lead and a technician.

const hours: OpeningHours = {
  mon: [{ open: '09:00', close: '17:00' }],
  tue: [{ open: '09:00', close: '17:00' }],
  wed: [{ open: '09:00', close: '17:00' }],
  thu: [{ open: '09:00', close: '17:00' }],
  fri: [{ open: '09:00', close: '17:00' }],
  sat: [{ open: '09:00', close: '13:00' }],
};

export async function buildImportNetwork(db: Db) {
  const [region] = await db
    .insert(regions)
    .values({ name: 'Import Coast', code: 'ic' })
    .returning();
  const [shop, other] = await db
    .insert(shops)
    .values([
      {
        regionId: region!.id,
        name: 'Gull Test Shop',
        slug: 'gull',
        timeZone: 'America/New_York',
        openingHours: hours,
        closedDates: ['2025-03-17'],
        labourRateCents: 6000,
        royaltyRateBp: 500,
      },
      {
        regionId: region!.id,
        name: 'Tern Test Shop',
        slug: 'tern',
        timeZone: 'America/Chicago',
        openingHours: hours,
        labourRateCents: 6000,
        royaltyRateBp: 500,
      },
    ])
    .returning();
  const people = await db
    .insert(users)
    .values([
      {
        email: 'lead.gull@t.test',
        name: 'Gale Lead',
        passwordHash: 'x',
        role: 'shop_lead' as const,
        shopId: shop!.id,
      },
      {
        email: 'tech.gull@t.test',
        name: 'Grey Tech',
        passwordHash: 'x',
        role: 'technician' as const,
        shopId: shop!.id,
      },
      {
        email: 'tech.tern@t.test',
        name: 'Tam Tech',
        passwordHash: 'x',
        role: 'technician' as const,
        shopId: other!.id,
      },
    ])
    .returning();
  const [known] = await db
    .insert(customers)
    .values({ shopId: shop!.id, name: 'Known Angler', email: 'known@example.test' })
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
  return {
    shop: shop!,
    other: other!,
    knownCustomer: known!,
    lead: principal('lead.gull@t.test'),
    tech: principal('tech.gull@t.test'),
  };
}

const KINDS = ['spinning', 'baitcasting', 'conventional', 'lever-drag', 'fly', 'spincast'];
const SERVICES = ['tune-up', 'overhaul', 'repair', 'parts install'];

/**
 * `count` plausible past jobs as CSV rows: mostly collected, some ready or still open, a share
 * with a wait on parts; one customer per ten jobs, so customers and reels repeat.
 */
export function importRows(count: number, prefix = 'T'): Record<ImportField, string>[] {
  const rows: Record<ImportField, string>[] = [];
  const base = Date.UTC(2024, 2, 4, 14, 0); // Monday 4 March 2024, 09:00 in New York
  for (let i = 0; i < count; i += 1) {
    const day = 86_400_000;
    const checkedIn = new Date(base + (i % 400) * day + (i % 7) * 1_800_000);
    // Written as New York wall-clock time (UTC−5; close enough for test data).
    const local = (t: Date) =>
      new Date(t.getTime() - 5 * 3_600_000).toISOString().slice(0, 16).replace('T', ' ');
    const state = i % 20 === 0 ? 'on the bench' : i % 10 === 0 ? 'ready' : 'collected';
    const waits = i % 4 === 0;
    const ready = new Date(checkedIn.getTime() + (3 + (i % 5)) * day);
    const customer = Math.floor(i / 10);
    const row = Object.fromEntries(IMPORT_FIELD_KEYS.map((k) => [k, ''])) as Record<
      ImportField,
      string
    >;
    Object.assign(row, {
      external_ref: `${prefix}-${i + 1}`,
      customer_name: `Angler ${customer}`,
      customer_email: customer % 3 === 0 ? `angler${customer}@example.test` : '',
      customer_phone: customer % 3 === 1 ? `207 555 ${String(customer).padStart(4, '0')}` : '',
      reminder_consent: customer % 2 ? 'yes' : 'no',
      reel_kind: KINDS[customer % KINDS.length]!,
      reel_maker: 'Tidewake',
      reel_model: `Model ${customer % 7}`,
      reel_size: String(1000 * (1 + (i % 3))),
      bearing_count: String(4 + (i % 5)),
      gear_ratio: '6.2:1',
      use_profile: i % 3 ? 'light' : 'heavy',
      water: i % 2 ? 'salt' : 'fresh',
      service_type: SERVICES[i % SERVICES.length]!,
      state,
      checked_in_at: local(checkedIn),
      promised_at: local(new Date(checkedIn.getTime() + 5 * day)),
      parts_wait_from: waits ? local(new Date(checkedIn.getTime() + day)) : '',
      parts_wait_to: waits ? local(new Date(checkedIn.getTime() + 2 * day)) : '',
      ready_at: state === 'on the bench' ? '' : local(ready),
      collected_at: state === 'collected' ? local(new Date(ready.getTime() + 2 * day)) : '',
      technician_email: i % 2 ? 'tech.gull@t.test' : '',
      bench_minutes: String(30 + (i % 90)),
      labour: `${45 + (i % 30)}.00`,
      parts: i % 3 ? `${(i % 17) * 3}.50` : '0',
      discount: i % 11 === 0 ? '5.00' : '',
      complaint: 'Grinds when cranking, "rough" under load',
      findings: 'Drag washers glazed; replaced',
    });
    rows.push(row);
  }
  return rows;
}

export const toCsv = (rows: Record<string, string>[]) =>
  Papa.unparse(rows, { columns: IMPORT_FIELD_KEYS as string[] });

/** Mapping where every field's heading is its own key (as in the template). */
export const identityMapping = Object.fromEntries(IMPORT_FIELD_KEYS.map((k) => [k, k])) as Record<
  ImportField,
  string
>;
