import fc from 'fast-check';
import { DateTime } from 'luxon';
import { describe, expect, it } from 'vitest';
import {
  businessDays,
  businessMinutes,
  localDayNumber,
  type OpeningSpan,
  type ShopCalendar,
  type Weekday,
} from './business-time';

const weekdayHours: OpeningSpan[] = [
  { open: '09:00', close: '12:00' },
  { open: '13:00', close: '17:00' },
];

const harbor: ShopCalendar = {
  timeZone: 'America/New_York',
  weekly: {
    mon: weekdayHours,
    tue: weekdayHours,
    wed: weekdayHours,
    thu: weekdayHours,
    fri: weekdayHours,
    sat: [{ open: '10:00', close: '14:00' }],
  },
  closedDates: ['2024-07-04'],
};

const at = (iso: string): Date => new Date(iso);
const allDay = (timeZone: string, spans: OpeningSpan[] = [{ open: '00:00', close: '24:00' }]) => ({
  timeZone,
  weekly: Object.fromEntries(
    (['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'] as const).map((d) => [d, spans]),
  ),
  closedDates: [],
});

describe('businessMinutes', () => {
  it('counts both spans of a day and skips the lunch break', () => {
    expect(
      businessMinutes(at('2024-07-02T08:00:00-04:00'), at('2024-07-02T18:00:00-04:00'), harbor),
    ).toBe(420);
    expect(
      businessMinutes(at('2024-07-02T11:30:00-04:00'), at('2024-07-02T13:30:00-04:00'), harbor),
    ).toBe(60);
  });

  it('is 0 when to <= from and on days without spans', () => {
    expect(businessMinutes(at('2024-07-02T12:00:00Z'), at('2024-07-02T12:00:00Z'), harbor)).toBe(0);
    expect(businessMinutes(at('2024-07-03T12:00:00Z'), at('2024-07-02T12:00:00Z'), harbor)).toBe(0);
    expect(
      businessMinutes(at('2024-07-07T00:00:00-04:00'), at('2024-07-08T00:00:00-04:00'), harbor),
    ).toBe(0);
  });

  it('skips closed dates', () => {
    // Wed 16:00 → Fri 10:00 with Thursday 4 July closed.
    expect(
      businessMinutes(at('2024-07-03T16:00:00-04:00'), at('2024-07-05T10:00:00-04:00'), harbor),
    ).toBe(120);
  });

  it('converts each instant with the offset in force at that instant (spring forward)', () => {
    // Sat 12:00 EST → Mon 10:00 EDT: Saturday 12–14 plus Monday 09–10.
    expect(
      businessMinutes(at('2024-03-09T12:00:00-05:00'), at('2024-03-11T10:00:00-04:00'), harbor),
    ).toBe(180);
  });

  it('makes the changeover day 23 or 25 hours long', () => {
    const ny = allDay('America/New_York');
    expect(
      businessMinutes(at('2024-03-10T00:00:00-05:00'), at('2024-03-11T00:00:00-04:00'), ny),
    ).toBe(23 * 60);
    expect(
      businessMinutes(at('2024-11-03T00:00:00-04:00'), at('2024-11-04T00:00:00-05:00'), ny),
    ).toBe(25 * 60);
    const london = allDay('Europe/London');
    expect(
      businessMinutes(at('2024-03-31T00:00:00Z'), at('2024-04-01T00:00:00+01:00'), london),
    ).toBe(23 * 60);
    expect(
      businessMinutes(at('2024-10-27T00:00:00+01:00'), at('2024-10-28T00:00:00Z'), london),
    ).toBe(25 * 60);
  });

  it('handles the 30-minute change of Australia/Lord_Howe', () => {
    const lh = allDay('Australia/Lord_Howe');
    expect(
      businessMinutes(at('2024-10-06T00:00:00+10:30'), at('2024-10-07T00:00:00+11:00'), lh),
    ).toBe(1410);
    expect(
      businessMinutes(at('2024-04-07T00:00:00+11:00'), at('2024-04-08T00:00:00+10:30'), lh),
    ).toBe(1470);
  });

  it('drops skipped wall-clock time and counts repeated wall-clock time twice', () => {
    const early = allDay('America/New_York', [{ open: '01:00', close: '03:00' }]);
    expect(
      businessMinutes(at('2024-03-10T00:00:00-05:00'), at('2024-03-11T00:00:00-04:00'), early),
    ).toBe(60);
    expect(
      businessMinutes(at('2024-11-03T00:00:00-04:00'), at('2024-11-04T00:00:00-05:00'), early),
    ).toBe(180);
    // 02:30 does not exist on 10 March: the span starts when the clock reads 03:00.
    const gap = allDay('America/New_York', [{ open: '02:30', close: '04:00' }]);
    expect(
      businessMinutes(at('2024-03-10T00:00:00-05:00'), at('2024-03-11T00:00:00-04:00'), gap),
    ).toBe(60);
  });

  it('keeps fractions of a minute', () => {
    expect(
      businessMinutes(at('2024-07-02T09:00:30-04:00'), at('2024-07-02T09:01:00-04:00'), harbor),
    ).toBe(0.5);
  });

  it('counts overlapping spans once', () => {
    const overlapping: ShopCalendar = {
      timeZone: 'UTC',
      weekly: {
        tue: [
          { open: '09:00', close: '12:00' },
          { open: '11:00', close: '13:00' },
        ],
      },
      closedDates: [],
    };
    expect(
      businessMinutes(at('2024-07-02T00:00:00Z'), at('2024-07-03T00:00:00Z'), overlapping),
    ).toBe(240);
  });

  it('spans years and both directions of growth of its cache', () => {
    const cal = allDay('Europe/London', [{ open: '09:00', close: '17:00' }]);
    expect(businessMinutes(at('2025-01-01T00:00:00Z'), at('2025-01-02T00:00:00Z'), cal)).toBe(480);
    expect(businessMinutes(at('2020-01-01T00:00:00Z'), at('2021-01-01T00:00:00Z'), cal)).toBe(
      366 * 480,
    );
    expect(businessMinutes(at('2030-01-01T00:00:00Z'), at('2030-01-02T00:00:00Z'), cal)).toBe(480);
  });

  it('notices a changed list of closed dates and a new calendar object', () => {
    const cal: ShopCalendar = { ...harbor, closedDates: [] };
    const from = at('2024-12-24T00:00:00-05:00');
    const to = at('2024-12-26T00:00:00-05:00');
    expect(businessMinutes(from, to, cal)).toBe(840);
    cal.closedDates.push('2024-12-25');
    expect(businessMinutes(from, to, cal)).toBe(420);
    expect(businessMinutes(from, to, { ...cal, closedDates: ['2024-12-24', '2024-12-25'] })).toBe(
      0,
    );
  });

  it('rejects bad input', () => {
    const d = at('2024-07-02T12:00:00Z');
    expect(() => businessMinutes(d, d, { ...harbor, timeZone: 'Nowhere/Atlantis' })).toThrow(
      RangeError,
    );
    expect(() => businessMinutes(new Date(Number.NaN), d, harbor)).toThrow(RangeError);
    expect(() => businessMinutes(d, at('+020240-01-01T00:00:00Z'), harbor)).toThrow(RangeError);
    expect(() =>
      businessMinutes(d, d, { ...harbor, weekly: { mon: [{ open: '17:00', close: '09:00' }] } }),
    ).toThrow(RangeError);
    expect(() =>
      businessMinutes(d, d, { ...harbor, weekly: { mon: [{ open: '9am', close: '17:00' }] } }),
    ).toThrow(RangeError);
    expect(() => businessMinutes(d, d, { ...harbor, closedDates: ['2024-02-30'] })).toThrow(
      RangeError,
    );
  });

  it('accepts "HH:mm:ss" times as a database time column gives them', () => {
    const cal: ShopCalendar = {
      timeZone: 'UTC',
      weekly: { tue: [{ open: '09:00:00', close: '09:30:30' }] },
      closedDates: [],
    };
    expect(businessMinutes(at('2024-07-02T00:00:00Z'), at('2024-07-03T00:00:00Z'), cal)).toBe(30.5);
  });
});

