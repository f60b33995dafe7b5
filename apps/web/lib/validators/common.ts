import { z } from 'zod';
import { FIRST_DATE, isCalendarDate, LAST_DATE } from '../dates';

export { FIRST_DATE, isCalendarDate, LAST_DATE };

// The building blocks every schema uses, so that no input the database or the date code cannot
// take (a NUL, a lone surrogate, 30 February, an id past PostgreSQL's integer) gets past parsing.

/** PostgreSQL's `integer`, the type of every id. */
export const MAX_INT = 2_147_483_647;

const ID_TEXT = /^[1-9][0-9]{0,9}$/;
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

/** True for text that PostgreSQL and UTF-8 can store: no NUL and no unpaired surrogate half. */
export const isStorableText = (s: string) => !s.includes('\u0000') && !LONE_SURROGATE.test(s);

const STORABLE = { error: 'Contains a character that cannot be stored (NUL or a broken one)' };

/** A string that can be stored; chain `.trim()`, `.min()` and `.max()` as on any string. */
export const text = (error?: string) =>
  z.string(error ? { error } : undefined).refine(isStorableText, STORABLE);

/** Optional free text: trimmed, at most `max` characters, empty becomes undefined. */
export const optionalText = (max: number, label: string) =>
  text(`${label} must be text`)
    .trim()
    .max(max, `${label} must be at most ${max} characters`)
    .transform((s) => (s ? s : undefined))
    .optional();

/**
 * An id in a path or a query string: plain decimal digits, no sign, no leading zero, no
 * exponent or hex, at most PostgreSQL's integer. `+2`, `0x10`, `1e3` and ` 2` are refused.
 */
export const idParam = z
  .string({ error: 'Must be a whole number' })
  .regex(ID_TEXT, { error: 'Must be a whole number from 1, digits only', abort: true })
  .refine((s) => Number(s) <= MAX_INT, 'Too large')
  .transform(Number);

export const idParams = z.object({ id: idParam });

/** An id in a JSON body: a JSON number, a whole one, from 1 to PostgreSQL's integer. */
export const idNumber = z
  .number({ error: 'Must be a whole number' })
  .int('Must be a whole number')
  .min(1, 'Must be positive')
  .max(MAX_INT, 'Too large');

/** A whole JSON number in [min, max]; no booleans, strings or fractions. */
export const wholeNumber = (min: number, max: number, error = 'A whole number') =>
  z.number({ error }).int(error).min(min, `At least ${min}`).max(max, `At most ${max}`);

/** A whole number in a query string: digits only, in [min, max]. */
export const queryInt = (min: number, max: number, error = 'Must be a whole number') =>
  z
    .string({ error })
    .regex(/^(0|[1-9][0-9]{0,9})$/, { error: `${error}, digits only`, abort: true })
    .transform(Number)
    .pipe(z.number().min(min, `At least ${min}`).max(max, `At most ${max}`));

/** Money in integer cents, 0 to `max`. */
export const cents = (max: number, error = 'Cents as a whole number') =>
  z.number({ error }).int(error).min(0, 'Cannot be negative').max(max, `At most ${max} cents`);

/** A local calendar date "YYYY-MM-DD" that exists, between 2000 and 2099. */
export const localDate = z
  .string({ error: 'Give a date as YYYY-MM-DD' })
  .regex(/^\d{4}-\d{2}-\d{2}$/, { error: 'Give a date as YYYY-MM-DD', abort: true })
  .refine(isCalendarDate, 'Not a calendar date')
  .refine((s) => s >= FIRST_DATE && s <= LAST_DATE, 'Pick a date between 2000 and 2099');

/** A calendar month "YYYY-MM" (2000–2099). */
export const month = z
  .string({ error: 'Use a month like 2026-11' })
  .regex(/^(\d{4})-(0[1-9]|1[0-2])$/, { error: 'Use a month like 2026-11', abort: true })
  .refine((m) => m >= '2000-01' && m <= '2099-12', 'Pick a month between 2000 and 2099');
