// GET /api/audit-rounds/preview – the lot, severity and sampling plan a round would get; draws nothing
import { planPreviewQuery } from '~/lib/validators/audits';
import { route } from '~/server/api';
import { previewRound } from '~/server/audits/plan';
import { otherMethods } from '~/server/method-not-allowed';

export const GET = route(
  { permission: 'audits:plan', query: planPreviewQuery },
  async ({ principal, query }) => previewRound(principal, query),
);

export const { DELETE, PATCH, POST, PUT, OPTIONS } = otherMethods(['GET']);
