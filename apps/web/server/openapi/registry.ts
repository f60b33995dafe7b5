import { z, type ZodType } from 'zod';
import type { Permission } from '~/lib/permissions';
import {
  auditFormInput,
  correctiveActionListQuery,
  correctiveActionPatch,
  correctiveActionPatchWithId,
  planPreviewQuery,
  planRoundInput,
  roundListQuery,
  roundSampleParams,
  samplePhotoParams,
  sampleAnswersInput,
} from '~/lib/validators/audits';
import {
  comebackLinkInput,
  comebackListQuery,
  comebackPatch,
  comebackSettingsInput,
} from '~/lib/validators/comebacks';
import { idParams } from '~/lib/validators/common';
import { customerSearchQuery } from '~/lib/validators/customers';
import { columnMappingSchema } from '~/lib/validators/import-columns';
import {
  benchSessionInput,
  checkInInput,
  checklistInput,
  jobListQuery,
  jobPatch,
  partInput,
  partParams,
  transitionInput,
} from '~/lib/validators/jobs';
import { caughtMailQuery, reminderSettingsInput, resendMailInput } from '~/lib/validators/mail';
import { monthExportParams, monthParams, reopenInput } from '~/lib/validators/month-close';
import {
  comparisonQuery,
  networkTrendsQuery,
  periodQuery,
  shopTrendsQuery,
} from '~/lib/validators/network';
import { photoConfirmRequest, photoParams, photoUploadRequest } from '~/lib/validators/photos';
import { batchesQuery, dueQuery, sendInput, unsubscribeParams } from '~/lib/validators/reminders';
import {
  inviteAction,
  inviteInput,
  passwordChange,
  passwordResetConfirm,
  passwordResetRequest,
  peopleQuery,
  personPatch,
} from '~/lib/validators/people';
import {
  regionCreate,
  regionPatch,
  shopCalendarInput,
  shopCreate,
  shopPatch,
} from '~/lib/validators/shops';

// Every API route in one list: path, method, who may call it and the zod schemas its handler
// parses with. The OpenAPI document, the API reference page and the fuzz tests are built from it,
// and a test checks it against the route files under app/api.

export const METHODS = ['get', 'post', 'put', 'patch', 'delete'] as const;
export type Method = (typeof METHODS)[number];

export interface RouteSpec {
  method: Method;
  /** OpenAPI form: `/api/jobs/{id}`; the route file is app/api/jobs/[id]/route.ts. */
  path: string;
  summary: string;
  /** The permission route() checks; `public` for routes that need no sign-in. */
  permission: Permission | 'public';
  params?: ZodType;
  query?: ZodType;
  /** A JSON body (application/json), or multipart/form-data for the import. */
  body?: ZodType;
  bodyType?: 'json' | 'multipart' | 'raw';
  /** The answer on success. */
  status: number;
  /** A request the route accepts: documentation, and the base the fuzz tests corrupt. */
  example?: { params?: Record<string, string>; query?: Record<string, string>; body?: unknown };
  /** A path segment handed to a catch-all (`[...nextauth]`). */
  catchAll?: boolean;
  /** Why the fuzz tests leave a route out; they test every other one. */
  notFuzzed?: string;
}

const id = { id: '1' };
const period = { from: '2026-09-01', to: '2026-09-30' };

/** The import's multipart form, as the document describes it. */
export const importForm = z.object({
  file: z.string().meta({ format: 'binary', description: 'The CSV file (at most 50 MB)' }),
  mapping: z.string().meta({
    description: `JSON: import field → the file's column heading. ${JSON.stringify(
      z.toJSONSchema(columnMappingSchema, { io: 'input', unrepresentable: 'any' }),
    )}`,
  }),
});

