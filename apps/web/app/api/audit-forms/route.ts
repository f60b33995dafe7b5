// GET, POST /api/audit-forms – the current audit form and its versions; publish the next version (owner)
import { auditFormInput } from '~/lib/validators/audits';
import { route } from '~/server/api';
import { publishAuditForm } from '~/server/audits/forms';
import { currentForm, formVersions } from '~/server/queries/audits';
import { otherMethods } from '~/server/method-not-allowed';

export const GET = route({ permission: 'audits:read' }, async () => ({
  current: await currentForm(),
  versions: await formVersions(),
}));

export const POST = route(
  { permission: 'settings:manage', body: auditFormInput },
  async ({ principal, body }) =>
    Response.json(await publishAuditForm(principal, body), { status: 201 }),
);

export const { DELETE, PATCH, PUT, OPTIONS } = otherMethods(['GET', 'POST']);
