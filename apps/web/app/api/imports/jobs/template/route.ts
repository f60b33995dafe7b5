// GET /api/imports/jobs/template – a CSV template for the job import: the headings and two example rows
import { importTemplateCsv } from '~/lib/import-template';
import { route } from '~/server/api';
import { otherMethods } from '~/server/method-not-allowed';

export const GET = route(
  { permission: 'jobs:import' },
  async () =>
    new Response(importTemplateCsv(), {
      headers: {
        'content-type': 'text/csv; charset=utf-8',
        'content-disposition': 'attachment; filename="reelwright-job-import-template.csv"',
      },
    }),
);

export const { DELETE, PATCH, POST, PUT, OPTIONS } = otherMethods(['GET']);
