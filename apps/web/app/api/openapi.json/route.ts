// GET /api/openapi.json – the OpenAPI 3.1 document of this API, built from the routes' zod schemas; no sign-in needed
import { openApiDocument } from '~/server/openapi/document';
import { otherMethods } from '~/server/method-not-allowed';

// Public like /api/health: it describes the API, it holds no data.
export function GET() {
  return Response.json(openApiDocument(), { headers: { 'cache-control': 'public, max-age=300' } });
}

export const { DELETE, PATCH, POST, PUT, OPTIONS } = otherMethods(['GET']);
