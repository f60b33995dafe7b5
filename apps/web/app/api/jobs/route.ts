// GET, POST /api/jobs – one page of the caller's shops' jobs (filters, sorting, paging); check a reel in
import { checkInInput, jobListQuery } from '~/lib/validators/jobs';
import { route } from '~/server/api';
import { checkIn } from '~/server/bench/check-in';
import { getJobDetail, listJobs } from '~/server/queries/bench';

export const GET = route(
  { permission: 'jobs:read', query: jobListQuery },
  async ({ principal, query }) => listJobs(principal, query),
);

export const POST = route(
  { permission: 'jobs:write', body: checkInInput },
  async ({ principal, body }) => {
    const { id } = await checkIn(principal, body);
    return Response.json(await getJobDetail(principal, id), {
      status: 201,
      headers: { location: `/api/jobs/${id}` },
    });
  },
);
