import { tzOffset } from '@date-fns/tz';
import { z } from 'zod';
import { JOB_STATE_LABELS, REEL_KIND_LABELS, SERVICE_LABELS, type JobState } from '../labels';
import { isStorableText } from './common';
import { IMPORT_FIELDS, IMPORT_FIELD_KEYS, type ImportField } from './import-columns';

// The CSV import of past jobs: the checks every row gets (import-columns.ts has the fields).
// The same code runs in the browser (a first check while the file is read) and on the server
// (the check that decides), so both report the same rows, columns and reasons.

export interface ImportRowError {
  /** The row as a spreadsheet numbers it: the heading is row 1, the first job row 2. */
  row: number;
  /** The file's own column heading (or the field, when the column is not mapped). */
  column?: string;
  message: string;
}

/**
 * Rows whose number of cells differs from the headings (a stray comma, a missing cell), as CSV
 * parsing with headings leaves them: extra cells under `__parsed_extra`, missing ones absent.
 */
export function rowShapeErrors(
  records: readonly Record<string, unknown>[],
  headers: readonly string[],
  rowOffset = 0,
): ImportRowError[] {
  const errors: ImportRowError[] = [];
  records.forEach((record, index) => {
    const extra = record.__parsed_extra;
    const cells = Array.isArray(extra)
      ? headers.length + extra.length
      : headers.filter((h) => record[h] !== undefined).length;
    if (cells !== headers.length) {
      errors.push({
        row: rowOffset + index + 2,
        message: `Has ${cells} cells but the headings have ${headers.length}: look for a stray or missing comma (quote text that contains commas)`,
      });
    }
  });
  return errors;
}

export interface ParsedImportRow {
  row: number;
  externalRef: string;
  customer: { name: string; phone: string | null; email: string | null; reminderConsent: boolean };
  reel: {
    kind: keyof typeof REEL_KIND_LABELS;
    maker: string;
    model: string;
    size: string | null;
    bearingCount: number | null;
    gearRatio: string | null;
    useProfile: 'light' | 'heavy';
    water: 'salt' | 'fresh';
  };
  serviceType: keyof typeof SERVICE_LABELS;
  state: JobState;
  checkedInAt: Date;
  promisedAt: Date | null;
  partsWait: { from: Date; to: Date | null } | null;
  readyAt: Date | null;
  collectedAt: Date | null;
  technicianEmail: string | null;
  benchMinutes: number | null;
  labourCents: number;
  partsCents: number;
  discountCents: number;
  complaint: string | null;
  findings: string | null;
}

const words = (s: string) =>
  s
    .toLowerCase()
    .replace(/[\s_-]+/g, ' ')
    .trim();

/** Accepts the API word ("lever_drag") or the label ("Lever-drag"), in any case. */
function choice<T extends string>(
  what: string,
  labels: Record<T, string>,
  extra: Record<string, T> = {},
) {
  const lookup = new Map<string, T>();
  for (const [value, label] of Object.entries(labels) as [T, string][]) {
    lookup.set(words(value), value);
    lookup.set(words(label), value);
  }
  for (const [k, v] of Object.entries(extra)) lookup.set(words(k), v);
  const allowed = Object.values<string>(labels)
    .map((l) => l.toLowerCase())
    .join(', ');
  return z.string().transform((raw, ctx) => {
    if (raw === '') {
      ctx.addIssue({ code: 'custom', message: `${what} is missing` });
      return z.NEVER;
    }
    const hit = lookup.get(words(raw));
    if (hit === undefined) {
      ctx.addIssue({ code: 'custom', message: `“${raw}” is not one of: ${allowed}` });
      return z.NEVER;
    }
    return hit;
  });
}

const text = (max: number) =>
  z
    .string()
    .max(max, `Longer than ${max} characters`)
    .transform((s) => s || null);
const required = (what: string, max = 200) =>
  z.string().min(1, `${what} is missing`).max(max, `Longer than ${max} characters`);

const yesNo = z.string().transform((raw, ctx) => {
  const v = raw.toLowerCase();
  if (['', 'no', 'n', 'false', '0'].includes(v)) return false;
  if (['yes', 'y', 'true', '1'].includes(v)) return true;
  ctx.addIssue({ code: 'custom', message: `“${raw}” is not yes or no` });
  return z.NEVER;
});

