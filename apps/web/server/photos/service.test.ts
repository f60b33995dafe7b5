import { eq } from '@reelwright/db';
import { photos } from '@reelwright/db/schema';
import { NextRequest } from 'next/server';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import S3rver from 's3rver';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { GET as photoRoute } from '~/app/api/jobs/[id]/photos/[photoId]/route';
import { POST as photosRoute } from '~/app/api/jobs/[id]/photos/route';
import { env } from '~/env';
import { closeMemoryDb, openMemoryDb, testState as state } from '~/server/testing/memory-db';
import { buildNetwork, type Network } from '../bench/fixture';
import { expectApiError, jobMaker } from '../bench/test-support';
import { headObject } from '../storage';
import { confirmPhotoUpload, listPhotos, startPhotoUpload } from './service';
import { jpegImage, pngImage } from './test-images';

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));
vi.mock('~/server/session', () =>
  import('~/server/testing/memory-db').then((m) => m.sessionModule),
);

// The photo flow end to end against the S3-compatible fake the project starts for development.
let server: S3rver;
let folder: string;
let net: Network;
const { newJob } = jobMaker(() => net);

beforeAll(async () => {
  folder = mkdtempSync(path.join(tmpdir(), 'reelwright-photos-test-'));
  server = new S3rver({
    address: '127.0.0.1',
    port: 0,
    directory: folder,
    silent: true,
    vhostBuckets: false,
    configureBuckets: [{ name: 'test-photos', configs: [] }],
  });
  const address = await server.run();
  Object.assign(env, {
    S3_ENDPOINT: `http://127.0.0.1:${address.port}`,
    S3_BUCKET: 'test-photos',
    S3_ACCESS_KEY_ID: 'S3RVER',
    S3_SECRET_ACCESS_KEY: 'S3RVER',
  });
  await openMemoryDb();
  net = await buildNetwork(state.handle!.db);
}, 60_000);

afterAll(async () => {
  await closeMemoryDb();
  await server.close();
  rmSync(folder, { recursive: true, force: true });
});

const put = (url: string, body: Uint8Array, contentType = 'image/png') =>
  fetch(url, {
    method: 'PUT',
    body: new Uint8Array(body),
    headers: { 'content-type': contentType },
  });

/** Starts an upload as the technician and PUTs the bytes where the ticket says. */
async function upload(jobId: number, bytes: Uint8Array, contentType = 'image/png') {
  const ticket = await startPhotoUpload(net.as.tech, jobId, {
    stage: 'teardown',
    contentType,
    size: bytes.length,
    fileName: 'drag-stack.png',
  });
  expect((await put(ticket.uploadUrl, bytes, ticket.headers['content-type'])).status).toBe(200);
  return ticket;
}

/** What the app serves for a photo, read as the technician would through the route. */
async function served(jobId: number, photoId: number) {
  state.principal = net.as.tech;
  const response = await photoRoute(
    new NextRequest(`http://127.0.0.1/api/jobs/${jobId}/photos/${photoId}`),
    { params: Promise.resolve({ id: String(jobId), photoId: String(photoId) }) },
  );
  return { response, bytes: Buffer.from(await response.arrayBuffer()) };
}

const storedRow = async (id: number) =>
  (await state.handle!.db.select().from(photos).where(eq(photos.id, id)))[0];

