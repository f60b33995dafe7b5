// GET /api/dev/mail – what the local SMTP catcher received (newest first) and the outbox counts; development and tests
import { caughtMailQuery } from '~/lib/validators/mail';
import { route } from '~/server/api';
import { notFound } from '~/server/errors';
import { catcherConfigured, caughtMessages, outboxSummary } from '~/server/mail/catcher';
import { otherMethods } from '~/server/method-not-allowed';

export const dynamic = 'force-dynamic';

export const GET = route(
  { permission: 'dev-mail:read', query: caughtMailQuery },
  async ({ query }) => {
    if (!catcherConfigured()) throw notFound('mail catcher');
    const [messages, outbox] = await Promise.all([caughtMessages(query.to), outboxSummary()]);
    return { messages, outbox };
  },
);

export const { DELETE, PATCH, POST, PUT, OPTIONS } = otherMethods(['GET']);
