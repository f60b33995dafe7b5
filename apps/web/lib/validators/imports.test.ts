import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { parseImportInstant, rowShapeErrors, validateImportRows } from './imports';
import {
  columnMappingSchema,
  guessMapping,
  IMPORT_FIELD_KEYS,
  type ImportField,
} from './import-columns';

const blank = () =>
  Object.fromEntries(IMPORT_FIELD_KEYS.map((k) => [k, ''])) as Record<ImportField, string>;
const good = (over: Partial<Record<ImportField, string>> = {}) => ({
  ...blank(),
  external_ref: 'A-1',
  customer_name: 'Rowan Tillery',
  customer_email: 'Rowan@Example.test',
  reel_kind: 'Lever-drag',
  reel_maker: 'Tidewake',
  reel_model: 'Seaspin',
  service_type: 'Tune-up',
  state: 'Collected',
  checked_in_at: '2025-03-03 10:15',
  parts_wait_from: '2025-03-04 11:00',
  parts_wait_to: '2025-03-06 09:30',
  ready_at: '2025-03-06 15:40',
  collected_at: '2025-03-08 12:05',
  labour: '$1,045.50',
  parts: '12.5',
  discount: '',
  ...over,
});
const options = {
  timeZone: 'America/New_York',
  now: new Date('2026-01-01T00:00:00Z'),
  mapping: { external_ref: 'Job no', checked_in_at: 'In', ready_at: 'Done', labour: 'Labour $' },
};

describe('job import: one row', () => {
  it('reads labels or API words, amounts as exact cents, and shop-local times', () => {
    const { valid, errors } = validateImportRows([good()], options);
    expect(errors).toEqual([]);
    expect(valid[0]).toMatchObject({
      row: 2,
      externalRef: 'A-1',
      customer: { name: 'Rowan Tillery', email: 'rowan@example.test', reminderConsent: false },
      reel: { kind: 'lever_drag', useProfile: 'light', water: 'fresh' },
      serviceType: 'tune_up',
      state: 'collected',
      labourCents: 104_550,
      partsCents: 1_250,
      discountCents: 0,
      // 10:15 in New York on 3 March 2025 (EST, UTC−5)
      checkedInAt: new Date('2025-03-03T15:15:00Z'),
      partsWait: { from: new Date('2025-03-04T16:00:00Z'), to: new Date('2025-03-06T14:30:00Z') },
    });
  });

  it('places local times on the right side of a daylight-saving change', () => {
    // US clocks went forward on 9 March 2025: 08:00 is EST on the 8th and EDT on the 10th.
    expect(parseImportInstant('2025-03-08 08:00', 'America/New_York')).toEqual(
      new Date('2025-03-08T13:00:00Z'),
    );
    expect(parseImportInstant('2025-03-10 08:00', 'America/New_York')).toEqual(
      new Date('2025-03-10T12:00:00Z'),
    );
    expect(parseImportInstant('2025-03-10T08:00:00+02:00', 'America/New_York')).toEqual(
      new Date('2025-03-10T06:00:00Z'),
    );
    expect(parseImportInstant('2025-02-30', 'America/New_York')).toBe(
      '“2025-02-30” is not a real date and time',
    );
    expect(parseImportInstant('03/10/2025', 'America/New_York')).toBe(
      '“03/10/2025” is not a date like 2025-03-14 or 2025-03-14 10:30',
    );
  });
});

describe('job import: every problem, by row and column', () => {
  it('lists each bad field with the file’s own heading and a reason', () => {
    const rows = [
      good(),
      good({
        external_ref: 'A-2',
        customer_name: '',
        reel_kind: 'trolling',
        labour: '12,34',
        checked_in_at: '2025-13-01',
      }),
      good({ external_ref: 'A-3', state: 'ready', ready_at: '', collected_at: '' }),
      good({ external_ref: 'A-1' }),
      good({ external_ref: 'A-5', ready_at: '2025-03-02 09:00' }),
      good({ external_ref: 'A-6', checked_in_at: '2031-01-01' }),
      good({ external_ref: 'A-7', discount: '2000' }),
    ];
    const { valid, errors } = validateImportRows(rows, options);
    expect(valid.map((r) => r.row)).toEqual([2]);
    expect(errors).toEqual([
      { row: 3, column: 'customer_name', message: 'The customer’s name is missing' },
      {
        row: 3,
        column: 'reel_kind',
        message:
          '“trolling” is not one of: spinning, baitcasting, conventional, lever-drag, fly, spincast',
      },
      { row: 3, column: 'Labour $', message: '“12,34” is not an amount like 45.00' },
      { row: 3, column: 'In', message: '“2025-13-01” is not a real date and time' },
      { row: 4, column: 'Done', message: 'A job that is ready for pickup needs its ready time' },
      { row: 5, column: 'Job no', message: 'The same job number as row 2' },
      { row: 6, column: 'Done', message: 'Is before “parts arrived”' },
      { row: 7, column: 'In', message: 'Is in the future' },
      { row: 8, column: 'discount', message: 'Is more than labour and parts together' },
    ]);
  });

  it('checks that the times fit the state', () => {
    const { errors } = validateImportRows(
      [
        good({ state: 'on the bench', collected_at: '' }),
        good({ external_ref: 'B', state: 'waiting on parts', ready_at: '', collected_at: '' }),
        good({ external_ref: 'C', state: 'ready', parts_wait_to: '', collected_at: '' }),
      ],
      options,
    );
    expect(errors.map((e) => [e.row, e.column, e.message])).toEqual([
      [2, 'Done', 'A job that is on the bench has no ready time yet'],
      [3, 'parts_wait_to', 'The job is still waiting on parts, so they have not arrived'],
      [4, 'parts_wait_to', 'The job is no longer waiting on parts: when did they arrive?'],
    ]);
  });
});

describe('job import: the shape of each row', () => {
  it('names rows with a stray or missing comma', () => {
    const csv = 'a,b,c\n1,2,3\n1,2,3,4\n1,2\n"1,5",2,3\n';
    const parsed = Papa.parse<Record<string, string>>(csv, { header: true, skipEmptyLines: true });
    expect(rowShapeErrors(parsed.data, parsed.meta.fields!)).toEqual([
      {
        row: 3,
        message:
          'Has 4 cells but the headings have 3: look for a stray or missing comma (quote text that contains commas)',
      },
      {
        row: 4,
        message:
          'Has 2 cells but the headings have 3: look for a stray or missing comma (quote text that contains commas)',
      },
    ]);
  });
});

describe('job import: column mapping', () => {
  it('guesses columns from headings by key or label, ignoring case and punctuation', () => {
    expect(guessMapping(['External Ref', 'Customer name', 'READY-AT', 'Reel kind', 'x'])).toEqual({
      external_ref: 'External Ref',
      customer_name: 'Customer name',
      ready_at: 'READY-AT',
      reel_kind: 'Reel kind',
    });
  });

  it('requires a column for every required field', () => {
    const result = columnMappingSchema.safeParse({ external_ref: 'Job no' });
    expect(result.success).toBe(false);
    expect(result.error!.issues.map((i) => i.path.join('.'))).toEqual([
      'customer_name',
      'reel_kind',
      'reel_maker',
      'reel_model',
      'service_type',
      'state',
      'checked_in_at',
    ]);
  });
});
