import type { NextRequest } from 'next/server';
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
import type { Principal } from './principal';
import { getPrincipal } from './session';

type Infer<S> = S extends ZodType ? z.infer<S> : undefined;

interface RouteConfig<P, Q, B> {
  permission: Permission;
  params?: P;
  query?: Q;
  body?: B;
}

interface RouteContext<P, Q, B> {
  principal: Principal;
  params: Infer<P>;
  query: Infer<Q>;
  body: Infer<B>;
  request: NextRequest;
}

/**
 * The one wrapper every route handler goes through: authenticate (401), check the role's
 * permission (403), parse params, query and body (400 with field errors), then act. Scope checks
 * (404 outside the caller's shops) happen in the queries, which take the principal.
 */
export function route<
  P extends ZodType | undefined = undefined,
  Q extends ZodType | undefined = undefined,
  B extends ZodType | undefined = undefined,
>(config: RouteConfig<P, Q, B>, act: (ctx: RouteContext<P, Q, B>) => Promise<unknown>) {
  return async (request: NextRequest, context: { params: Promise<Record<string, string>> }) => {
    try {
      const principal = await getPrincipal();
      if (!principal) throw unauthorized();
      if (!can(principal.role, config.permission)) throw forbidden();
      const params = parse(config.params, await context.params, 'path');
      const query = parse(config.query, Object.fromEntries(request.nextUrl.searchParams), 'query');
      let body: unknown;
      if (config.body) {
        const raw = await request.json().catch(() => {
          throw badRequest('The request body must be JSON.');
        });
        body = parse(config.body, raw, 'body');
      }
      const result = await act({
        principal,
        params: params as Infer<P>,
        query: query as Infer<Q>,
        body: body as Infer<B>,
        request,
      });
      return result instanceof Response ? result : Response.json(result);
    } catch (error) {
      return problemResponse(error, request.nextUrl.pathname);
    }
  };
}

function parse(schema: ZodType | undefined, value: unknown, where: string): unknown {
  if (!schema) return undefined;
  const result = schema.safeParse(value);
  if (!result.success) {
    throw badRequest(`Some ${where} fields are not valid.`, fieldErrorsOf(result.error, where));
  }
  return result.data;
}

export type ActionResult<T> =
  | { ok: true; data: T }
  | {
      ok: false;
      status: number;
      title: string;
      detail?: string;
      errors?: { field: string; message: string }[];
    };

/** The same order for server actions: authenticate, check, parse, act; failures come back as data. */
export function action<S extends ZodType, T>(
  config: { permission: Permission; input: S },
  act: (ctx: { principal: Principal; input: z.infer<S> }) => Promise<T>,
) {
  return async (input: unknown): Promise<ActionResult<T>> => {
    try {
      const principal = await getPrincipal();
      if (!principal) throw unauthorized();
      if (!can(principal.role, config.permission)) throw forbidden();
      const parsed = config.input.safeParse(input);
      if (!parsed.success)
        throw badRequest('Some fields are not valid.', fieldErrorsOf(parsed.error));
      return { ok: true, data: await act({ principal, input: parsed.data }) };
    } catch (error) {
      if (error instanceof ApiError) {
        return {
          ok: false,
          status: error.status,
          title: error.title,
          detail: error.detail,
          errors: error.fieldErrors,
        };
      }
      console.error('Unhandled action error', error);
      return { ok: false, status: 500, title: 'Internal error' };
    }
  };
}
