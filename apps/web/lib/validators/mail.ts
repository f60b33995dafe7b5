import { z } from 'zod';
import { idNumber } from './common';

/** `GET /api/dev/mail?to=`: only what went to this address. */
export const caughtMailQuery = z.object({ to: z.email('Give an e-mail address').optional() });

/** `POST /api/mail/resend`: put one undelivered (dead) message back in the outbox. */
export const resendMailInput = z.strictObject({ id: idNumber });

/** `PUT /api/settings/reminders`: whether the weekly service-reminder run goes out. */
export const reminderSettingsInput = z.strictObject({
  weeklyReminders: z.boolean({ error: 'Must be true or false' }),
});
