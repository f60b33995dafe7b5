// POST /api/dev/mail/retry – send the outbox's due messages now (pending, and failed ones past their backoff)
import { route } from '~/server/api';
import { deliverPending } from '~/server/mail/outbox';

export const POST = route({ permission: 'dev-mail:read' }, async () => deliverPending());
