import { env } from '~/env';
import { ApiError } from './errors';

/** Methods that change something; every other method must be safe to send from anywhere. */
export const UNSAFE_METHODS: ReadonlySet<string> = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

/** The default cap on a request body read by `route()`: 256 KiB. */
export const DEFAULT_MAX_BODY_BYTES = 256 * 1024;

export const crossSite = (detail: string) =>
  new ApiError(403, 'cross-site', 'Cross-site request refused', detail);
export const unsupportedMediaType = (detail: string) =>
  new ApiError(415, 'unsupported-media-type', 'Unsupported media type', detail);
export const payloadTooLarge = (limit: number) =>
  new ApiError(
    413,
    'too-large',
    'Request body too large',
    `The body may be at most ${formatBytes(limit)}.`,
  );

function formatBytes(bytes: number): string {
  if (bytes >= 1024 * 1024) return `${+(bytes / 1024 / 1024).toFixed(1)} MiB`;
  return `${+(bytes / 1024).toFixed(1)} KiB`;
}

/**
 * The origins the app is served at: NEXTAUTH_URL and APP_BASE_URL. Without either (a bare
 * `next dev`) the address the browser used, from the Host header, stands in.
 */
export function appOrigins(headers: Headers): string[] {
  const configured = [env.NEXTAUTH_URL, env.APP_BASE_URL]
    .filter((url): url is string => Boolean(url))
    .map((url) => new URL(url).origin);
  if (configured.length) return [...new Set(configured)];
  const host = headers.get('x-forwarded-host') ?? headers.get('host');
  if (!host) return [];
  const proto = headers.get('x-forwarded-proto')?.split(',')[0]?.trim() || 'http';
  return [originOf(`${proto}://${host}`)].filter((o): o is string => o !== null);
}

function originOf(value: string): string | null {
  try {
    const url = new URL(value);
    return url.protocol === 'http:' || url.protocol === 'https:' ? url.origin : null;
  } catch {
    return null;
  }
}

/**
 * Throws a 403 unless a state-changing request comes from the app's own pages. A browser names
 * the page's origin in `Origin` on every POST, PUT, PATCH and DELETE (Fetch standard), and modern
 * ones add `Sec-Fetch-Site`; a different port on the same host is another origin. A request with
 * neither header did not come from a browser (curl, scripts, server to server): it cannot ride on
 * a victim's cookie, so it passes and is judged by its session like any other.
 */
export function assertSameOrigin(method: string, headers: Headers, allowed: readonly string[]) {
  if (!UNSAFE_METHODS.has(method.toUpperCase())) return;
  const app = allowed[0] ?? 'its own address';
  const origin = headers.get('origin');
  if (origin !== null) {
    const normalized = originOf(origin);
    if (normalized === null || !allowed.includes(normalized)) {
      throw crossSite(
        `Reelwright accepts changes only from its own pages at ${app}; this request came from ${
          origin === 'null' ? 'an opaque origin' : origin.slice(0, 200)
        }.`,
      );
    }
  }
  const site = headers.get('sec-fetch-site');
  if (site !== null && site !== 'same-origin') {
    throw crossSite(
      `Reelwright accepts changes only from its own pages at ${app}; the browser marked this request ${site.slice(0, 40)}.`,
    );
  }
}

/**
 * Throws a 415 unless the declared media type is one the route takes. JSON may carry only
 * `charset=utf-8`; a multipart body must name its boundary.
 */
export function assertContentType(
  headers: Headers,
  accepted: readonly string[],
  bodyRequired: boolean,
) {
  const declared = headers.get('content-type');
  const expected = accepted.join(' or ');
  if (declared === null) {
    if (bodyRequired) throw unsupportedMediaType(`Send the body as ${expected}.`);
    return;
  }
  const [type = '', ...params] = declared.split(';').map((part) => part.trim().toLowerCase());
  const ok =
    accepted.includes(type) &&
    params.every((param) => {
      const [name = '', value = ''] = param.split('=').map((s) => s.trim());
      if (type === 'multipart/form-data') return name === 'boundary' && value.length > 0;
      return name === 'charset' && value.replace(/^"(.*)"$/, '$1') === 'utf-8';
    }) &&
    (type !== 'multipart/form-data' || params.some((p) => p.startsWith('boundary=')));
  if (!ok) {
    throw unsupportedMediaType(`Send the body as ${expected}, not ${declared.slice(0, 100)}.`);
  }
}

/** A 413 from the declared length alone, before a byte of the body is read. */
export function assertDeclaredLength(headers: Headers, limit: number) {
  const declared = headers.get('content-length');
  if (declared !== null && Number(declared) > limit) throw payloadTooLarge(limit);
}

/**
 * The body's bytes, read chunk by chunk and abandoned with `tooLarge()` (a 413) as soon as they
 * pass `limit`, so a chunked body without Content-Length is never held whole either.
 */
export async function readBodyBytes(
  request: Request,
  limit: number,
  tooLarge: () => Error = () => payloadTooLarge(limit),
): Promise<Uint8Array> {
  const declared = request.headers.get('content-length');
  if (declared !== null && Number(declared) > limit) throw tooLarge();
  if (!request.body) return new Uint8Array();
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > limit) {
      await reader.cancel().catch(() => undefined);
      throw tooLarge();
    }
    chunks.push(value);
  }
  const bytes = new Uint8Array(total);
  let offset = 0;
  for (const chunk of chunks) {
    bytes.set(chunk, offset);
    offset += chunk.byteLength;
  }
  return bytes;
}

/** The body as UTF-8 text, within `limit` bytes (see readBodyBytes). */
export async function readBodyText(request: Request, limit: number): Promise<string> {
  const bytes = await readBodyBytes(request, limit);
  return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
}

/**
 * The same request with a body that errors once it passes `limit` bytes, for handlers that read
 * the body themselves (multipart). `exceeded()` tells the caller why the handler's read failed.
 */
export function limitBody<R extends Request>(
  request: R,
  limit: number,
  rebuild: (body: ReadableStream<Uint8Array>) => R,
): { request: R; exceeded: () => boolean } {
  if (!request.body) return { request, exceeded: () => false };
  let total = 0;
  let over = false;
  const counted = request.body.pipeThrough(
    new TransformStream<Uint8Array, Uint8Array>({
      transform(chunk, controller) {
        total += chunk.byteLength;
        if (total > limit) {
          over = true;
          controller.error(payloadTooLarge(limit));
        } else controller.enqueue(chunk);
      },
    }),
  );
  return { request: rebuild(counted), exceeded: () => over };
}
