import { z } from 'zod';
import { idNumber, idParam, queryInt } from './common';

export { REMINDER_WEEKS } from '../reminders';

const weeks = queryInt(1, 26, 'Must be a whole number of weeks');

/** GET /api/reminders/due?shop=&weeks= — the shop defaults to the caller's own. */
export const dueQuery = z.object({
  shop: idParam.optional(),
  weeks: weeks.default(4),
});

export const sendInput = z.strictObject({
  shopId: idNumber.optional(),
  weeks: z
    .number({ error: 'Must be a number of weeks' })
    .int('Use whole weeks')
    .min(1, 'At least one week')
    .max(26, 'At most 26 weeks')
    .default(4),
});
export type SendInput = z.infer<typeof sendInput>;

export const batchesQuery = z.object({ shop: idParam.optional() });

/** The token of an unsubscribe link: URL-safe base64, as the reminder sender makes it. */
export const UNSUBSCRIBE_TOKEN = /^[A-Za-z0-9_-]{16,128}$/;
export const unsubscribeParams = z.object({
  token: z.string().regex(UNSUBSCRIBE_TOKEN, 'Not an unsubscribe link'),
});
