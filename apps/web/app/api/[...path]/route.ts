// GET, POST, PUT, PATCH, DELETE /api/* – any path no route answers: 404 as a problem document, not the HTML page
import type { NextRequest } from 'next/server';
import { notFound, problemResponse } from '~/server/errors';

function answer(request: NextRequest) {
  return problemResponse(notFound('API route'), request.nextUrl.pathname);
}

export { answer as DELETE, answer as GET, answer as PATCH, answer as POST, answer as PUT };
