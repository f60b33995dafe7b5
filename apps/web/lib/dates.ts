// Local calendar dates as the app takes them, free of zod, so that pages in the browser can check
// a date the way lib/validators/common.ts does.
import { isValid, parse } from 'date-fns';

/** Earliest and latest dates and months the app takes: far past any reel's service history. */
export const FIRST_DATE = '2000-01-01';
export const LAST_DATE = '2099-12-31';

/** True for "YYYY-MM-DD" that names a day that exists (no 30 February, no month 13). */
export function isCalendarDate(value: string): boolean {
  if (!/^\d{4}-\d{2}-\d{2}$/.test(value)) return false;
  return isValid(parse(value, 'yyyy-MM-dd', new Date(2000, 0, 1)));
}

/** The same test as the `localDate` schema: "YYYY-MM-DD", a real day, between 2000 and 2099. */
export const isLocalDate = (value: string) =>
  isCalendarDate(value) && value >= FIRST_DATE && value <= LAST_DATE;

/** What is wrong with a local date, in the words of the `localDate` schema; null when it is fine. */
export function localDateError(value: string): string | null {
  if (!/^\d{4}-\d{2}-\d{2}$/.test(value)) return 'Give a date as YYYY-MM-DD';
  if (!isCalendarDate(value)) return 'Not a calendar date';
  if (value < FIRST_DATE || value > LAST_DATE) return 'Pick a date between 2000 and 2099';
  return null;
}
