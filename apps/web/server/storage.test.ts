import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import S3rver from 's3rver';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { checkPhoto, SNIFF_BYTES } from './photos/check';
import { pngImage } from './photos/test-images';
import type * as StorageModule from './storage';

// The storage module against the same S3-compatible fake the project starts for development.
let server: S3rver;
let folder: string;
let storage: typeof StorageModule;

beforeAll(async () => {
  folder = mkdtempSync(path.join(tmpdir(), 'reelwright-s3-test-'));
  server = new S3rver({
    address: '127.0.0.1',
    port: 0,
    directory: folder,
    silent: true,
    vhostBuckets: false,
    configureBuckets: [{ name: 'test-photos', configs: [] }],
  });
  const address = await server.run();
  vi.stubEnv('S3_ENDPOINT', `http://127.0.0.1:${address.port}`);
  vi.stubEnv('S3_BUCKET', 'test-photos');
  vi.stubEnv('S3_ACCESS_KEY_ID', 'S3RVER');
  vi.stubEnv('S3_SECRET_ACCESS_KEY', 'S3RVER');
  storage = await import('./storage');
});

afterAll(async () => {
  await server.close();
  vi.unstubAllEnvs();
  rmSync(folder, { recursive: true, force: true });
});

describe('object storage', () => {
  it('uploads through a presigned PUT, then reads the size and only the first bytes back', async () => {
    const png = pngImage(64, 64);
    const key = storage.photoKey(3, 41);
    expect(key).toMatch(/^shops\/3\/jobs\/41\/[0-9a-f-]{36}$/);

    const url = await storage.presignUpload(key, { contentType: 'image/png', size: png.length });
    const signed = new URL(url).searchParams.get('X-Amz-SignedHeaders');
    expect(signed?.split(';')).toEqual(
      expect.arrayContaining(['content-length', 'content-type', 'host']),
    );
    const put = await fetch(url, {
      method: 'PUT',
      body: new Uint8Array(png),
      headers: { 'content-type': 'image/png' },
    });
    expect(put.status).toBe(200);

    expect(await storage.headObject(key)).toEqual({ size: png.length });
    const start = await storage.readFirstBytes(key, 16);
    expect(Buffer.from(start)).toEqual(png.subarray(0, 16));
    // The stored bytes are the file itself (no chunk framing), so the check by bytes passes.
    const sniff = await storage.readFirstBytes(key, SNIFF_BYTES);
    expect(await checkPhoto(sniff, png.length)).toEqual({ ok: true, contentType: 'image/png' });

    const view = await fetch(await storage.presignView(key, 'image/png'));
    expect(view.headers.get('content-type')).toBe('image/png');
    expect(Buffer.from(await view.arrayBuffer())).toEqual(png);

    await storage.deleteObject(key);
    expect(await storage.headObject(key)).toBeNull();
  });
});
