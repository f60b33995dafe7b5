// GET, POST /api/auth/* – next-auth: csrf, credentials sign-in, session, sign-out
import NextAuth from 'next-auth';
import type { NextRequest } from 'next/server';
import { authOptions } from '~/server/auth';
import { problemResponse } from '~/server/errors';
import { appOrigins, assertSameOrigin } from '~/server/request-guards';
import { otherMethods } from '~/server/method-not-allowed';

const handler = NextAuth(authOptions);

type Context = { params: Promise<{ nextauth: string[] }> };

// next-auth's CSRF token guards its forms; the origin rule of every other write applies as well.
async function POST(request: NextRequest, context: Context) {
  try {
    assertSameOrigin(request.method, request.headers, appOrigins(request.headers));
  } catch (error) {
    return problemResponse(error, request.nextUrl.pathname);
  }
  return handler(request, context);
}

export { handler as GET, POST };

export const { DELETE, PATCH, PUT, OPTIONS } = otherMethods(['GET', 'POST']);
