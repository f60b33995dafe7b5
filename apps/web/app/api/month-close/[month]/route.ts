// GET /api/month-close/{YYYY-MM} – the month-close table of the caller's shops (JSON); {YYYY-MM}.csv streams it as CSV
import { monthExportParams } from '~/lib/validators/month-close';
import { route } from '~/server/api';
import { getMonthClose, monthCloseCsv } from '~/server/queries/month-close';
import { otherMethods } from '~/server/method-not-allowed';

export const dynamic = 'force-dynamic';

export const GET = route(
  { permission: 'month-close:read', params: monthExportParams },
  async ({ principal, params }) => {
    const { month, format } = params.month;
    if (format === 'json') return getMonthClose(principal, month);
    const { filename, stream } = await monthCloseCsv(principal, month);
    return new Response(stream, {
      headers: {
        'content-type': 'text/csv; charset=utf-8; header=present',
        'content-disposition': `attachment; filename="${filename}"`,
        'cache-control': 'no-store',
      },
    });
  },
);

export const { DELETE, PATCH, POST, PUT, OPTIONS } = otherMethods(['GET']);
