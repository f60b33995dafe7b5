// The CSV import of past jobs, its columns: the fields a file's columns map to, with their labels
// and hints (the template and the mapping screen show them), the file limits, and the mapping
// guess; free of zod, so that the page in the browser can use them.

export const IMPORT_FIELDS = [
  {
    key: 'external_ref',
    label: 'Job number in the old system',
    required: true,
    example: 'OLD-10231',
    hint: 'Unique per job; a job already imported with this number is refused.',
  },
  { key: 'customer_name', label: 'Customer name', required: true, example: 'Rowan Tillery' },
  { key: 'customer_phone', label: 'Customer phone', required: false, example: '207 555 0143' },
  {
    key: 'customer_email',
    label: 'Customer e-mail',
    required: false,
    example: 'rowan@example.test',
  },
  {
    key: 'reminder_consent',
    label: 'Agreed to reminders',
    required: false,
    example: 'yes',
    hint: 'yes or no; empty means no.',
  },
  {
    key: 'reel_kind',
    label: 'Reel kind',
    required: true,
    example: 'spinning',
    hint: 'spinning, baitcasting, conventional, lever-drag, fly or spincast.',
  },
  { key: 'reel_maker', label: 'Reel maker', required: true, example: 'Tidewake' },
  { key: 'reel_model', label: 'Reel model', required: true, example: 'Seaspin' },
  { key: 'reel_size', label: 'Reel size', required: false, example: '4000' },
  { key: 'bearing_count', label: 'Bearing count', required: false, example: '6' },
  { key: 'gear_ratio', label: 'Gear ratio', required: false, example: '6.2:1' },
  {
    key: 'use_profile',
    label: 'Use (light or heavy)',
    required: false,
    example: 'heavy',
    hint: 'Empty means light.',
  },
  {
    key: 'water',
    label: 'Water (salt or fresh)',
    required: false,
    example: 'salt',
    hint: 'Empty means fresh.',
  },
  {
    key: 'service_type',
    label: 'Service',
    required: true,
    example: 'tune-up',
    hint: 'tune-up, overhaul, repair or parts install.',
  },
  {
    key: 'state',
    label: 'State',
    required: true,
    example: 'collected',
    hint: 'checked in, on the bench, waiting on parts, ready for pickup or collected.',
  },
  {
    key: 'checked_in_at',
    label: 'Checked in',
    required: true,
    example: '2025-03-03 10:15',
    hint: 'YYYY-MM-DD HH:mm in the shop’s time, or ISO 8601 with an offset.',
  },
  { key: 'promised_at', label: 'Promised', required: false, example: '2025-03-07 17:00' },
  {
    key: 'parts_wait_from',
    label: 'Waiting on parts from',
    required: false,
    example: '2025-03-04 11:00',
  },
  {
    key: 'parts_wait_to',
    label: 'Parts arrived',
    required: false,
    example: '2025-03-06 09:30',
  },
  {
    key: 'ready_at',
    label: 'Ready for pickup',
    required: false,
    example: '2025-03-06 15:40',
    hint: 'Needed for ready and collected jobs.',
  },
  {
    key: 'collected_at',
    label: 'Collected',
    required: false,
    example: '2025-03-08 12:05',
    hint: 'Needed for collected jobs.',
  },
  {
    key: 'technician_email',
    label: 'Technician’s e-mail',
    required: false,
    example: 'tech.marram@saltwick.test',
    hint: 'Someone who works at your shop in Reelwright.',
  },
  { key: 'bench_minutes', label: 'Bench minutes', required: false, example: '75' },
  {
    key: 'labour',
    label: 'Labour charged',
    required: false,
    example: '45.00',
    hint: 'Dollars and cents; empty means 0.',
  },
  { key: 'parts', label: 'Parts charged', required: false, example: '12.50' },
  { key: 'discount', label: 'Discount', required: false, example: '0.00' },
  {
    key: 'complaint',
    label: 'Customer’s complaint',
    required: false,
    example: 'Drag slips under load',
  },
  {
    key: 'findings',
    label: 'Findings',
    required: false,
    example: 'Drag washers glazed; replaced',
  },
] as const satisfies readonly {
  key: string;
  label: string;
  required: boolean;
  example: string;
  hint?: string;
}[];

export type ImportField = (typeof IMPORT_FIELDS)[number]['key'];
export const IMPORT_FIELD_KEYS = IMPORT_FIELDS.map((f) => f.key) as ImportField[];
export const REQUIRED_IMPORT_FIELDS = IMPORT_FIELDS.filter((f) => f.required).map((f) => f.key);

/** Most rows one file may hold. */
export const IMPORT_MAX_ROWS = 100_000;
export const IMPORT_MAX_BYTES = 50 * 1024 * 1024;

/** A file header → field guess: same words, ignoring case, spaces, dashes and underscores. */
export function guessMapping(headers: readonly string[]): Partial<Record<ImportField, string>> {
  const norm = (s: string) => s.toLowerCase().replace(/[^a-z0-9]/g, '');
  const byNorm = new Map(headers.map((h) => [norm(h), h]));
  const mapping: Partial<Record<ImportField, string>> = {};
  for (const field of IMPORT_FIELDS) {
    const hit = byNorm.get(norm(field.key)) ?? byNorm.get(norm(field.label));
    if (hit) mapping[field.key] = hit;
  }
  return mapping;
}
