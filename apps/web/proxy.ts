import { NextResponse, type NextRequest } from 'next/server';
import { problemResponse } from '~/server/errors';
import { appOrigins, assertSameOrigin } from '~/server/request-guards';
import { pagePolicy, strictTransportSecurity } from '~/server/security-headers';

/**
 * Pages only (API routes check themselves in `route()`, so their bodies are never buffered here):
 * a fresh CSP nonce per request, which Next puts on its scripts, and a 403 for a state-changing
 * request (a server action is a POST with `Next-Action`) from any other origin.
 */
export function proxy(request: NextRequest) {
  try {
    assertSameOrigin(request.method, request.headers, appOrigins(request.headers));
  } catch (error) {
    return problemResponse(error, request.nextUrl.pathname);
  }
  const nonce = Buffer.from(crypto.getRandomValues(new Uint8Array(16))).toString('base64');
  const policy = pagePolicy(nonce);
  const requestHeaders = new Headers(request.headers);
  requestHeaders.set('content-security-policy', policy);
  requestHeaders.set('x-nonce', nonce);
  const response = NextResponse.next({ request: { headers: requestHeaders } });
  response.headers.set('content-security-policy', policy);
  const hsts = strictTransportSecurity();
  if (hsts) response.headers.set('strict-transport-security', hsts);
  return response;
}

export const config = {
  matcher: [
    // Prefetches are not skipped: a header could then take a POST past the origin check.
    '/((?!api/|api$|_next/static|_next/image|favicon.ico|icon.svg).*)',
  ],
};
