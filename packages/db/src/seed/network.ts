import type { ReelKind, UserRole } from '../schema/enums';
import type { OpeningHours } from '../schema/shops';

// The invented "Saltwick & Spool Reel Care" demo network. Every name is made up.

export const NETWORK_NAME = 'Saltwick & Spool Reel Care';

export interface RegionDef {
  code: string;
  name: string;
  timeZone: string;
}

export const REGIONS: readonly RegionDef[] = [
  { code: 'north', name: 'North Shore', timeZone: 'America/New_York' },
  { code: 'south', name: 'South Shore', timeZone: 'America/Chicago' },
];

/** Local-month weights of check-ins (Jan…Dec): the pre-season rush is the peak. */
const COASTAL_NORTH = [0.6, 1.2, 2.0, 1.9, 1.2, 0.85, 0.75, 0.75, 0.9, 1.0, 0.7, 0.5];
const COASTAL_SOUTH = [0.8, 1.6, 2.0, 1.6, 1.1, 0.9, 0.8, 0.8, 0.9, 0.9, 0.7, 0.6];
const INLAND_LAKE = [0.3, 0.5, 1.2, 2.2, 1.6, 0.9, 0.8, 0.8, 0.8, 0.7, 0.4, 0.3];

export interface ShopDef {
  slug: string;
  /** First word of the slug: the demo e-mail addresses use it. */
  key: string;
  name: string;
  region: string;
  hours: OpeningHours;
  /** Extra closures beyond the common holidays, as [month, day]. */
  ownClosures: [number, number][];
  /** Whether the shop closes on the day after Thanksgiving and on Christmas Eve. */
  longHolidays: boolean;
  labourRateCents: number;
  royaltyRateBp: number;
  seasonStart: string;
  seasonEnd: string;
  flatPrices: { tune_up: number; overhaul: number; parts_install: number };
  /** Check-ins over two years (before comebacks). */
  jobsPerTwoYears: number;
  season: readonly number[];
  technicians: number;
  /** Share of salt-water reels among new customers' reels. */
  saltShare: number;
  heavyShare: number;
  kinds: Partial<Record<ReelKind, number>>;
  /** Business minutes from check-in to the bench, before the season's load. */
  queueMedian: number;
  /** Multiplier on the chance that a job waits for a part, and the median wait (business min). */
  waitChance: number;
  waitMedian: number;
  /** Share of jobs whose drag-stack steps are skipped. */
  dragSkip: number;
  /** Chance that a collected job comes back for a counted reason (workmanship, part failure). */
  comebackCounted: number;
  /** Median days from collection to a counted return (other than an unserviced drag stack). */
  returnMedianDays: number;
  /** Median days the shop lead takes to review a comeback. */
  reviewMedianDays: number;
}

const lunch = (open: string, close: string) => [
  { open, close: '12:30' },
  { open: '13:30', close },
];

