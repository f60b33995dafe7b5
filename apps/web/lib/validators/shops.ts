import { z } from 'zod';
import { cents, idNumber, localDate, month, text, wholeNumber } from './common';

// The shop calendar form and PUT /api/shops/{id}/calendar: weekly opening hours and closed dates.

export const WEEKDAYS = ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'] as const;
export type WeekdayValue = (typeof WEEKDAYS)[number];
export const WEEKDAY_LABELS: Record<WeekdayValue, string> = {
  mon: 'Monday',
  tue: 'Tuesday',
  wed: 'Wednesday',
  thu: 'Thursday',
  fri: 'Friday',
  sat: 'Saturday',
  sun: 'Sunday',
};

const clock = z
  .string()
  .regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'Use a 24-hour time such as 09:00 or 17:30.');

export const openingSpan = z
  .strictObject({ open: clock, close: clock })
  .refine((s) => s.open < s.close, { message: 'Closing time must be after opening time.' });

export const shopCalendarInput = z.strictObject({
  weekly: z.strictObject(
    Object.fromEntries(WEEKDAYS.map((d) => [d, z.array(openingSpan).max(4)])) as Record<
      WeekdayValue,
      z.ZodArray<typeof openingSpan>
    >,
  ),
  closedDates: z
    .array(localDate)
    .max(400)
    .refine((ds) => new Set(ds).size === ds.length, 'Each closed date once.'),
});
export type ShopCalendarInput = z.infer<typeof shopCalendarInput>;

/**
 * One day's opening hours as the form writes them: spans "09:00–12:30, 13:30–17:00" (an en dash
 * or a hyphen), empty for closed. Returns the spans, or the first problem in words.
 */
export function parseDayHours(
  text: string,
): { spans: { open: string; close: string }[] } | { error: string } {
  const parts = text
    .split(',')
    .map((p) => p.trim())
    .filter(Boolean);
  const spans: { open: string; close: string }[] = [];
  for (const part of parts) {
    const m = /^(\d{1,2}):(\d{2})\s*[-–—]\s*(\d{1,2}):(\d{2})$/.exec(part);
    if (!m) return { error: `“${part}” is not a span such as 09:00–17:30.` };
    const span = {
      open: `${m[1]!.padStart(2, '0')}:${m[2]}`,
      close: `${m[3]!.padStart(2, '0')}:${m[4]}`,
    };
    const parsed = openingSpan.safeParse(span);
    if (!parsed.success) {
      return { error: `${part}: ${parsed.error.issues[0]?.message ?? 'not a valid span'}` };
    }
    spans.push(span);
  }
  if (spans.length > 4) return { error: 'At most four spans a day.' };
  return { spans };
}

/** Spans written back as the form shows them. */
export function formatDayHours(spans: readonly { open: string; close: string }[]): string {
  return spans.map((s) => `${s.open}–${s.close}`).join(', ');
}

/** An IANA time zone the runtime knows, e.g. "America/Denver". */
export const timeZone = z
  .string({ error: 'Choose a time zone' })
  .regex(/^[A-Za-z_]+(\/[A-Za-z0-9_+-]+){1,2}$/, {
    error: 'Use a zone such as America/Denver',
    abort: true,
  })
  .refine((zone) => {
    try {
      new Intl.DateTimeFormat('en-US', { timeZone: zone });
      return true;
    } catch {
      return false;
    }
  }, 'Not a time zone this server knows');

const shopName = text('Enter a name')
  .trim()
  .min(1, 'Enter a name')
  .max(80, 'At most 80 characters');
const labourRate = cents(100_000, 'Cents per hour as a whole number');
const royaltyRate = wholeNumber(0, 10_000, 'Basis points as a whole number (500 = 5%)');
const currency = z
  .string({ error: 'Give a currency code such as USD' })
  .regex(/^[A-Z]{3}$/, 'Give a three-letter currency code such as USD');

/** `POST /api/shops`: open a shop with its region, zone, hours, rates and currency. */
export const shopCreate = z.strictObject({
  name: shopName,
  regionId: idNumber,
  timeZone,
  weekly: shopCalendarInput.shape.weekly,
  closedDates: shopCalendarInput.shape.closedDates,
  labourRateCents: labourRate,
  royaltyRateBp: royaltyRate,
  currency,
});
export type ShopCreate = z.infer<typeof shopCreate>;

/**
 * `PATCH /api/shops/{id}`: rename, move to another region, change rates, close or reopen. A new
 * royalty rate applies from `royaltyFrom` (a month; default the shop's current month) on.
 */
export const shopPatch = z
  .strictObject({
    name: shopName.optional(),
    regionId: idNumber.optional(),
    labourRateCents: labourRate.optional(),
    royaltyRateBp: royaltyRate.optional(),
    royaltyFrom: month.optional(),
    active: z.boolean({ error: 'true or false' }).optional(),
  })
  .refine((v) => Object.keys(v).length > 0, 'Change at least one field')
  .refine((v) => v.royaltyFrom === undefined || v.royaltyRateBp !== undefined, {
    path: ['royaltyFrom'],
    message: 'Give the royalty rate that starts in this month',
  });
export type ShopPatch = z.infer<typeof shopPatch>;

const regionName = text('Enter a name')
  .trim()
  .min(1, 'Enter a name')
  .max(80, 'At most 80 characters');
const regionCode = z
  .string({ error: 'Give a short code' })
  .regex(/^[a-z][a-z0-9-]{1,23}$/, 'Lower-case letters, digits and hyphens, 2 to 24 characters');

/** `POST /api/regions`. */
export const regionCreate = z.strictObject({ name: regionName, code: regionCode });
export type RegionCreate = z.infer<typeof regionCreate>;

/** `PATCH /api/regions/{id}`: rename, or make a regional manager this region's manager. */
export const regionPatch = z
  .strictObject({ name: regionName.optional(), managerId: idNumber.optional() })
  .refine((v) => Object.keys(v).length > 0, 'Change at least one field');
export type RegionPatch = z.infer<typeof regionPatch>;
