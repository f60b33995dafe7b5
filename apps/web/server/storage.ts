import {
  DeleteObjectCommand,
  GetObjectCommand,
  HeadObjectCommand,
  PutObjectCommand,
  S3Client,
  S3ServiceException,
} from '@aws-sdk/client-s3';
import { getSignedUrl } from '@aws-sdk/s3-request-presigner';
import { randomUUID } from 'node:crypto';
import { env } from '~/env';

/** Presigned uploads are short-lived: long enough to send a photo from a bench tablet, no more. */
export const UPLOAD_URL_SECONDS = 5 * 60;

/**
 * Uploads land under one prefix and checked photos are written under another, for which no
 * presigned URL is ever issued: a later PUT to an old upload URL can only make an orphan.
 */
export const UPLOAD_PREFIX = 'photos/uploads/';
export const CONFIRMED_PREFIX = 'photos/confirmed/';

const CLIENT_KEY = Symbol.for('reelwright.storage.client');

/**
 * Storage is usable when an endpoint (the local fake, MinIO, …) or real credentials are given.
 * Without either the SDK would hunt for credentials on the machine, which we never want by accident.
 */
export function storageConfigured(): boolean {
  return Boolean(env.S3_ENDPOINT || (env.S3_ACCESS_KEY_ID && env.S3_SECRET_ACCESS_KEY));
}

export function storageClient(): S3Client {
  const store = globalThis as typeof globalThis & { [CLIENT_KEY]?: S3Client };
  return (store[CLIENT_KEY] ??= new S3Client({
    region: env.S3_REGION,
    endpoint: env.S3_ENDPOINT,
    // S3-compatible servers other than AWS address buckets by path, not by host name.
    forcePathStyle: Boolean(env.S3_ENDPOINT),
    credentials:
      env.S3_ACCESS_KEY_ID && env.S3_SECRET_ACCESS_KEY
        ? { accessKeyId: env.S3_ACCESS_KEY_ID, secretAccessKey: env.S3_SECRET_ACCESS_KEY }
        : undefined,
    // Without these, presigned PUTs carry an empty-body checksum that real S3 rejects, and the
    // local fake stores streamed uploads with their chunk framing.
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
  }));
}

/** Where the browser uploads a job's photo: grouped by shop and job so they can be listed together. */
export function uploadKey(shopId: number, jobId: number): string {
  return `${UPLOAD_PREFIX}${shopId}/${jobId}/${randomUUID()}`;
}

/** Where a checked photo is kept, written by the server alone. */
export function confirmedKey(shopId: number, jobId: number): string {
  return `${CONFIRMED_PREFIX}${shopId}/${jobId}/${randomUUID()}`;
}

/**
 * A URL the browser PUTs the file to. Content type and length are signed, so storage that checks
 * signatures refuses a different type or size; the server still checks the stored bytes afterwards.
 */
export async function presignUpload(key: string, file: { contentType: string; size: number }) {
  if (!key.startsWith(UPLOAD_PREFIX)) throw new Error(`No upload URL outside ${UPLOAD_PREFIX}`);
  return getSignedUrl(
    storageClient(),
    new PutObjectCommand({
      Bucket: env.S3_BUCKET,
      Key: key,
      ContentType: file.contentType,
      ContentLength: file.size,
    }),
    {
      expiresIn: UPLOAD_URL_SECONDS,
      signableHeaders: new Set(['content-type', 'content-length']),
    },
  );
}

/** Size and stored type of an object, or null when it is not there. */
export async function headObject(key: string): Promise<{ size: number } | null> {
  try {
    const head = await storageClient().send(
      new HeadObjectCommand({ Bucket: env.S3_BUCKET, Key: key }),
    );
    return { size: head.ContentLength ?? 0 };
  } catch (error) {
    if (isMissing(error)) return null;
    throw error;
  }
}

/** At most the first `count` bytes of an object (a ranged GET: the rest is never downloaded). */
export async function readFirstBytes(key: string, count: number): Promise<Uint8Array> {
  const object = await storageClient().send(
    new GetObjectCommand({ Bucket: env.S3_BUCKET, Key: key, Range: `bytes=0-${count - 1}` }),
  );
  if (!object.Body) return new Uint8Array();
  const bytes = await object.Body.transformToByteArray();
  return bytes.subarray(0, count);
}

/** Stores bytes the server has checked, with the type they were found to be. */
export async function putObject(key: string, bytes: Uint8Array, contentType: string) {
  await storageClient().send(
    new PutObjectCommand({
      Bucket: env.S3_BUCKET,
      Key: key,
      Body: bytes,
      ContentType: contentType,
      ContentLength: bytes.length,
    }),
  );
}

/** An object's bytes as a stream, with its size, or null when it is not there. */
export async function openObject(
  key: string,
): Promise<{ body: ReadableStream<Uint8Array>; size: number } | null> {
  try {
    const object = await storageClient().send(
      new GetObjectCommand({ Bucket: env.S3_BUCKET, Key: key }),
    );
    if (!object.Body) return null;
    return { body: object.Body.transformToWebStream(), size: object.ContentLength ?? 0 };
  } catch (error) {
    if (isMissing(error)) return null;
    throw error;
  }
}

export async function deleteObject(key: string): Promise<void> {
  await storageClient().send(new DeleteObjectCommand({ Bucket: env.S3_BUCKET, Key: key }));
}

function isMissing(error: unknown): boolean {
  return (
    error instanceof S3ServiceException &&
    (error.name === 'NotFound' ||
      error.name === 'NoSuchKey' ||
      error.$metadata.httpStatusCode === 404)
  );
}