describe('businessDays', () => {
  it('counts open local days in [day(from), day(to))', () => {
    // Mon 1 July → Mon 8 July: Mon, Tue, Wed, Fri, Sat (Thu closed, Sun no hours).
    expect(
      businessDays(at('2024-07-01T10:00:00-04:00'), at('2024-07-08T09:00:00-04:00'), harbor),
    ).toBe(5);
    expect(
      businessDays(at('2024-07-01T08:00:00-04:00'), at('2024-07-01T20:00:00-04:00'), harbor),
    ).toBe(0);
    expect(
      businessDays(at('2024-07-08T08:00:00-04:00'), at('2024-07-01T20:00:00-04:00'), harbor),
    ).toBe(0);
  });

  it('takes the local date, not the UTC date', () => {
    // 02:00Z on 2 July is still Monday 1 July in New York.
    expect(businessDays(at('2024-07-02T02:00:00Z'), at('2024-07-02T14:00:00Z'), harbor)).toBe(1);
    expect(localDayNumber(at('2024-07-02T02:00:00Z'), 'America/New_York')).toBe(
      Date.UTC(2024, 6, 1) / 86_400_000,
    );
  });
});

// ---- property test against a brute-force minute walk on luxon's own zone data ----

const WEEKDAY_KEYS: Weekday[] = ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'];
const clock = (quarter: number): string =>
  `${String(Math.floor(quarter / 4)).padStart(2, '0')}:${String((quarter % 4) * 15).padStart(2, '0')}`;