const MONEY = /^\$?(\d{1,3}(,\d{3})+|\d+)(\.\d{1,2})?$/;
/** Dollars and cents as written ("1,234.50", "$45") → integer cents, without floating point. */
const money = z.string().transform((raw, ctx) => {
  if (raw === '') return 0;
  const compact = raw.replace(/\s/g, '');
  if (!MONEY.test(compact)) {
    ctx.addIssue({ code: 'custom', message: `“${raw}” is not an amount like 45.00` });
    return z.NEVER;
  }
  const [whole, fraction = ''] = compact.replace(/[$,]/g, '').split('.');
  const cents = Number(whole) * 100 + Number(fraction.padEnd(2, '0'));
  if (cents > 10_000_000) {
    ctx.addIssue({ code: 'custom', message: 'More than 100,000.00' });
    return z.NEVER;
  }
  return cents;
});

const wholeNumber = (max: number) =>
  z.string().transform((raw, ctx) => {
    if (raw === '') return null;
    if (!/^\d+$/.test(raw) || Number(raw) > max) {
      ctx.addIssue({ code: 'custom', message: `“${raw}” is not a whole number from 0 to ${max}` });
      return z.NEVER;
    }
    return Number(raw);
  });

const LOCAL = /^(\d{4})-(\d{2})-(\d{2})(?:[ T](\d{2}):(\d{2})(?::(\d{2}))?)?$/;
const WITH_OFFSET = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:?\d{2})$/;

const offsets = new Map<string, number>();
/** The zone's UTC offset in minutes, cached per quarter hour: zones change offset only on those. */
function offsetAt(timeZone: string, instant: number): number {
  const key = `${timeZone}|${Math.floor(instant / 900_000)}`;
  let offset = offsets.get(key);
  if (offset === undefined) {
    offset = tzOffset(timeZone, new Date(instant));
    if (offsets.size > 200_000) offsets.clear();
    offsets.set(key, offset);
  }
  return offset;
}

/** The instant of a wall-clock time in a zone, right across daylight-saving changes. */
export function zonedInstant(
  parts: [number, number, number, number, number, number],
  timeZone: string,
): Date {
  const [y, mo, d, h, mi, s] = parts;
  const wall = Date.UTC(y, mo - 1, d, h, mi, s);
  const first = wall - offsetAt(timeZone, wall) * 60_000;
  const second = wall - offsetAt(timeZone, first) * 60_000;
  return new Date(second);
}

/** "YYYY-MM-DD[ HH:mm[:ss]]" in the shop's zone (a date alone means noon), or ISO 8601 with offset. */
export function parseImportInstant(raw: string, timeZone: string): Date | string {
  if (WITH_OFFSET.test(raw)) {
    const t = new Date(raw);
    return Number.isNaN(t.getTime()) ? `“${raw}” is not a real date and time` : t;
  }
  const m = LOCAL.exec(raw);
  if (!m) return `“${raw}” is not a date like 2025-03-14 or 2025-03-14 10:30`;
  const [y, mo, d, h = '12', mi = '00', s = '00'] = m.slice(1) as (string | undefined)[];
  const parts = [y, mo, d, h, mi, s].map(Number) as [
    number,
    number,
    number,
    number,
    number,
    number,
  ];
  const check = new Date(Date.UTC(parts[0], parts[1] - 1, parts[2]));
  if (
    check.getUTCMonth() !== parts[1] - 1 ||
    check.getUTCDate() !== parts[2] ||
    parts[3] > 23 ||
    parts[4] > 59 ||
    parts[5] > 59
  ) {
    return `“${raw}” is not a real date and time`;
  }
  return zonedInstant(parts, timeZone);
}

const optionalEmail = z
  .string()
  .refine((s) => s === '' || z.regexes.email.test(s), 'Not an e-mail address')
  .transform((s) => s.toLowerCase() || null);

const STATE_EXTRA: Record<string, JobState> = {
  'checked in': 'checked_in',
  'on bench': 'on_bench',
  'waiting parts': 'waiting_parts',
  'waiting for parts': 'waiting_parts',
  'ready for pickup': 'ready',
};