export const ROUTES: readonly RouteSpec[] = [
  ...(['get', 'post', 'put', 'patch', 'delete'] as const).map((method): RouteSpec => ({
    method,
    path: '/api/{path}',
    summary: 'Any path no route answers: 404 as a problem document',
    permission: 'public',
    catchAll: true,
    status: 404,
    notFuzzed: 'answers 404 to everything; its test sends unknown paths',
  })),
  {
    method: 'get',
    path: '/api/audit-forms',
    summary: 'The current audit form and its versions',
    permission: 'audits:read',
    status: 200,
  },
  {
    method: 'post',
    path: '/api/audit-forms',
    summary: 'Publish the next version of the audit form (owner)',
    permission: 'settings:manage',
    body: auditFormInput,
    status: 201,
    example: {
      body: {
        title: 'Job audit form, version 2',
        items: [
          { code: 'drag.serviced', title: 'Drag stack serviced', weight: 10, critical: true },
          {
            code: 'bail.checked',
            title: 'Bail spring checked',
            guidance: 'Flip the bail ten times',
            weight: 5,
            critical: false,
          },
        ],
      },
    },
  },
  {
    method: 'get',
    path: '/api/audit-rounds',
    summary: 'The audit rounds the caller sees',
    permission: 'audits:read',
    query: roundListQuery,
    status: 200,
    example: { query: { shopId: '1', status: 'planned' } },
  },
  {
    method: 'post',
    path: '/api/audit-rounds',
    summary: 'Plan an audit round and draw its sample',
    permission: 'audits:plan',
    body: planRoundInput,
    status: 201,
    example: {
      body: { shopId: 1, ...period, aql: 2.5, level: 'II', auditorId: 1 },
    },
  },
  {
    method: 'get',
    path: '/api/audit-rounds/preview',
    summary: 'The lot, severity and sampling plan a round would get; draws nothing',
    permission: 'audits:plan',
    query: planPreviewQuery,
    status: 200,
    example: { query: { shopId: '1', ...period, aql: '2.5', level: 'II' } },
  },
  {
    method: 'get',
    path: '/api/audit-rounds/{id}',
    summary: 'One round: plan, seed, lot, sample, scores, decision and follow-up',
    permission: 'audits:read',
    params: idParams,
    status: 200,
    example: { params: id },
  },
  {
    method: 'post',
    path: '/api/audit-rounds/{id}/redraw-check',
    summary: 'Redraw the sample from the stored seed and lot and compare',
    permission: 'audits:read',
    params: idParams,
    status: 200,
    example: { params: id },
  },
  {
    method: 'get',
    path: '/api/audit-rounds/{id}/samples/{jobId}',
    summary: "A sampled job's record and answers",
    permission: 'audits:read',
    params: roundSampleParams,
    status: 200,
    example: { params: { id: '1', jobId: '1' } },
  },
  {
    method: 'get',
    path: '/api/audit-rounds/{id}/samples/{jobId}/photos/{photoId}',
    summary: "A sampled job's checked photo, served as the bench's photo route serves it",
    permission: 'audits:read',
    params: samplePhotoParams,
    status: 200,
    example: { params: { id: '1', jobId: '1', photoId: '1' } },
  },
  {
    method: 'put',
    path: '/api/audit-rounds/{id}/samples/{jobId}',
    summary: "Save the auditor's answers; `final` finishes the sample",
    permission: 'audits:score',
    params: roundSampleParams,
    body: sampleAnswersInput,
    status: 200,
    example: {
      params: { id: '1', jobId: '1' },
      body: {
        answers: [
          { itemId: 1, result: 'pass' },
          { itemId: 2, result: 'fail', note: 'Drag washers dry' },
        ],
        note: 'Reel looked tidy',
        final: false,
      },
    },
  },
  {
    method: 'get',
    path: '/api/auth/{nextauth}',
    summary: 'next-auth: csrf, providers, session',
    permission: 'public',
    catchAll: true,
    status: 200,
    notFuzzed: 'next-auth’s own handler; sign-in is tested end to end',
  },
  {
    method: 'post',
    path: '/api/auth/{nextauth}',
    summary: 'next-auth: credentials sign-in (`callback/credentials`), sign-out',
    permission: 'public',
    catchAll: true,
    bodyType: 'raw',
    status: 200,
    notFuzzed: 'next-auth’s own handler; sign-in is tested end to end',
  },
  {
    method: 'get',
    path: '/api/comebacks',
    summary: "The review queues of the caller's shops: open ones oldest first, then reviewed ones",
    permission: 'comebacks:read',
    query: comebackListQuery,
    status: 200,
    example: { query: { shop: '1', status: 'open' } },
  },
  {
    method: 'get',
    path: '/api/comebacks/{id}',
    summary: 'One comeback with both jobs and the redo cost',
    permission: 'comebacks:read',
    params: idParams,
    status: 200,
    example: { params: id },
  },
  {
    method: 'patch',
    path: '/api/comebacks/{id}',
    summary: 'Review a comeback, open a corrective action from it, or reassign it',
    permission: 'comebacks:review',
    params: idParams,
    body: comebackPatch,
    status: 200,
    example: {
      params: id,
      body: {
        status: 'confirmed',
        attribution: 'workmanship',
        rootCauseId: 1,
        rootCauseNote: 'Drag washers left dry',
        disposition: 'redone_free',
        correctiveAction: {
          title: 'Grease drag washers on every tune-up',
          ownerId: 1,
          dueOn: '2026-12-15',
        },
      },
    },
  },
  {
    method: 'get',
    path: '/api/corrective-actions',
    summary: "Corrective actions of the caller's shops",
    permission: 'corrective-actions:manage',
    query: correctiveActionListQuery,
    status: 200,
    example: { query: { shopId: '1', status: 'open' } },
  },
  {
    method: 'patch',
    path: '/api/corrective-actions',
    summary: 'Change one corrective action, its id in the body',
    permission: 'corrective-actions:manage',
    body: correctiveActionPatchWithId,
    status: 200,
    example: { body: { id: 1, status: 'done', resolutionNote: 'Retrained the bench' } },
  },
  {
    method: 'get',
    path: '/api/corrective-actions/{id}',
    summary: 'One corrective action',
    permission: 'corrective-actions:manage',
    params: idParams,
    status: 200,
    example: { params: id },
  },
  {
    method: 'patch',
    path: '/api/corrective-actions/{id}',
    summary: 'Move a corrective action along, verify it or edit it',
    permission: 'corrective-actions:manage',
    params: idParams,
    body: correctiveActionPatch,
    status: 200,
    example: { params: id, body: { status: 'in_progress', dueOn: '2026-12-01', ownerId: 1 } },
  },
  {
    method: 'get',
    path: '/api/customers',
    summary: "Customers of the caller's shops matching a name, phone or e-mail, with their reels",
    permission: 'jobs:read',
    query: customerSearchQuery,
    status: 200,
    example: { query: { query: 'rowan' } },
  },
  {
    method: 'get',
    path: '/api/dev/mail',
    summary: 'What the local SMTP catcher received and the outbox counts (development and tests)',
    permission: 'dev-mail:read',
    query: caughtMailQuery,
    status: 200,
    example: { query: { to: 'rowan@example.test' } },
  },
  {
    method: 'post',
    path: '/api/dev/mail/retry',
    summary: "Send the outbox's due messages now",
    permission: 'dev-mail:read',
    status: 200,
    notFuzzed: 'takes no input: there is nothing to get wrong',
  },
  {
    method: 'post',
    path: '/api/mail/resend',
    summary: 'Put an undelivered (dead) message back in the outbox and send it again (owner)',
    permission: 'settings:manage',
    body: resendMailInput,
    status: 200,
    example: { body: { id: 1 } },
  },
  {
    method: 'get',
    path: '/api/health',
    summary: 'Database driver and migrations applied; no sign-in needed',
    permission: 'public',
    status: 200,
  },
  {
    method: 'get',
    path: '/api/imports/jobs',
    summary: "The shop's recent imports",
    permission: 'jobs:import',
    status: 200,
  },
  {
    method: 'post',
    path: '/api/imports/jobs',
    summary:
      'Import a CSV of past jobs, all rows in one transaction or none (400 lists every bad row)',
    permission: 'jobs:import',
    body: importForm,
    bodyType: 'multipart',
    status: 201,
  },
  {
    method: 'get',
    path: '/api/imports/jobs/template',
    summary: 'A CSV template for the job import: the headings and two example rows',
    permission: 'jobs:import',
    status: 200,
  },
  {
    method: 'get',
    path: '/api/jobs',
    summary: "One page of the caller's shops' jobs (filters, sorting, paging)",
    permission: 'jobs:read',
    query: jobListQuery,
    status: 200,
    example: {
      query: {
        page: '1',
        pageSize: '25',
        sort: 'promisedAt',
        dir: 'asc',
        state: 'on_bench,waiting_parts',
        shopId: '1',
        technicianId: '1',
        service: 'tune_up',
        ...period,
        waitingDays: '3',
        q: 'tidewake',
      },
    },
  },
  {
    method: 'post',
    path: '/api/jobs',
    summary: 'Check a reel in',
    permission: 'jobs:write',
    body: checkInInput,
    status: 201,
    example: {
      body: {
        customer: {
          name: 'Rowan Tillery',
          phone: '207 555 0143',
          email: 'rowan@example.test',
          reminderConsent: true,
        },
        reel: {
          kind: 'spinning',
          maker: 'Tidewake',
          model: 'Seaspin',
          size: '4000',
          bearingCount: 6,
          gearRatio: '6.2:1',
          serialNumber: 'TW-4000-118',
          useProfile: 'heavy',
          water: 'salt',
        },
        serviceType: 'tune_up',
        complaint: 'Drag slips under load',
        condition: 'Salt crust on the spool',
        technicianId: 1,
        promisedOn: '2026-11-06',
      },
    },
  },
  {
    method: 'get',
    path: '/api/jobs/{id}',
    summary: 'One job with its timeline, bench time, parts and checklist',
    permission: 'jobs:read',
    params: idParams,
    status: 200,
    example: { params: id },
  },
  {
    method: 'patch',
    path: '/api/jobs/{id}',
    summary: 'Edit a job’s record and money',
    permission: 'jobs:write',
    params: idParams,
    body: jobPatch,
    status: 200,
    example: {
      params: id,
      body: {
        findings: 'Drag washers glazed; replaced',
        complaint: null,
        technicianId: 1,
        promisedOn: '2026-11-09',
        labourBasis: 'flat_price',
        discountCents: 500,
      },
    },
  },
  {
    method: 'post',
    path: '/api/jobs/{id}/bench-sessions',
    summary: "Start or stop the caller's bench timer, or log minutes by hand",
    permission: 'jobs:write',
    params: idParams,
    body: benchSessionInput,
    status: 200,
    example: { params: id, body: { minutes: 45, note: 'Stripped and cleaned' } },
  },
  {
    method: 'put',
    path: '/api/jobs/{id}/checklist',
    summary: "Replace the job's ticked checklist steps",
    permission: 'jobs:write',
    params: idParams,
    body: checklistInput,
    status: 200,
    example: { params: id, body: { stepIds: [1, 2, 3] } },
  },
  {
    method: 'get',
    path: '/api/jobs/{id}/comeback-of',
    summary: "The job's comeback flag and the reel's earlier collected jobs",
    permission: 'jobs:read',
    params: idParams,
    status: 200,
    example: { params: id },
  },
  {
    method: 'post',
    path: '/api/jobs/{id}/comeback-of',
    summary: 'Link a return job to the earlier job by hand',
    permission: 'jobs:write',
    params: idParams,
    body: comebackLinkInput,
    status: 201,
    example: { params: id, body: { originalJobId: 2, symptom: 'Drag slips again' } },
  },
  {
    method: 'post',
    path: '/api/jobs/{id}/parts',
    summary: 'Add a part line (name, part number, quantity, unit price) to a job',
    permission: 'jobs:write',
    params: idParams,
    body: partInput,
    status: 201,
    example: {
      params: id,
      body: { name: 'Drag washer set', partNumber: 'DW-3', quantity: 2, unitPriceCents: 1250 },
    },
  },
  {
    method: 'delete',
    path: '/api/jobs/{id}/parts/{partId}',
    summary: 'Remove a part line from a job',
    permission: 'jobs:write',
    params: partParams,
    status: 200,
    example: { params: { id: '1', partId: '1' } },
  },
  {
    method: 'get',
    path: '/api/jobs/{id}/photos',
    summary: "The job's photos with view URLs",
    permission: 'jobs:read',
    params: idParams,
    status: 200,
    example: { params: id },
  },
  {
    method: 'get',
    path: '/api/jobs/{id}/photos/{photoId}',
    summary: 'One checked photo: its bytes with the detected type, nosniff and a sandboxing policy',
    permission: 'jobs:read',
    params: photoParams,
    status: 200,
    example: { params: { id: '1', photoId: '1' } },
  },
  {
    method: 'post',
    path: '/api/jobs/{id}/photos',
    summary:
      'Start an upload (201 with a presigned PUT), or with `confirm` check the uploaded bytes',
    permission: 'jobs:write',
    params: idParams,
    body: z.union([photoUploadRequest, photoConfirmRequest]),
    status: 201,
    example: {
      params: id,
      body: { stage: 'teardown', contentType: 'image/jpeg', size: 120_000, fileName: 'spool.jpg' },
    },
  },
  {
    method: 'post',
    path: '/api/jobs/{id}/transitions',
    summary: 'Move a job to its next state; 409 for any other move',
    permission: 'jobs:write',
    params: idParams,
    body: transitionInput,
    status: 200,
    example: { params: id, body: { to: 'ready', reason: 'Customer declined the bail step' } },
  },
  {
    method: 'get',
    path: '/api/me',
    summary: 'The signed-in caller: id, name, role and scope',
    permission: 'account:read',
    status: 200,
  },
  {
    method: 'get',
    path: '/api/month-close/{month}',
    summary: "The month-close table of the caller's shops; `2026-11.csv` streams it as CSV",
    permission: 'month-close:read',
    params: monthExportParams,
    status: 200,
    example: { params: { month: '2026-11' } },
  },
  {
    method: 'post',
    path: '/api/month-close/{month}/close',
    summary: "Close the month for the network, freezing every shop's figures (owner)",
    permission: 'month-close:manage',
    params: monthParams,
    status: 201,
    example: { params: { month: '2026-11' } },
  },
  {
    method: 'post',
    path: '/api/month-close/{month}/invoices',
    summary:
      'Ask for one royalty invoice per shop from the closed month; a queue job issues them, never billing twice (owner)',
    permission: 'month-close:manage',
    params: monthParams,
    status: 202,
    example: { params: { month: '2026-11' } },
  },
  {
    method: 'post',
    path: '/api/month-close/{month}/reopen',
    summary: 'Reopen a closed month with a reason; the close stays on record (owner)',
    permission: 'month-close:manage',
    params: monthParams,
    body: reopenInput,
    status: 200,
    example: { params: { month: '2026-11' }, body: { reason: 'A job was priced wrongly.' } },
  },
  {
    method: 'get',
    path: '/api/network/comparison',
    summary: 'Per shop in scope: counts, figures, intervals and bands of the period',
    permission: 'network:read',
    query: comparisonQuery,
    status: 200,
    example: { query: { ...period, region: '1' } },
  },
  {
    method: 'get',
    path: '/api/network/trends',
    summary:
      'Monthly comeback estimates (95% interval; p-chart limits on final months), turnaround or revenue per bench hour for every shop',
    permission: 'network:read',
    query: networkTrendsQuery,
    status: 200,
    example: { query: { ...period, region: '1', metric: 'comebacks' } },
  },
  {
    method: 'get',
    path: '/api/openapi.json',
    summary: 'This document',
    permission: 'public',
    status: 200,
  },
  {
    method: 'get',
    path: '/api/reminders/batches',
    summary: "The shop's latest reminder batches, newest first",
    permission: 'reminders:send',
    query: batchesQuery,
    status: 200,
    example: { query: { shop: '1' } },
  },
  {
    method: 'get',
    path: '/api/reminders/batches/{id}',
    summary: 'One reminder batch with its progress',
    permission: 'reminders:send',
    params: idParams,
    status: 200,
    example: { params: id },
  },
  {
    method: 'get',
    path: '/api/reminders/due',
    summary: "Reels of the shop's customers due for a service in the coming weeks",
    permission: 'reminders:send',
    query: dueQuery,
    status: 200,
    example: { query: { shop: '1', weeks: '4' } },
  },
  {
    method: 'post',
    path: '/api/reminders/send',
    summary: "Start a batch of service reminders for the shop's due reels",
    permission: 'reminders:send',
    body: sendInput,
    status: 202,
    example: { body: { shopId: 1, weeks: 4 } },
  },
  {
    method: 'get',
    path: '/api/settings/reminders',
    summary: "Whether each shop's service reminders go out by themselves on Monday morning (owner)",
    permission: 'settings:manage',
    status: 200,
  },
  {
    method: 'put',
    path: '/api/settings/reminders',
    summary: 'Turn the weekly service-reminder run on or off (owner)',
    permission: 'settings:manage',
    body: reminderSettingsInput,
    status: 200,
    example: { body: { weeklyReminders: false } },
  },
  {
    method: 'get',
    path: '/api/settings/comebacks',
    summary: 'The warranty window, review deadline, counted attributions and root causes (owner)',
    permission: 'settings:manage',
    status: 200,
  },
  {
    method: 'put',
    path: '/api/settings/comebacks',
    summary: 'Save the comeback settings and the root cause list, in order (owner)',
    permission: 'settings:manage',
    body: comebackSettingsInput,
    status: 200,
    example: {
      body: {
        warrantyDays: 30,
        reviewDeadlineDays: 7,
        correctiveActionDueDays: 30,
        countedAttributions: ['workmanship', 'part_failure'],
        rootCauses: [
          { id: 1, label: 'Drag not greased', active: true },
          { label: 'Bail spring missed', active: false },
        ],
      },
    },
  },
  {
    method: 'get',
    path: '/api/shops',
    summary: 'The shops the caller can see, with region, time zone and counts of open work',
    permission: 'shops:read',
    status: 200,
  },
  {
    method: 'get',
    path: '/api/shops/{id}',
    summary: "One shop in the caller's scope (404 outside it)",
    permission: 'shops:read',
    params: idParams,
    status: 200,
    example: { params: id },
  },
  {
    method: 'post',
    path: '/api/shops',
    summary:
      'Open a shop: name, region, time zone, weekly hours and closed dates, posted labour rate, royalty rate and currency (owner)',
    permission: 'settings:manage',
    body: shopCreate,
    status: 201,
    example: {
      body: {
        name: 'Juniper Flats',
        regionId: 1,
        timeZone: 'America/Denver',
        weekly: {
          mon: [],
          tue: [{ open: '09:00', close: '17:00' }],
          wed: [{ open: '09:00', close: '17:00' }],
          thu: [{ open: '09:00', close: '17:00' }],
          fri: [{ open: '09:00', close: '17:00' }],
          sat: [{ open: '09:00', close: '13:00' }],
          sun: [],
        },
        closedDates: ['2026-12-25'],
        labourRateCents: 6800,
        royaltyRateBp: 600,
        currency: 'USD',
      },
    },
  },
  {
    method: 'patch',
    path: '/api/shops/{id}',
    summary:
      'Rename a shop, move it to another region, change its posted rates, or close / reopen it (owner)',
    permission: 'settings:manage',
    params: idParams,
    body: shopPatch,
    status: 200,
    example: { params: id, body: { labourRateCents: 6900 } },
  },
  {
    method: 'get',
    path: '/api/shops/{id}/calendar',
    summary: "A shop's weekly opening hours and closed dates (owner)",
    permission: 'settings:manage',
    params: idParams,
    status: 200,
    example: { params: id },
  },
  {
    method: 'put',
    path: '/api/shops/{id}/calendar',
    summary: "Save a shop's opening hours and closed dates; recomputes its turnarounds (owner)",
    permission: 'settings:manage',
    params: idParams,
    body: shopCalendarInput,
    status: 200,
    example: {
      params: id,
      body: {
        weekly: {
          mon: [{ open: '09:00', close: '17:00' }],
          tue: [
            { open: '09:00', close: '12:30' },
            { open: '13:30', close: '17:00' },
          ],
          wed: [{ open: '09:00', close: '17:00' }],
          thu: [{ open: '09:00', close: '17:00' }],
          fri: [{ open: '09:00', close: '17:00' }],
          sat: [{ open: '10:00', close: '14:00' }],
          sun: [],
        },
        closedDates: ['2026-12-25', '2027-01-01'],
      },
    },
  },
  {
    method: 'get',
    path: '/api/shops/{id}/metrics',
    summary: "One shop's figures for a period, judged against the network",
    permission: 'shops:read',
    params: idParams,
    query: periodQuery,
    status: 200,
    example: { params: id, query: period },
  },
  {
    method: 'get',
    path: '/api/shops/{id}/trends',
    summary:
      "One shop's monthly comeback estimates (95% interval; p-chart limits on final months), turnaround or revenue per bench hour",
    permission: 'shops:read',
    params: idParams,
    query: shopTrendsQuery,
    status: 200,
    example: { params: id, query: { ...period, metric: 'turnaround' } },
  },
  {
    method: 'get',
    path: '/api/users',
    summary:
      "The people the caller may see with role, scope and status (owner: everyone; regional manager: their region's)",
    permission: 'people:read',
    query: peopleQuery,
    status: 200,
    example: { query: { status: 'invited' } },
  },
  {
    method: 'post',
    path: '/api/users',
    summary: 'Invite a person by e-mail: a one-time link to set their password (owner)',
    permission: 'users:manage',
    body: inviteInput,
    status: 201,
    example: {
      body: {
        name: 'Wren Alderley',
        email: 'wren.alderley@saltwick.test',
        role: 'technician',
        shopId: 1,
      },
    },
  },
  {
    method: 'get',
    path: '/api/users/{id}',
    summary: 'One person with their pending invitation and the history of changes to them',
    permission: 'people:read',
    params: idParams,
    status: 200,
    example: { params: id },
  },
  {
    method: 'patch',
    path: '/api/users/{id}',
    summary:
      "Change a person's name, role, shop or region, or deactivate / reactivate them; ends their sessions (owner)",
    permission: 'users:manage',
    params: idParams,
    body: personPatch,
    status: 200,
    example: { params: id, body: { name: 'Ines Marlowe-Tarn' } },
  },
  {
    method: 'post',
    path: '/api/users/{id}/invite',
    summary: "Resend a person's invitation (a fresh link) or withdraw it (owner)",
    permission: 'users:manage',
    params: idParams,
    body: inviteAction,
    status: 200,
    example: { params: id, body: { action: 'resend' } },
  },
  {
    method: 'put',
    path: '/api/me/password',
    summary: 'Change your own password (the current one required); every session of yours ends',
    permission: 'account:write',
    body: passwordChange,
    status: 200,
    example: {
      body: { currentPassword: 'reelwright-demo', newPassword: 'tidewater-spool-ledger' },
    },
  },
  {
    method: 'post',
    path: '/api/auth/password-reset',
    summary:
      'Ask for a password reset link by e-mail; the same 202 whether or not the address has an account',
    permission: 'public',
    body: passwordResetRequest,
    status: 202,
    example: { body: { email: 'nobody@saltwick.test' } },
  },
  {
    method: 'post',
    path: '/api/auth/password-reset/confirm',
    summary:
      'Set a password from an invitation or reset link, once (410 when used, withdrawn or expired)',
    permission: 'public',
    body: passwordResetConfirm,
    status: 200,
    example: {
      body: {
        token: 'AAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAA',
        password: 'tidewater-spool-ledger',
      },
    },
    notFuzzed: 'the token is checked against the database only; its own tests send bad tokens',
  },
  {
    method: 'get',
    path: '/api/regions',
    summary: "The network's regions with their number of shops and their managers (owner)",
    permission: 'settings:manage',
    status: 200,
  },
  {
    method: 'post',
    path: '/api/regions',
    summary: 'Add a region (owner)',
    permission: 'settings:manage',
    body: regionCreate,
    status: 201,
    example: { body: { name: 'Estuary Coast', code: 'estuary' } },
  },
  {
    method: 'patch',
    path: '/api/regions/{id}',
    summary: 'Rename a region or make a regional manager its manager (owner)',
    permission: 'settings:manage',
    params: idParams,
    body: regionPatch,
    status: 200,
    example: { params: id, body: { name: 'North Shore and Islands' } },
  },
  {
    method: 'get',
    path: '/api/unsubscribe/{token}',
    summary: "Redirects to the opt-out page of a service reminder's link (changes nothing)",
    permission: 'public',
    params: unsubscribeParams,
    example: { params: { token: 'abcdefghijklmnopqrstuv' } },
    status: 303,
    notFuzzed: 'the token is checked against the database only; its own tests send bad tokens',
  },
  {
    method: 'post',
    path: '/api/unsubscribe/{token}',
    summary:
      'One-click opt-out from service reminders (RFC 8058): a form body List-Unsubscribe=One-Click',
    permission: 'public',
    params: unsubscribeParams,
    example: { params: { token: 'abcdefghijklmnopqrstuv' } },
    bodyType: 'raw',
    status: 200,
    notFuzzed: 'a form body per RFC 8058: its own tests send wrong bodies, types and tokens',
  },
  {
    method: 'post',
    path: '/api/webhooks/payments',
    summary: 'Payment-provider webhook: verifies the signature, records paid and failed invoices',
    permission: 'public',
    bodyType: 'raw',
    status: 200,
    notFuzzed: 'signed raw body: its own tests send bad signatures, stale stamps and bad JSON',
  },
];

/** The route file of a document path: `/api/jobs/{id}` → `jobs/[id]/route.ts` under app/api. */
export function routeFileOf(spec: Pick<RouteSpec, 'path' | 'catchAll'>): string {
  const segments = spec.path
    .replace(/^\/api\//, '')
    .split('/')
    .map((s) => {
      const m = /^\{(.+)\}$/.exec(s);
      if (!m) return s;
      return spec.catchAll ? `[...${m[1]}]` : `[${m[1]}]`;
    });
  return `${segments.join('/')}/route.ts`;
}
