import { z } from 'zod';
import { localDate } from './common';

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
