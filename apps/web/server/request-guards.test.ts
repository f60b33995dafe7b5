import { NextRequest } from 'next/server';
import { describe, expect, it, vi } from 'vitest';
import type * as EnvModule from '~/env';
import { ApiError } from './errors';
import {
  appOrigins,
  assertContentType,
  assertSameOrigin,
  DEFAULT_MAX_BODY_BYTES,
  readBodyText,
} from './request-guards';

const config = vi.hoisted(() => ({
  NEXTAUTH_URL: undefined as string | undefined,
  APP_BASE_URL: undefined as string | undefined,
}));
vi.mock('~/env', async (importOriginal) => {
  const actual = await importOriginal<typeof EnvModule>();
  return {
    env: new Proxy(actual.env, {
      get: (target, key) =>
        key in config ? config[key as keyof typeof config] : target[key as keyof typeof target],
    }),
  };
});

const APP = ['http://127.0.0.1:3000'];

function refusal(run: () => unknown): ApiError | null {
  try {
    run();
    return null;
  } catch (error) {
    if (error instanceof ApiError) return error;
    throw error;
  }
}

describe('origin rule', () => {
  const check = (method: string, headers: Record<string, string>) =>
    refusal(() => assertSameOrigin(method, new Headers(headers), APP));

  it('attacker – a write from another site is refused with 403', () => {
    const error = check('PATCH', { origin: 'http://evil.example', cookie: 'session=lead' });
    expect(error).toMatchObject({ status: 403, slug: 'cross-site' });
    expect(error?.detail).toBe(
      'Reelwright accepts changes only from its own pages at http://127.0.0.1:3000; this request came from http://evil.example.',
    );
  });

  it('attacker – a page on another port of the same host is another origin', () => {
    expect(check('POST', { origin: 'http://127.0.0.1:3900' })?.status).toBe(403);
    expect(check('POST', { origin: 'https://127.0.0.1:3000' })?.status).toBe(403);
    expect(check('POST', { origin: 'http://localhost:3000' })?.status).toBe(403);
  });

  it('attacker – an opaque origin (sandboxed frame, data: page) is refused', () => {
    expect(check('DELETE', { origin: 'null' })?.detail).toMatch(/came from an opaque origin\.$/);
  });

  it('browser – without Origin, Sec-Fetch-Site must say same-origin', () => {
    expect(check('PUT', { 'sec-fetch-site': 'same-origin' })).toBeNull();
    for (const site of ['same-site', 'cross-site', 'none']) {
      expect(check('PUT', { 'sec-fetch-site': site })?.status, site).toBe(403);
    }
  });

  it('browser – the matching Origin does not excuse a cross-site fetch marker', () => {
    expect(
      check('POST', { origin: 'http://127.0.0.1:3000', 'sec-fetch-site': 'same-site' })?.status,
    ).toBe(403);
  });

  it("browser – the app's own pages may write", () => {
    expect(
      check('POST', { origin: 'http://127.0.0.1:3000', 'sec-fetch-site': 'same-origin' }),
    ).toBeNull();
    expect(check('PATCH', { origin: 'HTTP://127.0.0.1:3000' })).toBeNull();
  });

  it('script – a client that sends neither header passes (it cannot carry a victim’s cookie)', () => {
    expect(check('POST', { cookie: 'session=x' })).toBeNull();
  });

  it('anyone – reads are never refused for their origin', () => {
    expect(check('GET', { origin: 'http://evil.example' })).toBeNull();
    expect(check('HEAD', { origin: 'null', 'sec-fetch-site': 'cross-site' })).toBeNull();
  });

  it('server – the public URLs from the environment are the app, whatever the Host says', () => {
    config.NEXTAUTH_URL = 'https://ops.saltwick.test/';
    config.APP_BASE_URL = 'https://reels.saltwick.test';
    try {
      expect(appOrigins(new Headers({ host: 'evil.example' }))).toEqual([
        'https://ops.saltwick.test',
        'https://reels.saltwick.test',
      ]);
    } finally {
      config.NEXTAUTH_URL = undefined;
      config.APP_BASE_URL = undefined;
    }
  });

  it('server – without a public URL the address the browser used is the app', () => {
    expect(appOrigins(new Headers({ host: '127.0.0.1:4000' }))).toEqual(['http://127.0.0.1:4000']);
    expect(
      appOrigins(new Headers({ 'x-forwarded-host': 'ops.test', 'x-forwarded-proto': 'https' })),
    ).toEqual(['https://ops.test']);
  });
});

