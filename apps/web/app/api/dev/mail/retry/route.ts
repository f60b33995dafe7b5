// POST /api/dev/mail/retry – send the outbox's due messages now (pending, and failed ones past their backoff)
import { route } from '~/server/api';
import { deliverPending } from '~/server/mail/outbox';
import { otherMethods } from '~/server/method-not-allowed';

export const POST = route({ permission: 'dev-mail:read' }, async () => deliverPending());

export const { DELETE, GET, PATCH, PUT, OPTIONS } = otherMethods(['POST']);