/** One row's plain fields; instants, order of events and cross-field rules are checked after. */
const rowSchema = z.object({
  external_ref: required('The job number', 100),
  customer_name: required('The customer’s name'),
  customer_phone: text(40),
  customer_email: optionalEmail,
  reminder_consent: yesNo,
  reel_kind: choice('The reel kind', REEL_KIND_LABELS, {
    lever: 'lever_drag',
    leverdrag: 'lever_drag',
  }),
  reel_maker: required('The reel maker', 100),
  reel_model: required('The reel model', 100),
  reel_size: text(40),
  bearing_count: wholeNumber(60),
  gear_ratio: text(20),
  use_profile: z.string().transform((raw, ctx) => {
    const v = raw.toLowerCase();
    if (v === '' || v === 'light') return 'light' as const;
    if (v === 'heavy') return 'heavy' as const;
    ctx.addIssue({ code: 'custom', message: `“${raw}” is not light or heavy` });
    return z.NEVER;
  }),
  water: z.string().transform((raw, ctx) => {
    const v = raw.toLowerCase();
    if (v === '' || v === 'fresh' || v === 'freshwater') return 'fresh' as const;
    if (v === 'salt' || v === 'saltwater') return 'salt' as const;
    ctx.addIssue({ code: 'custom', message: `“${raw}” is not salt or fresh` });
    return z.NEVER;
  }),
  service_type: choice('The service', SERVICE_LABELS, { tuneup: 'tune_up' }),
  state: choice('The state', JOB_STATE_LABELS, STATE_EXTRA),
  checked_in_at: z.string(),
  promised_at: z.string(),
  parts_wait_from: z.string(),
  parts_wait_to: z.string(),
  ready_at: z.string(),
  collected_at: z.string(),
  technician_email: optionalEmail,
  bench_minutes: wholeNumber(100_000),
  labour: money,
  parts: money,
  discount: money,
  complaint: text(2000),
  findings: text(4000),
});

const UNSTORABLE =
  'Contains a character that cannot be stored (a NUL byte): check how the file was exported';

export interface ValidateOptions {
  timeZone: string;
  /** Nothing may happen after this instant (the moment of the import). */
  now: Date;
  /** Field → the file's heading, to name columns the way the user sees them. */
  mapping: Partial<Record<ImportField, string>>;
  /** When checking a file in slices: how many rows came before this slice… */
  rowOffset?: number;
  /** …and the job numbers seen so far (number → row), shared between slices. */
  seenRefs?: Map<string, number>;
}

/**
 * Checks every row and returns the good ones parsed, plus every problem with its row, column and
 * reason. `rows` hold the mapped fields' raw text (missing fields as empty strings).
 */
