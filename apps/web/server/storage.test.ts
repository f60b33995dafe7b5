import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import S3rver from 's3rver';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { checkPhoto } from './photos/check';
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
  it('uploads through a presigned PUT that expires in five minutes, then reads it back', async () => {
    const png = pngImage(64, 64);
    const key = storage.uploadKey(3, 41);
    expect(key).toMatch(/^photos\/uploads\/3\/41\/[0-9a-f-]{36}$/);

    const url = await storage.presignUpload(key, { contentType: 'image/png', size: png.length });
    const query = new URL(url).searchParams;
    expect(query.get('X-Amz-Expires')).toBe('300');
    expect(query.get('X-Amz-SignedHeaders')?.split(';')).toEqual(
      expect.arrayContaining(['content-length', 'content-type', 'host']),
    );
    const put = await fetch(url, {
      method: 'PUT',
      body: new Uint8Array(png),
      headers: { 'content-type': 'image/png' },
    });
    expect(put.status).toBe(200);

    expect(await storage.headObject(key)).toEqual({ size: png.length });
    expect(Buffer.from(await storage.readFirstBytes(key, 16))).toEqual(png.subarray(0, 16));
    // The stored bytes are the file itself (no chunk framing), so the check by bytes passes.
    const whole = await storage.readFirstBytes(key, png.length + 1);
    expect(await checkPhoto(whole)).toMatchObject({ ok: true, contentType: 'image/png' });

    const kept = storage.confirmedKey(3, 41);
    expect(kept).toMatch(/^photos\/confirmed\/3\/41\/[0-9a-f-]{36}$/);
    await storage.putObject(kept, whole, 'image/png');
    const opened = await storage.openObject(kept);
    expect(opened?.size).toBe(png.length);
    expect(Buffer.from(await new Response(opened!.body).arrayBuffer())).toEqual(png);

    await storage.deleteObject(key);
    expect(await storage.headObject(key)).toBeNull();
    expect(await storage.openObject(key)).toBeNull();
  });

  it('never signs an upload to a checked photo’s key', async () => {
    await expect(
      storage.presignUpload(storage.confirmedKey(3, 41), { contentType: 'image/png', size: 10 }),
    ).rejects.toThrow('No upload URL outside photos/uploads/');
  });
});
