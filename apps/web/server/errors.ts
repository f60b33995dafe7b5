import { ZodError } from 'zod';

export interface FieldError {
  field: string;
  message: string;
}

/** A failure the caller can act on; mapped to an RFC 9457 problem document in one place. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly slug: string,
    readonly title: string,
    readonly detail?: string,
    readonly fieldErrors?: FieldError[],
  ) {
    super(detail ?? title);
  }
}

export const unauthorized = () =>
  new ApiError(401, 'unauthenticated', 'Sign-in required', 'Sign in to use this resource.');
export const forbidden = (detail = 'Your role does not allow this.') =>
  new ApiError(403, 'forbidden', 'Not allowed', detail);
export const notFound = (what = 'resource') =>
  new ApiError(
    404,
    'not-found',
    'Not found',
    `No such ${what}, or it is outside what you can see.`,
  );
export const conflict = (detail: string) => new ApiError(409, 'conflict', 'Conflict', detail);
export const badRequest = (detail: string, fieldErrors?: FieldError[]) =>
  new ApiError(400, 'invalid-input', 'Invalid input', detail, fieldErrors);

export function fieldErrorsOf(error: ZodError, prefix?: string): FieldError[] {
  const name = (path: PropertyKey[]) =>
    [prefix, ...path.map(String)].filter(Boolean).join('.') || '(root)';
  // A strict object's unknown keys: one error per key, under the key's own name.
  return error.issues.flatMap((issue) =>
    issue.code === 'unrecognized_keys'
      ? issue.keys.map((key) => ({ field: name([...issue.path, key]), message: 'Unknown field' }))
      : [{ field: name(issue.path), message: issue.message }],
  );
}

export function problemResponse(error: unknown, instance?: string): Response {
  const known =
    error instanceof ApiError
      ? error
      : error instanceof ZodError
        ? badRequest('Some fields are not valid.', fieldErrorsOf(error))
        : null;
  if (!known) {
    console.error('Unhandled error', error);
  }
  const problem =
    known ?? new ApiError(500, 'internal', 'Internal error', 'Something went wrong on our side.');
  const body: Record<string, unknown> = {
    type: `/problems/${problem.slug}`,
    title: problem.title,
    status: problem.status,
  };
  if (problem.detail) body.detail = problem.detail;
  if (instance) body.instance = instance;
  if (problem.fieldErrors?.length) body.errors = problem.fieldErrors;
  return new Response(JSON.stringify(body), {
    status: problem.status,
    headers: { 'content-type': 'application/problem+json' },
  });
}
