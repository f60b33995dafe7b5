// GET, POST /api/jobs – one page of the caller's shops' jobs (filters, sorting, paging); check a reel in
import { checkInInput, jobListQuery } from '~/lib/validators/jobs';
import { route } from '~/server/api';
import { checkIn } from '~/server/bench/check-in';
import { deliverMailSoon } from '~/server/queue';
import { getJobDetail, listJobs } from '~/server/queries/bench';
import { otherMethods } from '~/server/method-not-allowed';

export const GET = route(
  { permission: 'jobs:read', query: jobListQuery },
  async ({ principal, query }) => listJobs(principal, query),
);

export const POST = route(
  { permission: 'jobs:write', body: checkInInput },
  async ({ principal, body }) => {
    const { id, emailsQueued } = await checkIn(principal, body);
    // A comeback's review e-mail goes after the commit, never awaited: mail must not hold up check-in.
    if (emailsQueued > 0) void deliverMailSoon();
    return Response.json(await getJobDetail(principal, id), {
      status: 201,
      headers: { location: `/api/jobs/${id}` },
    });
  },
);

export const { DELETE, PATCH, PUT, OPTIONS } = otherMethods(['GET', 'POST']);