describe('photo uploads', () => {
  it('technician – a checked photo moves to a key no upload URL can write, and a re-PUT changes nothing served', async () => {
    const jobId = await newJob();
    const png = pngImage(12, 9);
    const ticket = await upload(jobId, png);
    expect(new URL(ticket.uploadUrl).searchParams.get('X-Amz-Expires')).toBe('300');
    const uploadedTo = (await storedRow(ticket.photoId))!.storageKey;
    expect(uploadedTo).toMatch(/^photos\/uploads\//);

    const photo = await confirmPhotoUpload(net.as.tech, jobId, ticket.photoId);
    expect(photo).toMatchObject({
      contentType: 'image/png',
      sizeBytes: png.length,
      url: `/api/jobs/${jobId}/photos/${ticket.photoId}`,
    });
    const row = (await storedRow(ticket.photoId))!;
    expect(row.storageKey).toMatch(new RegExp(`^photos/confirmed/${net.shops.dune.id}/${jobId}/`));
    expect(row).toMatchObject({ width: 12, height: 9 });
    expect(await headObject(uploadedTo)).toBeNull();

    // The same URL, still inside its five minutes, with a page of the same length.
    const page = Buffer.from(
      '<html><script>alert(document.cookie)</script></html>'.padEnd(png.length),
    );
    expect((await put(ticket.uploadUrl, page)).status).toBe(200);
    const { response, bytes } = await served(jobId, ticket.photoId);
    expect(response.status).toBe(200);
    expect(bytes).toEqual(png);
    // Confirming again changes nothing either.
    await confirmPhotoUpload(net.as.tech, jobId, ticket.photoId);
    expect((await served(jobId, ticket.photoId)).bytes).toEqual(png);
    expect((await storedRow(ticket.photoId))!.storageKey).toBe(row.storageKey);
  });

  it('technician – the photo is served with its detected type, nosniff, inline under our name and sandboxed', async () => {
    const jobId = await newJob();
    // Declared as PNG, but the bytes are a JPEG: the bytes decide.
    const ticket = await upload(jobId, jpegImage(), 'image/png');
    await confirmPhotoUpload(net.as.tech, jobId, ticket.photoId);
    const { response, bytes } = await served(jobId, ticket.photoId);
    expect(Object.fromEntries(response.headers)).toMatchObject({
      'content-type': 'image/jpeg',
      'content-length': String(jpegImage().length),
      'x-content-type-options': 'nosniff',
      'content-disposition': `inline; filename="job-${jobId}-teardown-${ticket.photoId}.jpg"`,
      'content-security-policy': "default-src 'none'; frame-ancestors 'none'; sandbox",
    });
    expect(bytes).toEqual(jpegImage());
    const list = await listPhotos(net.as.tech, jobId);
    expect(list.photos.map((p) => p.url)).toEqual([`/api/jobs/${jobId}/photos/${ticket.photoId}`]);
  });

  it('technician – a PNG header followed by a page is refused and removed', async () => {
    const jobId = await newJob();
    const polyglot = Buffer.concat([
      pngImage(64, 64).subarray(0, 33),
      Buffer.from('<html><body><script>fetch("/api/me")</script></body></html>'),
    ]);
    const ticket = await upload(jobId, polyglot);
    const uploadedTo = (await storedRow(ticket.photoId))!.storageKey;
    const error = await expectApiError(confirmPhotoUpload(net.as.tech, jobId, ticket.photoId), 400);
    expect(error.fieldErrors).toEqual([
      { field: 'file', message: expect.stringContaining('not a complete PNG image') },
    ]);
    expect(await storedRow(ticket.photoId)).toBeUndefined();
    expect(await headObject(uploadedTo)).toBeNull();
    expect((await served(jobId, ticket.photoId)).response.status).toBe(404);
  });

  it('technician – an SVG declared as a PNG is refused by its bytes', async () => {
    const jobId = await newJob();
    const svg = Buffer.from(
      '<svg xmlns="http://www.w3.org/2000/svg"><script>alert(1)</script></svg>',
    );
    const ticket = await upload(jobId, svg);
    const error = await expectApiError(confirmPhotoUpload(net.as.tech, jobId, ticket.photoId), 400);
    expect(error.detail).toMatch(/^This file is not a JPEG, PNG or WebP photo/);
  });

  it('another shop’s technician – cannot read the photo', async () => {
    const jobId = await newJob();
    const ticket = await upload(jobId, pngImage());
    await confirmPhotoUpload(net.as.tech, jobId, ticket.photoId);
    state.principal = net.as.kelpTech;
    const response = await photoRoute(
      new NextRequest(`http://127.0.0.1/api/jobs/${jobId}/photos/${ticket.photoId}`),
      { params: Promise.resolve({ id: String(jobId), photoId: String(ticket.photoId) }) },
    );
    expect(response.status).toBe(404);
    expect(response.headers.get('content-type')).toBe('application/problem+json');
  });
});

describe('POST /api/jobs/{id}/photos', () => {
  const post = (jobId: number, body: unknown) => {
    state.principal = net.as.tech;
    return photosRoute(
      new NextRequest(`http://127.0.0.1/api/jobs/${jobId}/photos`, {
        method: 'POST',
        body: JSON.stringify(body),
        headers: { 'content-type': 'application/json' },
      }),
      { params: Promise.resolve({ id: String(jobId) }) },
    );
  };

  it.each([2147483648, 0, -1, 1.5, '7', true, 1e300])(
    'technician – confirming photo %j is a 400 field error',
    async (confirm) => {
      const jobId = await newJob();
      const response = await post(jobId, { confirm });
      expect(response.status).toBe(400);
      const problem = (await response.json()) as { errors: { field: string }[] };
      expect(new Set(problem.errors.map((e) => e.field))).toEqual(new Set(['body.confirm']));
    },
  );

  it.each(['image/svg+xml; charset=utf-8', 'image/', 'image/png\r\nx-amz-acl: public-read'])(
    'technician – starting an upload declared %j is a 400 field error and records nothing',
    async (contentType) => {
      const jobId = await newJob();
      const response = await post(jobId, { stage: 'teardown', contentType, size: 100 });
      expect(response.status).toBe(400);
      expect(await response.json()).toMatchObject({
        errors: [
          { field: 'body.contentType', message: 'Only JPEG, PNG or WebP photos can be uploaded' },
        ],
      });
      expect(await state.handle!.db.select().from(photos).where(eq(photos.jobId, jobId))).toEqual(
        [],
      );
    },
  );
});
