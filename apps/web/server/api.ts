import { NextRequest } from 'next/server';
import type { z, ZodType } from 'zod';
import { can, type Permission } from '~/lib/permissions';
import {
  ApiError,
  badRequest,
  fieldErrorsOf,
  forbidden,
  problemResponse,
  unauthorized,
} from './errors';
import { answering } from './in-flight';
import type { Principal } from './principal';
import {
  appOrigins,
  assertContentType,
  assertDeclaredLength,
  assertSameOrigin,
  DEFAULT_MAX_BODY_BYTES,
  limitBody,
  payloadTooLarge,
  readBodyText,
  UNSAFE_METHODS,
} from './request-guards';
import { strictTransportSecurity } from './security-headers';
import { getPrincipal } from './session';

type Infer<S> = S extends ZodType ? z.infer<S> : undefined;

interface RouteConfig<P, Q, B> {
  permission: Permission;
  params?: P;
  query?: Q;
  body?: B;
  /** Media types the body may have; default JSON. A route reading its own body (multipart) says so. */
  contentTypes?: readonly string[];
  /** Largest body accepted, in bytes; default 256 KiB. */
  maxBodyBytes?: number;
}

interface RouteContext<P, Q, B> {
  principal: Principal;
  params: Infer<P>;
  query: Infer<Q>;
  body: Infer<B>;
  request: NextRequest;
}

/**
 * The one wrapper every route handler goes through: a state-changing request must come from the
 * app's own origin (403) with a body of an accepted type (415) and size (413); then authenticate
 * (401), check the role's permission (403), parse params, query and body (400 with field errors),
 * and act. Scope checks (404 outside the caller's shops) happen in the queries, which take the
 * principal.
 */
export function route<
  P extends ZodType | undefined = undefined,
  Q extends ZodType | undefined = undefined,
  B extends ZodType | undefined = undefined,
>(config: RouteConfig<P, Q, B>, act: (ctx: RouteContext<P, Q, B>) => Promise<unknown>) {
  const contentTypes = config.contentTypes ?? ['application/json'];
  const maxBodyBytes = config.maxBodyBytes ?? DEFAULT_MAX_BODY_BYTES;
  const handle = async (
    request: NextRequest,
    context: { params: Promise<Record<string, string>> },
  ) => {
    let bodyExceeded = () => false;
    try {
      if (UNSAFE_METHODS.has(request.method)) {
        assertSameOrigin(request.method, request.headers, appOrigins(request.headers));
        assertContentType(request.headers, contentTypes, Boolean(config.body));
        assertDeclaredLength(request.headers, maxBodyBytes);
      }
      const principal = await getPrincipal();
      if (!principal) throw unauthorized();
      if (!can(principal.role, config.permission)) throw forbidden();
      const params = parse(config.params, await context.params, 'path');
      const query = parse(config.query, Object.fromEntries(request.nextUrl.searchParams), 'query');
      let body: unknown;
      if (config.body) {
        const text = await readBodyText(request, maxBodyBytes).catch((error: unknown) => {
          if (error instanceof ApiError) throw error;
          throw badRequest('The request body must be JSON in UTF-8.');
        });
        let raw: unknown;
        try {
          raw = JSON.parse(text);
        } catch {
          throw badRequest('The request body must be JSON.');
        }
        body = parse(config.body, raw, 'body');
      } else if (UNSAFE_METHODS.has(request.method)) {
        // A handler that reads the body itself gets it counted, so the cap holds while streaming.
        const limited = limitBody(
          request,
          maxBodyBytes,
          (stream) =>
            new NextRequest(request.url, {
              method: request.method,
              headers: request.headers,
              body: stream,
              duplex: 'half',
              signal: request.signal,
            }),
        );
        request = limited.request;
        bodyExceeded = limited.exceeded;
      }
      const result = await act({
        principal,
        params: params as Infer<P>,
        query: query as Infer<Q>,
        body: body as Infer<B>,
        request,
      });
      return withSecurityHeaders(result instanceof Response ? result : Response.json(result));
    } catch (error) {
      return withSecurityHeaders(
        problemResponse(
          bodyExceeded() ? payloadTooLarge(maxBodyBytes) : error,
          request.nextUrl.pathname,
        ),
      );
    }
  };
  return (request: NextRequest, context: { params: Promise<Record<string, string>> }) =>
    answering(() => handle(request, context));
}

/** HSTS depends on the public URL at run time, so it is added here rather than in next.config. */
function withSecurityHeaders(response: Response): Response {
  const hsts = strictTransportSecurity();
  if (!hsts) return response;
  try {
    response.headers.set('strict-transport-security', hsts);
    return response;
  } catch {
    // A response passed through from fetch() has read-only headers: copy it.
    const copy = new Response(response.body, response);
    copy.headers.set('strict-transport-security', hsts);
    return copy;
  }
}

function parse(schema: ZodType | undefined, value: unknown, where: string): unknown {
  if (!schema) return undefined;
  const result = schema.safeParse(value);
  if (!result.success) {
    throw badRequest(`Some ${where} fields are not valid.`, fieldErrorsOf(result.error, where));
  }
  return result.data;
}

/**
 * The same guards for the few JSON writes that need no sign-in (a password reset): the app's own
 * origin (403), JSON of at most 16 KiB (415, 413), the body parsed (400), then act. What proves
 * the caller's right is inside the body (a one-time token) or nothing is revealed (a request).
 */
export function publicRoute<B extends ZodType>(
  config: { body: B },
  act: (ctx: { body: z.infer<B>; request: NextRequest }) => Promise<unknown>,
) {
  const maxBodyBytes = 16 * 1024;
  return async (request: NextRequest) => {
    try {
      assertSameOrigin(request.method, request.headers, appOrigins(request.headers));
      assertContentType(request.headers, ['application/json'], true);
      assertDeclaredLength(request.headers, maxBodyBytes);
      const text = await readBodyText(request, maxBodyBytes).catch((error: unknown) => {
        if (error instanceof ApiError) throw error;
        throw badRequest('The request body must be JSON in UTF-8.');
      });
      let raw: unknown;
      try {
        raw = JSON.parse(text);
      } catch {
        throw badRequest('The request body must be JSON.');
      }
      const body = parse(config.body, raw, 'body') as z.infer<B>;
      const result = await act({ body, request });
      return withSecurityHeaders(result instanceof Response ? result : Response.json(result));
    } catch (error) {
      return withSecurityHeaders(problemResponse(error, request.nextUrl.pathname));
    }
  };
}
