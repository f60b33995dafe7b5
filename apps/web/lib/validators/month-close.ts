import { z } from 'zod';
import { month, text } from './common';

export { month };

export const monthParams = z.object({ month });

/**
 * The `[month]` segment of GET /api/month-close/{month}: "2026-11" for JSON or "2026-11.csv" for
 * the CSV export (the App Router hands the suffix to the same segment).
 */
export const monthExportParams = z.object({
  month: z
    .string()
    .transform((value) => {
      const csv = value.endsWith('.csv');
      return {
        month: csv ? value.slice(0, -4) : value,
        format: csv ? ('csv' as const) : ('json' as const),
      };
    })
    .pipe(z.object({ month, format: z.enum(['json', 'csv']) })),
});

export const reopenInput = z.strictObject({
  reason: text()
    .trim()
    .min(10, 'Say in a sentence why the month is reopened (at least 10 characters)')
    .max(500, 'Keep the reason under 500 characters'),
});
export type ReopenInput = z.infer<typeof reopenInput>;