export const SHOPS: readonly ShopDef[] = [
  {
    slug: 'saltwick-harbor',
    key: 'saltwick',
    name: 'Saltwick Harbor',
    region: 'north',
    hours: {
      mon: [{ open: '08:00', close: '18:00' }],
      tue: [{ open: '08:00', close: '18:00' }],
      wed: [{ open: '08:00', close: '18:00' }],
      thu: [{ open: '08:00', close: '18:00' }],
      fri: [{ open: '08:00', close: '18:00' }],
      sat: [{ open: '09:00', close: '16:00' }],
      sun: [{ open: '10:00', close: '14:00' }],
    },
    ownClosures: [],
    longHolidays: false,
    labourRateCents: 8400,
    royaltyRateBp: 600,
    seasonStart: '04-01',
    seasonEnd: '11-15',
    flatPrices: { tune_up: 4900, overhaul: 9900, parts_install: 1800 },
    jobsPerTwoYears: 6100,
    season: COASTAL_NORTH,
    technicians: 3,
    saltShare: 0.75,
    heavyShare: 0.45,
    kinds: { spinning: 40, conventional: 18, lever_drag: 16, baitcasting: 14, fly: 8, spincast: 4 },
    queueMedian: 300,
    waitChance: 1,
    waitMedian: 700,
    dragSkip: 0.02,
    comebackCounted: 0.04,
    returnMedianDays: 20,
    reviewMedianDays: 2.5,
  },
  {
    slug: 'marram-point',
    key: 'marram',
    name: 'Marram Point',
    region: 'north',
    hours: {
      tue: lunch('09:00', '17:30'),
      wed: lunch('09:00', '17:30'),
      thu: lunch('09:00', '17:30'),
      fri: lunch('09:00', '17:30'),
      sat: [{ open: '09:00', close: '15:00' }],
    },
    ownClosures: [[1, 2]],
    longHolidays: true,
    labourRateCents: 7800,
    royaltyRateBp: 600,
    seasonStart: '04-01',
    seasonEnd: '11-15',
    flatPrices: { tune_up: 4500, overhaul: 9500, parts_install: 1500 },
    jobsPerTwoYears: 4500,
    season: COASTAL_NORTH,
    technicians: 2,
    saltShare: 0.7,
    heavyShare: 0.4,
    kinds: {
      spinning: 46,
      conventional: 14,
      lever_drag: 10,
      baitcasting: 16,
      fly: 10,
      spincast: 4,
    },
    queueMedian: 360,
    waitChance: 1,
    waitMedian: 650,
    dragSkip: 0.02,
    comebackCounted: 0.038,
    returnMedianDays: 20,
    reviewMedianDays: 2.5,
  },
  {
    slug: 'skerry-wharf',
    key: 'skerry',
    name: 'Skerry Wharf',
    region: 'north',
    hours: {
      mon: [{ open: '07:30', close: '16:30' }],
      tue: [{ open: '07:30', close: '16:30' }],
      wed: [{ open: '07:30', close: '16:30' }],
      thu: [{ open: '07:30', close: '16:30' }],
      fri: [{ open: '07:30', close: '16:30' }],
      sat: [{ open: '08:00', close: '12:00' }],
    },
    ownClosures: [[1, 15]],
    longHolidays: false,
    labourRateCents: 8000,
    royaltyRateBp: 550,
    seasonStart: '04-01',
    seasonEnd: '11-30',
    flatPrices: { tune_up: 4700, overhaul: 9700, parts_install: 1600 },
    jobsPerTwoYears: 4200,
    season: COASTAL_NORTH,
    technicians: 2,
    saltShare: 0.85,
    heavyShare: 0.55,
    kinds: { spinning: 34, conventional: 24, lever_drag: 22, baitcasting: 12, fly: 4, spincast: 4 },
    queueMedian: 330,
    // Parts sit waiting: more jobs wait, and for much longer.
    waitChance: 1.7,
    waitMedian: 2900,
    dragSkip: 0.02,
    comebackCounted: 0.042,
    returnMedianDays: 20,
    reviewMedianDays: 2.5,
  },
  {
    slug: 'ternhollow-lake',
    key: 'ternhollow',
    name: 'Ternhollow Lake',
    region: 'north',
    hours: {
      wed: [{ open: '10:00', close: '16:00' }],
      thu: [{ open: '10:00', close: '16:00' }],
      fri: [{ open: '10:00', close: '16:00' }],
      sat: [{ open: '09:00', close: '16:00' }],
      sun: [{ open: '12:00', close: '16:00' }],
    },
    ownClosures: [
      [1, 7],
      [1, 8],
      [1, 9],
      [1, 10],
      [1, 11],
    ],
    longHolidays: true,
    labourRateCents: 6600,
    royaltyRateBp: 450,
    seasonStart: '04-15',
    seasonEnd: '10-31',
    flatPrices: { tune_up: 3900, overhaul: 8500, parts_install: 1200 },
    jobsPerTwoYears: 190,
    season: INLAND_LAKE,
    technicians: 1,
    saltShare: 0,
    heavyShare: 0.2,
    kinds: { spinning: 44, baitcasting: 26, fly: 18, spincast: 12 },
    queueMedian: 420,
    waitChance: 1,
    waitMedian: 800,
    dragSkip: 0.03,
    // Comebacks are placed by quota per quarter (see simulate.ts), not by this chance.
    comebackCounted: 0.105,
    // Lake anglers fish the next weekend, and the lead is at the bench every open day.
    returnMedianDays: 7,
    reviewMedianDays: 1,
  },
  {
    slug: 'fennel-cove',
    key: 'fennel',
    name: 'Fennel Cove',
    region: 'south',
    hours: {
      mon: [{ open: '08:00', close: '17:00' }],
      tue: [{ open: '08:00', close: '17:00' }],
      wed: [{ open: '08:00', close: '17:00' }],
      thu: [{ open: '08:00', close: '17:00' }],
      fri: [{ open: '08:00', close: '17:00' }],
      sat: [{ open: '08:00', close: '17:00' }],
    },
    ownClosures: [],
    longHolidays: true,
    labourRateCents: 7600,
    royaltyRateBp: 600,
    seasonStart: '03-01',
    seasonEnd: '11-30',
    flatPrices: { tune_up: 4500, overhaul: 9200, parts_install: 1500 },
    jobsPerTwoYears: 4800,
    season: COASTAL_SOUTH,
    technicians: 3,
    saltShare: 0.65,
    heavyShare: 0.4,
    kinds: { spinning: 38, baitcasting: 26, conventional: 14, lever_drag: 10, fly: 6, spincast: 6 },
    queueMedian: 300,
    waitChance: 1,
    waitMedian: 650,
    dragSkip: 0.02,
    comebackCounted: 0.039,
    returnMedianDays: 20,
    reviewMedianDays: 2.5,
  },
  {
    slug: 'lantern-inlet',
    key: 'lantern',
    name: 'Lantern Inlet',
    region: 'south',
    hours: {
      mon: [
        { open: '09:00', close: '12:00' },
        { open: '13:00', close: '18:00' },
      ],
      tue: [
        { open: '09:00', close: '12:00' },
        { open: '13:00', close: '18:00' },
      ],
      wed: [
        { open: '09:00', close: '12:00' },
        { open: '13:00', close: '18:00' },
      ],
      thu: [
        { open: '09:00', close: '12:00' },
        { open: '13:00', close: '18:00' },
      ],
      fri: [
        { open: '09:00', close: '12:00' },
        { open: '13:00', close: '18:00' },
      ],
      sat: [{ open: '09:00', close: '15:00' }],
    },
    ownClosures: [[12, 31]],
    longHolidays: false,
    labourRateCents: 7200,
    royaltyRateBp: 550,
    seasonStart: '03-01',
    seasonEnd: '11-30',
    flatPrices: { tune_up: 4200, overhaul: 8900, parts_install: 1400 },
    jobsPerTwoYears: 3800,
    season: COASTAL_SOUTH,
    technicians: 2,
    saltShare: 0.6,
    heavyShare: 0.35,
    kinds: { spinning: 40, baitcasting: 28, conventional: 12, lever_drag: 8, fly: 6, spincast: 6 },
    queueMedian: 330,
    waitChance: 1,
    waitMedian: 700,
    dragSkip: 0.02,
    comebackCounted: 0.043,
    returnMedianDays: 20,
    reviewMedianDays: 2.5,
  },
  {
    slug: 'brackwater-flats',
    key: 'brackwater',
    name: 'Brackwater Flats',
    region: 'south',
    hours: {
      tue: [{ open: '07:00', close: '15:00' }],
      wed: [{ open: '07:00', close: '15:00' }],
      thu: [{ open: '07:00', close: '15:00' }],
      fri: [{ open: '07:00', close: '15:00' }],
      sat: [{ open: '07:00', close: '15:00' }],
      sun: [{ open: '07:00', close: '12:00' }],
    },
    ownClosures: [],
    longHolidays: false,
    labourRateCents: 7000,
    royaltyRateBp: 600,
    seasonStart: '03-01',
    seasonEnd: '11-30',
    flatPrices: { tune_up: 3900, overhaul: 8500, parts_install: 1200 },
    jobsPerTwoYears: 3400,
    season: COASTAL_SOUTH,
    technicians: 2,
    saltShare: 0.8,
    heavyShare: 0.5,
    kinds: { spinning: 42, conventional: 16, lever_drag: 12, baitcasting: 20, fly: 4, spincast: 6 },
    queueMedian: 240,
    waitChance: 1,
    waitMedian: 650,
    // Skips drag-stack steps, and its comebacks trace back to them (more so in the last three
    // months: see DRAG_COMEBACK_CHANCE_RECENT); its lead reviews returns the next day.
    dragSkip: 0.42,
    comebackCounted: 0.035,
    returnMedianDays: 20,
    reviewMedianDays: 1,
  },
];