export function validateImportRows(
  rows: readonly Partial<Record<ImportField, string>>[],
  options: ValidateOptions,
): { valid: ParsedImportRow[]; errors: ImportRowError[] } {
  const valid: ParsedImportRow[] = [];
  const errors: ImportRowError[] = [];
  const columnOf = (field: ImportField) => options.mapping[field] ?? field;
  const seenRefs = options.seenRefs ?? new Map<string, number>();
  const offset = options.rowOffset ?? 0;

  rows.forEach((raw, index) => {
    const row = offset + index + 2;
    const before = errors.length;
    // A cell the database cannot store (a NUL) is reported once, and never echoed in a message.
    const unstorable = new Set<ImportField>();
    const fail = (field: ImportField, message: string) => {
      if (!unstorable.has(field)) errors.push({ row, column: columnOf(field), message });
    };

    const input: Record<string, string> = {};
    for (const key of IMPORT_FIELD_KEYS) {
      const cell = (raw[key] ?? '').trim();
      if (isStorableText(cell)) input[key] = cell;
      else {
        errors.push({ row, column: columnOf(key), message: UNSTORABLE });
        unstorable.add(key);
        input[key] = '';
      }
    }
    const parsed = rowSchema.safeParse(input);
    if (!parsed.success) {
      for (const issue of parsed.error.issues) {
        fail(issue.path[0] as ImportField, issue.message);
      }
    }

    const instant = (field: ImportField): Date | null => {
      const value = input[field]!;
      if (value === '') return null;
      const result = parseImportInstant(value, options.timeZone);
      if (typeof result === 'string') {
        fail(field, result);
        return null;
      }
      if (result.getTime() > options.now.getTime()) {
        fail(field, 'Is in the future');
        return null;
      }
      return result;
    };
    const checkedInAt = instant('checked_in_at');
    if (!input.checked_in_at) fail('checked_in_at', 'The check-in time is missing');
    // A promise may lie ahead of the import; only its format matters.
    let promisedAt: Date | null = null;
    if (input.promised_at) {
      const p = parseImportInstant(input.promised_at, options.timeZone);
      if (typeof p === 'string') fail('promised_at', p);
      else promisedAt = p;
    }
    const waitFrom = instant('parts_wait_from');
    const waitTo = instant('parts_wait_to');
    const readyAt = instant('ready_at');
    const collectedAt = instant('collected_at');

    const ref = input.external_ref!;
    if (ref) {
      const first = seenRefs.get(ref);
      if (first !== undefined) fail('external_ref', `The same job number as row ${first}`);
      else seenRefs.set(ref, row);
    }

    if (!parsed.success || errors.length > before) return;
    const v = parsed.data;

    // What the state needs, and the order of events.
    const done = v.state === 'ready' || v.state === 'collected';
    if (done && !readyAt)
      fail(
        'ready_at',
        `A job that is ${JOB_STATE_LABELS[v.state].toLowerCase()} needs its ready time`,
      );
    if (!done && readyAt)
      fail(
        'ready_at',
        `A job that is ${JOB_STATE_LABELS[v.state].toLowerCase()} has no ready time yet`,
      );
    if (v.state === 'collected' && !collectedAt)
      fail('collected_at', 'A collected job needs its collection time');
    if (v.state !== 'collected' && collectedAt)
      fail('collected_at', 'Only a collected job has a collection time');
    if (waitTo && !waitFrom) fail('parts_wait_from', 'Parts arrived, but the wait has no start');
    if (waitFrom && !waitTo && v.state !== 'waiting_parts')
      fail('parts_wait_to', 'The job is no longer waiting on parts: when did they arrive?');
    if (v.state === 'waiting_parts' && waitTo)
      fail('parts_wait_to', 'The job is still waiting on parts, so they have not arrived');
    const order: [ImportField, Date | null][] = [
      ['checked_in_at', checkedInAt],
      ['parts_wait_from', waitFrom],
      ['parts_wait_to', waitTo],
      ['ready_at', readyAt],
      ['collected_at', collectedAt],
    ];
    let last: [ImportField, Date] | null = null;
    for (const [field, at] of order) {
      if (!at) continue;
      if (last && at.getTime() < last[1].getTime()) {
        const label = IMPORT_FIELDS.find((f) => f.key === last![0])!.label.toLowerCase();
        fail(field, `Is before “${label}”`);
      }
      last = [field, at];
    }
    if (promisedAt && checkedInAt && promisedAt.getTime() < checkedInAt.getTime())
      fail('promised_at', 'Is before the check-in time');
    if (v.discount > v.labour + v.parts) fail('discount', 'Is more than labour and parts together');
    if (errors.length > before || !checkedInAt) return;

    valid.push({
      row,
      externalRef: v.external_ref,
      customer: {
        name: v.customer_name,
        phone: v.customer_phone,
        email: v.customer_email,
        reminderConsent: v.reminder_consent,
      },
      reel: {
        kind: v.reel_kind,
        maker: v.reel_maker,
        model: v.reel_model,
        size: v.reel_size,
        bearingCount: v.bearing_count,
        gearRatio: v.gear_ratio,
        useProfile: v.use_profile,
        water: v.water,
      },
      serviceType: v.service_type,
      state: v.state,
      checkedInAt,
      promisedAt,
      partsWait: waitFrom ? { from: waitFrom, to: waitTo } : null,
      readyAt,
      collectedAt,
      technicianEmail: v.technician_email,
      benchMinutes: v.bench_minutes,
      labourCents: v.labour,
      partsCents: v.parts,
      discountCents: v.discount,
      complaint: v.complaint,
      findings: v.findings,
    });
  });
  return { valid, errors };
}
