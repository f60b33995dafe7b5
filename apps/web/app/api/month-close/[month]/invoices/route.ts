// POST /api/month-close/{YYYY-MM}/invoices – issue one royalty invoice per shop from the closed month; issuing again never bills twice (owner)
import { monthParams } from '~/lib/validators/month-close';
import { route } from '~/server/api';
import { issueRoyaltyInvoices } from '~/server/month-close/invoices';
import { otherMethods } from '~/server/method-not-allowed';

export const POST = route(
  { permission: 'month-close:manage', params: monthParams },
  async ({ principal, params }) => issueRoyaltyInvoices(principal, params.month),
);

export const { DELETE, GET, PATCH, PUT, OPTIONS } = otherMethods(['POST']);