export interface PersonDef {
  email: string;
  name: string;
  role: UserRole;
  shop?: string;
  region?: string;
}

/** Staff: one lead per shop and its technicians; the first of each is a demo account. */
const STAFF_NAMES: Record<string, string[]> = {
  saltwick: ['Marisol Penhallow', 'Dorian Achterberg', 'Wilhelmina Oduya', 'Caspian Threlkeld'],
  marram: ['Imogen Castellane', 'Rufus Delacourt-Pym', 'Sunniva Obermaier'],
  skerry: ['Lachlan Vantongeren', 'Beatrix Mwangi-Hale', 'Osric Fennimore'],
  ternhollow: ['Winifred Jarrowby', 'Ptolemy Haskins'],
  fennel: ['Adaeze Thornquist', 'Leopold Varga-Mercer', 'Esperanza Kilbride', 'Torvald Ashdown'],
  lantern: ['Cordelia Blackwood-Ng', 'Ignatius Ferrante', 'Saoirse Lindqvist'],
  brackwater: ['Bartholomew Quayle', 'Delphine Okonkwo-Barr', 'Emrys Catterall'],
};

export const PEOPLE: readonly PersonDef[] = [
  { email: 'owner@saltwick.test', name: 'Ottoline Marchbanks', role: 'owner' },
  {
    email: 'manager.north@saltwick.test',
    name: 'Tobias Wrenfield',
    role: 'regional_manager',
    region: 'north',
  },
  {
    email: 'manager.south@saltwick.test',
    name: 'Celestine Abernathy',
    role: 'regional_manager',
    region: 'south',
  },
  { email: 'auditor@saltwick.test', name: 'Priya Halloran-Voss', role: 'auditor' },
  { email: 'auditor.two@saltwick.test', name: 'Magnus Everhart', role: 'auditor' },
  ...SHOPS.flatMap((shop) => {
    const names = STAFF_NAMES[shop.key] ?? [];
    return names.map((name, i): PersonDef => ({
      email:
        i === 0
          ? `lead.${shop.key}@saltwick.test`
          : `tech${i === 1 ? '' : i}.${shop.key}@saltwick.test`,
      name,
      role: i === 0 ? 'shop_lead' : 'technician',
      shop: shop.slug,
    }));
  }),
];

