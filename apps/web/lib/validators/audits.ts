import { AQLS } from '@reelwright/metrics';
import { z } from 'zod';
import {
  ANSWER_RESULTS,
  CORRECTIVE_ACTION_STATUSES,
  INSPECTION_LEVELS,
  ROUND_STATUSES,
  roundPeriodError,
} from '../audits';
import { idNumber, idParam, localDate, text } from './common';

export * from '../audits';
export { localDate };

// Zod schemas shared by the audit screens and the audit and corrective-action route handlers.

const isAql = (v: number) => AQLS.some((a) => Math.abs(a - v) <= a * 1e-9);
const AQL_MESSAGE = `Choose one of the standard's AQLs: ${AQLS.join(', ')}`;
/** In a query string: a plain decimal such as 0.65. */
const aqlText = z
  .string({ error: 'Choose an AQL' })
  .regex(/^\d{1,3}(\.\d{1,3})?$/, { error: AQL_MESSAGE, abort: true })
  .transform(Number)
  .refine(isAql, AQL_MESSAGE);
/** In a JSON body: a number. */
const aqlNumber = z.number({ error: 'Choose an AQL' }).refine(isAql, AQL_MESSAGE);

const level = z.enum(INSPECTION_LEVELS, { error: 'Choose an inspection level' });

function checkPeriod(value: { from: string; to: string }, ctx: z.RefinementCtx) {
  const message = roundPeriodError(value.from, value.to);
  if (message) ctx.addIssue({ code: 'custom', path: ['to'], message });
}

/** Query of GET /api/audit-rounds/preview: what a round for this shop and period would be. */
export const planPreviewQuery = z
  .object({
    shopId: idParam,
    from: localDate,
    to: localDate,
    aql: aqlText.optional(),
    level: level.optional(),
  })
  .superRefine(checkPeriod);
export type PlanPreviewQuery = z.infer<typeof planPreviewQuery>;

/** Body of POST /api/audit-rounds. */
export const planRoundInput = z
  .strictObject({
    shopId: idNumber,
    from: localDate,
    to: localDate,
    aql: aqlNumber.optional(),
    level: level.optional(),
    auditorId: idNumber,
  })
  .superRefine(checkPeriod);
export type PlanRoundInput = z.infer<typeof planRoundInput>;

export const roundListQuery = z.object({
  shopId: idParam.optional(),
  status: z.enum(ROUND_STATUSES).optional(),
});
export type RoundListQuery = z.infer<typeof roundListQuery>;

export const roundSampleParams = z.object({ id: idParam, jobId: idParam });
export const samplePhotoParams = roundSampleParams.extend({ photoId: idParam });

const NOTE_MAX = 2000;

export const sampleAnswer = z.strictObject({
  itemId: idNumber,
  result: z.enum(ANSWER_RESULTS, { error: 'Choose pass, fail or not applicable' }),
  note: text().trim().max(NOTE_MAX, `At most ${NOTE_MAX} characters`).optional(),
});

/**
 * Body of PUT /api/audit-rounds/{id}/samples/{jobId}: the auditor's answers so far. `final`
 * finishes the sample: every item answered, and every failed item says what was wrong.
 */
export const sampleAnswersInput = z
  .object({
    answers: z.array(sampleAnswer).max(200),
    note: text().trim().max(NOTE_MAX, `At most ${NOTE_MAX} characters`).optional(),
    final: z.boolean().optional(),
  })
  .strict()
  .superRefine((value, ctx) => {
    const seen = new Set<number>();
    value.answers.forEach((answer, i) => {
      if (seen.has(answer.itemId))
        ctx.addIssue({ code: 'custom', path: ['answers', i, 'itemId'], message: 'Answered twice' });
      seen.add(answer.itemId);
      if (value.final && answer.result === 'fail' && !answer.note)
        ctx.addIssue({
          code: 'custom',
          path: ['answers', i, 'note'],
          message: 'Say what was wrong with a failed item',
        });
    });
  });
export type SampleAnswersInput = z.infer<typeof sampleAnswersInput>;

export const correctiveActionListQuery = z.object({
  shopId: idParam.optional(),
  status: z.enum(CORRECTIVE_ACTION_STATUSES).optional(),
});
export type CorrectiveActionListQuery = z.infer<typeof correctiveActionListQuery>;

const correctiveActionFields = {
  status: z.enum(CORRECTIVE_ACTION_STATUSES, { error: 'Not a status' }).optional(),
  resolutionNote: text().trim().max(NOTE_MAX, `At most ${NOTE_MAX} characters`).optional(),
  description: text()
    .trim()
    .min(1, 'Describe the action')
    .max(NOTE_MAX, `At most ${NOTE_MAX} characters`)
    .optional(),
  dueOn: localDate.optional(),
  ownerId: idNumber.nullable().optional(),
};

const somethingToChange = (v: Record<string, unknown>) =>
  Object.entries(v).some(([k, x]) => k !== 'id' && x !== undefined);

/** Body of PATCH /api/corrective-actions/{id}. */
export const correctiveActionPatch = z
  .object(correctiveActionFields)
  .strict()
  .refine(somethingToChange, 'Nothing to change');
export type CorrectiveActionPatch = z.infer<typeof correctiveActionPatch>;

/** Body of PATCH /api/corrective-actions: the same, with the id in the body. */
export const correctiveActionPatchWithId = z
  .object({ id: idNumber, ...correctiveActionFields })
  .strict()
  .refine(somethingToChange, 'Nothing to change');

export const auditFormItemInput = z.strictObject({
  code: text()
    .trim()
    .regex(
      /^[a-z][a-z0-9_]*(\.[a-z0-9_]+)*$/,
      'Lower-case words joined by dots, e.g. drag.serviced',
    )
    .max(60),
  title: text().trim().min(3, 'Give the item a title').max(200),
  guidance: text().trim().max(500).optional(),
  weight: z
    .number({ error: 'Enter a weight' })
    .int('A whole number')
    .min(1, 'At least 1')
    .max(100, 'At most 100'),
  critical: z.boolean(),
});

/** Body of POST /api/audit-forms: the next version of the audit form. */
export const auditFormInput = z
  .object({
    title: text().trim().min(3, 'Give the form a title').max(200),
    items: z.array(auditFormItemInput).min(1, 'The form needs at least one item').max(60),
  })
  .strict()
  .superRefine((value, ctx) => {
    const seen = new Set<string>();
    value.items.forEach((item, i) => {
      if (seen.has(item.code))
        ctx.addIssue({ code: 'custom', path: ['items', i, 'code'], message: 'Codes must differ' });
      seen.add(item.code);
    });
  });
export type AuditFormInput = z.infer<typeof auditFormInput>;
