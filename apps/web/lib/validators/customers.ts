import { z } from 'zod';
import { text } from './common';

/** `GET /api/customers?query=`: part of a name, phone number or e-mail address. */
export const customerSearchQuery = z.object({
  query: text('Enter at least 2 characters')
    .trim()
    .min(2, 'Enter at least 2 characters')
    .max(100, 'At most 100 characters'),
});
export type CustomerSearchQuery = z.infer<typeof customerSearchQuery>;