/** A technician invited to Fennel Cove who has not chosen a password yet. */
export const INVITED = {
  email: 'hollis.trevanion@saltwick.test',
  name: 'Hollis Trevanion',
  shop: 'fennel-cove',
} as const;

/** A former Marram Point technician, deactivated when they left. */
export const FORMER = {
  email: 'bramwell.stonehouse@saltwick.test',
  name: 'Bramwell Stonehouse',
  shop: 'marram-point',
} as const;

export const DEMO_PASSWORD = 'reelwright-demo';

/** The accounts the README lists. */
export const DEMO_ACCOUNTS: readonly { email: string; role: UserRole; scope: string | null }[] = [
  { email: 'owner@saltwick.test', role: 'owner', scope: null },
  { email: 'manager.north@saltwick.test', role: 'regional_manager', scope: 'north' },
  { email: 'manager.south@saltwick.test', role: 'regional_manager', scope: 'south' },
  { email: 'lead.marram@saltwick.test', role: 'shop_lead', scope: 'marram-point' },
  { email: 'tech.marram@saltwick.test', role: 'technician', scope: 'marram-point' },
  { email: 'lead.fennel@saltwick.test', role: 'shop_lead', scope: 'fennel-cove' },
  { email: 'tech.fennel@saltwick.test', role: 'technician', scope: 'fennel-cove' },
  { email: 'auditor@saltwick.test', role: 'auditor', scope: null },
];

/** Closed dates common to the network: US public holidays the shops observe. */
export function holidays(year: number, long: boolean): string[] {
  const nthWeekday = (month: number, weekday: number, n: number): number => {
    const first = new Date(Date.UTC(year, month - 1, 1)).getUTCDay();
    return 1 + ((weekday - first + 7) % 7) + 7 * (n - 1);
  };
  const lastWeekday = (month: number, weekday: number): number => {
    const lastDay = new Date(Date.UTC(year, month, 0)).getUTCDate();
    const last = new Date(Date.UTC(year, month - 1, lastDay)).getUTCDay();
    return lastDay - ((last - weekday + 7) % 7);
  };
  const thanksgiving = nthWeekday(11, 4, 4);
  const out: [number, number][] = [
    [1, 1],
    [5, lastWeekday(5, 1)],
    [7, 4],
    [9, nthWeekday(9, 1, 1)],
    [11, thanksgiving],
    [12, 25],
  ];
  if (long) out.push([11, thanksgiving + 1], [12, 24]);
  return out.map(([m, d]) => `${year}-${String(m).padStart(2, '0')}-${String(d).padStart(2, '0')}`);
}
