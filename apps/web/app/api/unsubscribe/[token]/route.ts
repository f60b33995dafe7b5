// POST /api/unsubscribe/{token} – one-click opt-out from service reminders (RFC 8058), posted by the customer's mail client; GET shows the opt-out page
import type { NextRequest } from 'next/server';
import { badRequest, notFound, problemResponse } from '~/server/errors';
import {
  assertContentType,
  assertSameOrigin,
  appOrigins,
  readBodyText,
} from '~/server/request-guards';
import { otherMethods } from '~/server/method-not-allowed';
import { unsubscribe } from '~/server/reminders/unsubscribe';

export const dynamic = 'force-dynamic';

/** The one-click body is a single short form field; nothing longer is read. */
const MAX_BODY_BYTES = 1024;

type Context = { params: Promise<{ token: string }> };

/**
 * No session: the token in the URL is the customer's proof, as in the e-mail's own link. A mail
 * client posts `List-Unsubscribe=One-Click` from its servers (no Origin); a browser on another
 * site is refused like any cross-site write.
 */
export async function POST(request: NextRequest, context: Context) {
  try {
    assertSameOrigin(request.method, request.headers, appOrigins(request.headers));
    assertContentType(
      request.headers,
      ['application/x-www-form-urlencoded', 'multipart/form-data'],
      true,
    );
    const type = request.headers.get('content-type')!;
    const body = await readBodyText(request, MAX_BODY_BYTES);
    const form = await new Response(body, { headers: { 'content-type': type } })
      .formData()
      .catch(() => null);
    const oneClick = form?.get('List-Unsubscribe') === 'One-Click';
    if (!oneClick) throw badRequest('The body must be List-Unsubscribe=One-Click (RFC 8058).');
    const { token } = await context.params;
    const result = await unsubscribe(token);
    if (!result) throw notFound('unsubscribe link');
    return Response.json({ unsubscribed: true, shop: result.shopName, changed: result.changed });
  } catch (error) {
    return problemResponse(error, request.nextUrl.pathname);
  }
}

/** Someone who opens the header's link gets the page that asks before anything changes. */
export async function GET(request: NextRequest, context: Context) {
  const { token } = await context.params;
  return Response.redirect(new URL(`/unsubscribe/${encodeURIComponent(token)}`, request.url), 303);
}

export const { DELETE, PATCH, PUT, OPTIONS } = otherMethods(['GET', 'POST']);
