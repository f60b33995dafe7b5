import Papa from 'papaparse';
import { IMPORT_FIELDS } from './import-columns';

/** The template a shop lead fills in: every field's heading, an example row and a job still open. */
export function importTemplateCsv(): string {
  const open: Record<string, string> = {
    external_ref: 'OLD-10232',
    customer_name: 'Mara Quillon',
    customer_email: '',
    customer_phone: '207 555 0188',
    reminder_consent: 'no',
    reel_kind: 'baitcasting',
    reel_maker: 'Brinehook',
    reel_model: 'Moorlark 25',
    reel_size: '150',
    use_profile: 'light',
    water: 'fresh',
    service_type: 'repair',
    state: 'waiting on parts',
    checked_in_at: '2025-03-05 14:20',
    parts_wait_from: '2025-03-06 10:00',
  };
  return Papa.unparse({
    fields: IMPORT_FIELDS.map((f) => f.key),
    data: [IMPORT_FIELDS.map((f) => f.example), IMPORT_FIELDS.map((f) => open[f.key] ?? '')],
  });
}