describe('media types', () => {
  const json = ['application/json'];
  const check = (type: string | null, accepted = json, required = true) =>
    refusal(() =>
      assertContentType(
        new Headers(type === null ? {} : { 'content-type': type }),
        accepted,
        required,
      ),
    );

  it('client – JSON with or without charset=utf-8 is accepted', () => {
    for (const type of [
      'application/json',
      'application/json; charset=utf-8',
      'Application/JSON;charset="UTF-8"',
    ]) {
      expect(check(type), type).toBeNull();
    }
  });

  it('attacker – what a form or a no-preflight fetch can send is 415 on a JSON route', () => {
    for (const type of [
      'text/plain',
      'text/plain;charset=UTF-8',
      'application/x-www-form-urlencoded',
      'multipart/form-data; boundary=x',
      'application/json; charset=latin1',
      'application/jsonp',
    ]) {
      expect(check(type)?.status, type).toBe(415);
    }
    expect(check(null)?.detail).toBe('Send the body as application/json.');
  });

  it('client – a route without a body needs no type, but a declared one must fit', () => {
    expect(check(null, json, false)).toBeNull();
    expect(check('text/plain', json, false)?.status).toBe(415);
  });

  it('shop lead – the import takes multipart with a boundary only', () => {
    const multipart = ['multipart/form-data'];
    expect(check('multipart/form-data; boundary=----x1', multipart)).toBeNull();
    expect(check('multipart/form-data', multipart)?.status).toBe(415);
    expect(check('text/csv', multipart)?.status).toBe(415);
    expect(check('application/json', multipart)?.status).toBe(415);
  });
});

describe('body limit', () => {
  /** A body of `chunks` × 64 KiB that counts how much of it was pulled. */
  function countedBody(chunks: number) {
    const seen = { pulled: 0 };
    const stream = new ReadableStream<Uint8Array>(
      {
        pull(controller) {
          if (seen.pulled === chunks) return controller.close();
          seen.pulled += 1;
          controller.enqueue(new Uint8Array(64 * 1024).fill(0x20));
        },
      },
      { highWaterMark: 0 },
    );
    return { stream, seen };
  }

  const post = (body: BodyInit, headers: Record<string, string> = {}) =>
    new NextRequest('http://localhost/api/x', { method: 'POST', body, headers, duplex: 'half' });

  it('client – a body within the limit is read as text', async () => {
    expect(await readBodyText(post('{"a":"é"}'), DEFAULT_MAX_BODY_BYTES)).toBe('{"a":"é"}');
    expect(DEFAULT_MAX_BODY_BYTES).toBe(262_144);
  });

  it('attacker – a declared length over the limit is 413 before any byte is read', async () => {
    const { stream, seen } = countedBody(160);
    const request = post(stream, { 'content-length': String(160 * 64 * 1024) });
    await expect(readBodyText(request, DEFAULT_MAX_BODY_BYTES)).rejects.toMatchObject({
      status: 413,
      detail: 'The body may be at most 256 KiB.',
    });
    expect(seen.pulled).toBe(0);
  });

  it('attacker – a 10 MiB chunked body without a length is cut off just past the limit', async () => {
    const { stream, seen } = countedBody(160);
    await expect(readBodyText(post(stream), DEFAULT_MAX_BODY_BYTES)).rejects.toMatchObject({
      status: 413,
    });
    // 256 KiB is 4 chunks; the fifth passes the limit. Pulled ahead of the reader: at most a couple.
    expect(seen.pulled).toBeGreaterThanOrEqual(5);
    expect(seen.pulled).toBeLessThanOrEqual(8);
  });

  it('client – bytes that are not UTF-8 are not taken as text', async () => {
    await expect(
      readBodyText(post(new Uint8Array([0x7b, 0xff, 0x7d])), DEFAULT_MAX_BODY_BYTES),
    ).rejects.toBeInstanceOf(TypeError);
  });
});
