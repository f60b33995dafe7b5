import { z } from 'zod';
import { ATTRIBUTIONS, COMEBACK_STATUSES, DISMISS_REASONS, DISPOSITIONS } from '../comebacks';
import { idNumber, idParam, localDate, MAX_INT, text } from './common';

export * from '../comebacks';

// Zod schemas shared by the comeback screens and the comeback and settings route handlers.

const optionalText = (max: number, label: string) =>
  text(`${label} must be text`)
    .trim()
    .max(max, `${label} must be at most ${max} characters`)
    .transform((s) => (s ? s : null))
    .nullable()
    .optional();

/** `GET /api/comebacks?shop=&status=`. */
export const comebackListQuery = z.object({
  shop: idParam.optional(),
  status: z.enum(COMEBACK_STATUSES, { error: 'Status is open, confirmed or dismissed' }).optional(),
});
export type ComebackListQuery = z.infer<typeof comebackListQuery>;

/** `POST /api/jobs/{id}/comeback-of`: link a return job to the earlier job by hand. */
export const comebackLinkInput = z.strictObject({
  originalJobId: idNumber,
  symptom: optionalText(500, 'The symptom'),
});
export type ComebackLinkInput = z.infer<typeof comebackLinkInput>;

export const correctiveActionFromComeback = z.strictObject({
  title: text('Give the action a title')
    .trim()
    .min(3, 'Give the action a title')
    .max(160, 'At most 160 characters'),
  description: optionalText(2000, 'The description'),
  ownerId: z
    .number({ error: 'Choose who owns the action' })
    .int('Choose who owns the action')
    .min(1, 'Choose who owns the action')
    .max(MAX_INT, 'Too large'),
  dueOn: localDate,
});

/**
 * `PATCH /api/comebacks/{id}`: any part of the review. A confirmation needs an attribution, a
 * dismissal a reason; the rules that depend on the stored comeback are checked by the server.
 */
export const comebackPatch = z
  .object({
    status: z.enum(COMEBACK_STATUSES, { error: 'Choose confirm or dismiss' }).optional(),
    dismissReason: z
      .enum(DISMISS_REASONS, {
        error: 'Choose why: not the same fault, outside the window, or not our work',
      })
      .nullable()
      .optional(),
    dismissNote: optionalText(500, 'The note'),
    attribution: z.enum(ATTRIBUTIONS, { error: 'Choose an attribution' }).nullable().optional(),
    rootCauseId: idNumber.nullable().optional(),
    rootCauseNote: optionalText(1000, 'The root cause note'),
    checklistStepId: idNumber.nullable().optional(),
    disposition: z.enum(DISPOSITIONS, { error: 'Choose a disposition' }).nullable().optional(),
    symptom: optionalText(500, 'The symptom'),
    assigneeId: idNumber.nullable().optional(),
    correctiveAction: correctiveActionFromComeback.optional(),
  })
  .strict()
  .superRefine((v, ctx) => {
    if (v.status === 'dismissed' && !v.dismissReason)
      ctx.addIssue({
        code: 'custom',
        path: ['dismissReason'],
        message: 'Say why it is dismissed: not the same fault, outside the window, or not our work',
      });
    if (v.status === 'confirmed' && v.attribution === null)
      ctx.addIssue({
        code: 'custom',
        path: ['attribution'],
        message: 'A confirmed comeback needs an attribution',
      });
    if (Object.keys(v).length === 0)
      ctx.addIssue({ code: 'custom', path: [], message: 'Nothing to change' });
  });
export type ComebackPatch = z.infer<typeof comebackPatch>;
export type ComebackPatchInput = z.input<typeof comebackPatch>;

export const rootCauseInput = z.strictObject({
  /** Absent for a new root cause. */
  id: idNumber.optional(),
  label: text('Name the root cause')
    .trim()
    .min(2, 'Name the root cause')
    .max(80, 'At most 80 characters'),
  active: z.boolean({ error: 'Active is true or false' }).default(true),
});

const days = (max: number) =>
  z
    .number({ error: 'Enter a whole number of days' })
    .int('Enter a whole number of days')
    .min(1, 'At least 1 day')
    .max(max, `At most ${max} days`);

/** `PUT /api/settings/comebacks`: the owner's comeback settings and root cause list, in order. */
export const comebackSettingsInput = z
  .strictObject({
    warrantyDays: days(365),
    reviewDeadlineDays: days(60),
    correctiveActionDueDays: days(180),
    countedAttributions: z
      .array(z.enum(ATTRIBUTIONS, { error: 'Unknown attribution' }), {
        error: 'Choose the attributions that count',
      })
      .min(1, 'At least one attribution must count')
      .refine((a) => new Set(a).size === a.length, 'Each attribution once'),
    rootCauses: z
      .array(rootCauseInput, { error: 'List the root causes' })
      .min(1, 'Keep at least one root cause')
      .max(40, 'At most 40 root causes'),
  })
  .superRefine((v, ctx) => {
    const seen = new Map<string, number>();
    v.rootCauses.forEach((c, i) => {
      const key = c.label.toLowerCase();
      if (seen.has(key))
        ctx.addIssue({
          code: 'custom',
          path: ['rootCauses', i, 'label'],
          message: 'Another root cause has this name',
        });
      else seen.set(key, i);
    });
    const ids = v.rootCauses.flatMap((c) => (c.id === undefined ? [] : [c.id]));
    if (new Set(ids).size !== ids.length)
      ctx.addIssue({
        code: 'custom',
        path: ['rootCauses'],
        message: 'A root cause is listed twice',
      });
    if (!v.rootCauses.some((c) => c.active))
      ctx.addIssue({
        code: 'custom',
        path: ['rootCauses'],
        message: 'Keep at least one root cause active',
      });
  });
export type ComebackSettingsInput = z.infer<typeof comebackSettingsInput>;
