import { jobTurnaround, type ShopCalendar } from '@reelwright/metrics';
import Papa from 'papaparse';
import type { JobState } from '~/lib/labels';
import {
  IMPORT_FIELD_KEYS,
  IMPORT_MAX_ROWS,
  type ColumnMapping,
  type ImportField,
} from '~/lib/validators/import-columns';
import {
  rowShapeErrors,
  validateImportRows,
  type ImportRowError,
  type ParsedImportRow,
} from '~/lib/validators/imports';
import { localDate } from '../bench/calendar';

// The CPU-bound part of a CSV job import, with no database: reading the file, checking every row
// and working out what each job's rows will hold. The web server runs it in a worker thread
// (check-thread.ts), so a large file does not hold other requests up; tests call it directly.

export interface CheckInput {
  bytes: Uint8Array;
  mapping: ColumnMapping;
  timeZone: string;
  calendar: ShopCalendar;
  /** Nothing in the file may happen after this instant. */
  now: Date;
}

export interface TimelineStep {
  fromState: JobState | null;
  toState: JobState;
  at: Date;
}

/** A row that passed, with what storing it needs and the database does not decide. */
export interface CheckedRow extends ParsedImportRow {
  timeline: TimelineStep[];
  turnaround: { customerMinutes: number; benchMinutes: number; waitingMinutes: number } | null;
  /** The shop-local dates the job was ready and collected on. */
  readyDay: string | null;
  collectedDay: string | null;
}

export interface CheckResult {
  /** Mapped fields whose heading the file does not have: [field, heading]. */
  missing: [string, string][];
  rowCount: number;
  valid: CheckedRow[];
  errors: ImportRowError[];
}

/**
 * Rows per message from the checking thread (check.worker.ts): decoding one takes the server's
 * thread a few milliseconds, so requests answered between pieces are not held up (with a thousand
 * a piece, the bench list waited up to 440 ms while the rows came over).
 */
export const CHECKED_PIECE = 200;

export type CheckMessage =
  { rows: CheckedRow[] } | { done: Omit<CheckResult, 'valid'> } | { failed: string };

const CHECK_BATCH = 1000;

export function checkFile(input: CheckInput): CheckResult {
  const { mapping, timeZone, now } = input;
  const text = new TextDecoder('utf-8').decode(input.bytes).replace(/^\uFEFF/, '');
  const parsed = Papa.parse<Record<string, string>>(text, {
    header: true,
    skipEmptyLines: 'greedy',
    transformHeader: (h) => h.trim(),
  });
  const headers = parsed.meta.fields ?? [];
  const missing = Object.entries(mapping).filter(([, header]) => !headers.includes(header));
  const rowCount = parsed.data.length;
  const valid: CheckedRow[] = [];
  const errors: ImportRowError[] = [];
  if (missing.length || rowCount > IMPORT_MAX_ROWS) return { missing, rowCount, valid, errors };

  const seenRefs = new Map<string, number>();
  for (let offset = 0; offset < rowCount; offset += CHECK_BATCH) {
    const records = parsed.data.slice(offset, offset + CHECK_BATCH);
    const rows = records.map((record) => {
      const row: Partial<Record<ImportField, string>> = {};
      for (const key of IMPORT_FIELD_KEYS) {
        const header = mapping[key];
        if (header) row[key] = record[header] ?? '';
      }
      return row;
    });
    const checked = validateImportRows(rows, {
      timeZone,
      now,
      mapping,
      seenRefs,
      rowOffset: offset,
    });
    for (const row of checked.valid) valid.push(derive(row, input.calendar));
    errors.push(...checked.errors, ...rowShapeErrors(records, headers, offset));
  }
  // Cell-count problems are reported above, row by row; other CSV problems (quotes) as Papa says.
  for (const e of parsed.errors) {
    if (e.type !== 'FieldMismatch' && e.row !== undefined) {
      errors.push({ row: e.row + 2, message: `The CSV cannot be read here: ${e.message}` });
    }
  }
  return { missing, rowCount, valid, errors };
}

function derive(row: ParsedImportRow, calendar: ShopCalendar): CheckedRow {
  return {
    ...row,
    timeline: timeline(row),
    turnaround: row.readyAt
      ? jobTurnaround(
          {
            checkedInAt: row.checkedInAt,
            readyAt: row.readyAt,
            waitingSpans: row.partsWait ? [row.partsWait] : [],
          },
          calendar,
        )
      : null,
    readyDay: row.readyAt ? localDate(row.readyAt, calendar.timeZone) : null,
    collectedDay: row.collectedAt ? localDate(row.collectedAt, calendar.timeZone) : null,
  };
}

/** The state changes an imported job went through, as far as the file tells them. */
function timeline(row: ParsedImportRow): TimelineStep[] {
  const events: TimelineStep[] = [];
  const to = (state: JobState, at: Date) =>
    events.push({ fromState: events.at(-1)?.toState ?? null, toState: state, at });
  to('checked_in', row.checkedInAt);
  if (row.state === 'checked_in') return events;
  // When work started is not in the file: the bench begins at check-in.
  to('on_bench', row.checkedInAt);
  if (row.partsWait) {
    to('waiting_parts', row.partsWait.from);
    if (row.partsWait.to) to('on_bench', row.partsWait.to);
  } else if (row.state === 'waiting_parts') {
    to('waiting_parts', row.checkedInAt);
  }
  if (row.readyAt) to('ready', row.readyAt);
  if (row.collectedAt) to('collected', row.collectedAt);
  return events;
}
