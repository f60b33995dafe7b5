// GET, POST, PUT, PATCH, DELETE /api/* – any path no route serves: 404 problem+json, not the HTML page
import type { NextRequest } from 'next/server';
import { ApiError, problemResponse } from '~/server/errors';

// No route() here: nothing exists to authenticate for, and a signed-out caller learns no more
// than a signed-in one.
function unknownPath(request: NextRequest) {
  return problemResponse(
    new ApiError(404, 'not-found', 'Not found', 'No API route has this path.'),
    request.nextUrl.pathname,
  );
}

export const dynamic = 'force-dynamic';
export {
  unknownPath as GET,
  unknownPath as POST,
  unknownPath as PUT,
  unknownPath as PATCH,
  unknownPath as DELETE,
  unknownPath as OPTIONS,
};
