// GET /api/reminders/batches/{id} – one reminder batch with its progress (sent, skipped, failed of total)
import { idParams } from '~/lib/validators/common';
import { route } from '~/server/api';
import { getBatch } from '~/server/reminders/send';
import { otherMethods } from '~/server/method-not-allowed';

export const GET = route(
  { permission: 'reminders:send', params: idParams },
  async ({ principal, params }) => getBatch(principal, params.id),
);

export const { DELETE, PATCH, POST, PUT, OPTIONS } = otherMethods(['GET']);