const minutesOf = (hhmm: string): number =>
  Number(hhmm.slice(0, 2)) * 60 + Number(hhmm.slice(3, 5));

function minuteWalk(from: number, to: number, cal: ShopCalendar): number {
  const closed = new Set(cal.closedDates);
  let count = 0;
  for (let t = from; t < to; t += 60_000) {
    const local = DateTime.fromMillis(t, { zone: cal.timeZone });
    if (closed.has(local.toISODate() ?? '')) continue;
    const spans = cal.weekly[WEEKDAY_KEYS[local.weekday - 1]!] ?? [];
    const m = local.hour * 60 + local.minute;
    if (spans.some((s) => m >= minutesOf(s.open) && m < minutesOf(s.close))) count++;
  }
  return count;
}

const changes: Record<string, string[]> = {
  'America/New_York': ['2024-03-10', '2024-11-03', '2025-03-09', '2025-11-02'],
  'America/Chicago': ['2024-03-10', '2024-11-03', '2025-03-09', '2025-11-02'],
  'Europe/London': ['2024-03-31', '2024-10-27', '2025-03-30', '2025-10-26'],
  'Australia/Lord_Howe': ['2024-04-07', '2024-10-06', '2025-04-06', '2025-10-05'],
};

const spanArb = fc
  .tuple(fc.integer({ min: 0, max: 95 }), fc.integer({ min: 1, max: 96 }))
  .filter(([a, b]) => a < b)
  .map(([a, b]) => ({ open: clock(a), close: clock(b) }));
const weeklyArb = fc
  .array(fc.array(spanArb, { maxLength: 3 }), { minLength: 7, maxLength: 7 })
  .map((days) => Object.fromEntries(days.map((spans, i) => [WEEKDAY_KEYS[i]!, spans])));

describe.each(Object.keys(changes))('businessMinutes against a luxon minute walk in %s', (zone) => {
  it('agrees for random instants around daylight-saving changes', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...changes[zone]!),
        fc.integer({ min: -40 * 60, max: 30 * 60 }),
        fc.integer({ min: -5, max: 40 * 60 }),
        weeklyArb,
        fc.subarray([-1, 0, 1]),
        (date, startOffset, length, weekly, closedShift) => {
          const pivot = DateTime.fromISO(`${date}T02:00`, { zone }).toMillis();
          const from = pivot + startOffset * 60_000;
          const to = from + length * 60_000;
          const closedDates = closedShift.map(
            (k) => DateTime.fromISO(date, { zone }).plus({ days: k }).toISODate() ?? '',
          );
          const cal: ShopCalendar = { timeZone: zone, weekly, closedDates };
          expect(businessMinutes(new Date(from), new Date(to), cal)).toBe(
            minuteWalk(from, to, cal),
          );
        },
      ),
      { numRuns: 100 },
    );
  });
});

describe('businessDays against luxon calendar days', () => {
  it('counts the open local dates between two random instants', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...Object.keys(changes)),
        fc.integer({ min: Date.UTC(2024, 0, 1), max: Date.UTC(2025, 11, 1) }),
        fc.integer({ min: 0, max: 40 * 24 * 60 }),
        weeklyArb,
        (zone, from, minutes, weekly) => {
          const to = from + minutes * 60_000;
          const cal: ShopCalendar = {
            timeZone: zone,
            weekly,
            closedDates: ['2024-12-25', '2025-01-01'],
          };
          let expected = 0;
          let day = DateTime.fromMillis(from, { zone }).startOf('day');
          const last = DateTime.fromMillis(to, { zone }).startOf('day');
          while (day < last) {
            const spans = weekly[WEEKDAY_KEYS[day.weekday - 1]!] ?? [];
            if (spans.length > 0 && !cal.closedDates.includes(day.toISODate() ?? '')) expected++;
            day = day.plus({ days: 1 });
          }
          expect(businessDays(new Date(from), new Date(to), cal)).toBe(expected);
        },
      ),
      { numRuns: 200 },
    );
  });
});
