// GET, POST /api/users – the people the caller may see (owner: everyone; regional manager: their region's); POST invites a person by e-mail (owner)
import { inviteInput, peopleQuery } from '~/lib/validators/people';
import { route } from '~/server/api';
import { deliverSoon } from '~/server/mail/deliver-soon';
import { otherMethods } from '~/server/method-not-allowed';
import { invitePerson, listPeople } from '~/server/people';

export const GET = route(
  { permission: 'people:read', query: peopleQuery },
  async ({ principal, query }) => ({ users: await listPeople(principal, query) }),
);

export const POST = route(
  { permission: 'users:manage', body: inviteInput },
  async ({ principal, body }) => {
    const person = await invitePerson(principal, body);
    deliverSoon();
    return Response.json(person, {
      status: 201,
      headers: { location: `/api/users/${person.id}` },
    });
  },
);

export const { DELETE, PATCH, PUT, OPTIONS } = otherMethods(['GET', 'POST']);
