/** A problem document (RFC 9457) from the API, thrown by `fetchJson` for non-2xx answers. */
export class ProblemError extends Error {
  constructor(
    readonly status: number,
    readonly problem: {
      title?: string;
      detail?: string;
      errors?: { field: string; message: string }[];
    },
  ) {
    super(problem.detail ?? problem.title ?? `Request failed (${status})`);
  }
}

export async function fetchJson<T>(input: string, init?: RequestInit): Promise<T> {
  const response = await fetch(input, {
    ...init,
    headers: { accept: 'application/json', ...init?.headers },
  });
  if (!response.ok) {
    const problem = await response.json().catch(() => ({}));
    throw new ProblemError(response.status, problem as ProblemError['problem']);
  }
  return (await response.json()) as T;
}

/** A JSON request (`body` as JSON when given) whose answer is JSON; problems throw `ProblemError`. */
export function sendJson<T>(
  method: 'POST' | 'PATCH' | 'PUT' | 'DELETE',
  url: string,
  body?: unknown,
) {
  return fetchJson<T>(url, {
    method,
    headers: body === undefined ? undefined : { 'content-type': 'application/json' },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
}
