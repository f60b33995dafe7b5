import { z } from 'zod';
import { JOB_STATES, type JobState } from '../labels';
import {
  cents,
  idNumber,
  idParam,
  localDate,
  optionalText,
  queryInt,
  text,
  wholeNumber,
} from './common';

import { PAGE_SIZES, REEL_KINDS, SERVICE_TYPES, SORTS } from '../jobs';

export {
  NEXT_STATES,
  OPEN_STATES,
  canMove,
  PAGE_SIZES,
  parseMoney,
  REEL_KINDS,
  SERVICE_TYPES,
  type JobSort,
  type ReelKind,
  type ServiceType,
} from '../jobs';

/** `GET /api/jobs` query; the bench list keeps the same keys in its URL. */
export const jobListQuery = z
  .object({
    page: queryInt(1, 100_000, 'Pages start at 1').default(1),
    pageSize: queryInt(1, 100)
      .refine((n) => (PAGE_SIZES as readonly number[]).includes(n), 'Page size is 25, 50 or 100')
      .default(25),
    sort: z.enum(SORTS).default('checkedInAt'),
    dir: z.enum(['asc', 'desc']).default('desc'),
    /** Comma-separated states; none means every state. */
    state: text()
      .optional()
      .transform((s, ctx) => {
        if (!s) return undefined;
        const list = s.split(',').filter(Boolean);
        for (const v of list) {
          if (!(JOB_STATES as readonly string[]).includes(v)) {
            ctx.addIssue({ code: 'custom', message: `Unknown state "${v}"` });
            return z.NEVER;
          }
        }
        return list as JobState[];
      }),
    shopId: idParam.optional(),
    technicianId: idParam.optional(),
    service: z.enum(SERVICE_TYPES).optional(),
    from: localDate.optional(),
    to: localDate.optional(),
    /** Only jobs that have sat in their current (open) state longer than this many days. */
    waitingDays: queryInt(1, 365, 'A whole number of days').optional(),
    q: optionalText(100, 'Search'),
  })
  .refine((v) => !v.from || !v.to || v.from <= v.to, {
    message: 'The end date must not be before the start date',
    path: ['to'],
  });
export type JobListQuery = z.infer<typeof jobListQuery>;
export type JobListParams = z.input<typeof jobListQuery>;

export const customerInput = z.strictObject({
  name: text().trim().min(1, 'Enter the customer’s name').max(120),
  phone: optionalText(40, 'Phone').refine(
    (s) => !s || /^[0-9+() .-]{5,40}$/.test(s),
    'Digits, spaces and + ( ) - only',
  ),
  email: z
    .union([z.literal(''), z.email('Enter a valid e-mail address').trim().toLowerCase()])
    .transform((s) => (s ? s : undefined))
    .optional(),
  reminderConsent: z.boolean().default(false),
});

export const reelInput = z.strictObject({
  kind: z.enum(REEL_KINDS, { error: 'Choose the kind of reel' }),
  maker: text().trim().min(1, 'Enter the maker').max(80),
  model: text().trim().min(1, 'Enter the model').max(80),
  size: optionalText(20, 'Size'),
  bearingCount: wholeNumber(0, 40).optional(),
  gearRatio: optionalText(10, 'Gear ratio').refine(
    (s) => !s || /^\d{1,2}(\.\d{1,2})?:1$/.test(s),
    'Write it as printed, e.g. 6.2:1',
  ),
  /** As printed on the reel; with maker and model it recognises the reel at any shop. */
  serialNumber: optionalText(40, 'Serial number'),
  useProfile: z.enum(['light', 'heavy']).default('light'),
  water: z.enum(['salt', 'fresh']).default('fresh'),
});

export const checkInInput = z.strictObject({
  customer: z.union([z.strictObject({ id: idNumber }), customerInput]),
  reel: z.union([z.strictObject({ id: idNumber }), reelInput]),
  serviceType: z.enum(SERVICE_TYPES, { error: 'Choose a service' }),
  complaint: optionalText(2000, 'Complaint'),
  condition: optionalText(2000, 'Condition'),
  technicianId: idNumber.optional(),
  /** Local date in the shop's zone; the promise is the shop's closing time that day. */
  promisedOn: localDate,
});
export type CheckInInput = z.infer<typeof checkInInput>;

export const jobPatch = z
  .strictObject({
    findings: text().trim().max(4000).nullable().optional(),
    complaint: text().trim().max(2000).nullable().optional(),
    condition: text().trim().max(2000).nullable().optional(),
    technicianId: idNumber.nullable().optional(),
    promisedOn: localDate.optional(),
    /** Sets the labour charge: bench time × posted rate, or the service's flat price. */
    labourBasis: z.enum(['bench_time', 'flat_price']).optional(),
    discountCents: cents(10_000_000).optional(),
  })
  .refine((v) => Object.values(v).some((x) => x !== undefined), 'Nothing to change');
export type JobPatch = z.infer<typeof jobPatch>;

export const transitionInput = z.strictObject({
  to: z.enum(JOB_STATES, { error: 'Unknown state' }),
  /** Why required checklist steps are unticked when marking ready. */
  reason: optionalText(1000, 'Reason'),
  note: optionalText(500, 'Note'),
});
export type TransitionInput = z.infer<typeof transitionInput>;

export const benchSessionInput = z.union([
  z.strictObject({ action: z.enum(['start', 'stop']) }),
  z.strictObject({
    minutes: z
      .number({ error: 'Minutes as a whole number' })
      .int('Minutes as a whole number')
      .min(1, 'At least 1 minute')
      .max(720, 'At most 720 minutes (12 hours) at once'),
    note: optionalText(200, 'Note'),
  }),
]);
export type BenchSessionInput = z.infer<typeof benchSessionInput>;

export const partInput = z.strictObject({
  name: text().trim().min(1, 'Enter the part’s name').max(120),
  partNumber: optionalText(40, 'Part number'),
  quantity: wholeNumber(1, 999),
  unitPriceCents: cents(1_000_000, 'Enter a price in whole cents').max(
    1_000_000,
    'At most $10,000',
  ),
});
export type PartInput = z.infer<typeof partInput>;

export const partParams = z.object({ id: idParam, partId: idParam });

export const checklistInput = z.strictObject({
  stepIds: z.array(idNumber).max(200),
});
export type ChecklistInput = z.infer<typeof checklistInput>;
