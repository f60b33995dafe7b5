import { z } from 'zod';
import {
  IMPORT_FIELD_KEYS,
  IMPORT_FIELDS,
  REQUIRED_IMPORT_FIELDS,
  type ImportField,
} from '../import-columns';
import { text } from './common';

export * from '../import-columns';

/** Field → file header; a field left out is not in the file. */
export const columnMappingSchema = z
  .partialRecord(z.enum(IMPORT_FIELD_KEYS as [ImportField, ...ImportField[]]), text().min(1))
  .superRefine((mapping, ctx) => {
    for (const key of REQUIRED_IMPORT_FIELDS) {
      if (!mapping[key]) {
        const label = IMPORT_FIELDS.find((f) => f.key === key)!.label;
        ctx.addIssue({ code: 'custom', path: [key], message: `Choose the column for “${label}”` });
      }
    }
  });
export type ColumnMapping = z.infer<typeof columnMappingSchema>;
