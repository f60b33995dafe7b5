import { and, asc, eq, inArray, isNotNull, isNull } from '@reelwright/db';
import { activityLog, jobs, photos, shops, users } from '@reelwright/db/schema';
import {
  PHOTO_MAX_BYTES,
  PHOTO_STAGES,
  type PhotoStage,
  type PhotoUploadRequest,
} from '~/lib/validators/photos';
import { API_CONTENT_SECURITY_POLICY } from '~/lib/security-headers';
import { db } from '../db';
import { ApiError, badRequest, notFound } from '../errors';
import type { Principal } from '../principal';
import { shopScope } from '../queries/scope';
import {
  confirmedKey,
  deleteObject,
  headObject,
  openObject,
  presignUpload,
  putObject,
  readFirstBytes,
  storageConfigured,
  uploadKey,
  UPLOAD_URL_SECONDS,
} from '../storage';
import { checkPhoto, tooLargeReason } from './check';
import * as clock from '~/server/clock';

export interface PhotoView {
  id: number;
  stage: PhotoStage;
  contentType: string;
  sizeBytes: number;
  originalName: string | null;
  uploadedBy: string | null;
  createdAt: string;
  /** The app's own URL for the photo (served with its checked type, access checked per request). */
  url: string;
}

export interface UploadTicket {
  photoId: number;
  uploadUrl: string;
  /** The headers the PUT must carry exactly (they are part of the signature). */
  headers: Record<string, string>;
  expiresAt: string;
}

export const storageUnavailable = () =>
  new ApiError(
    503,
    'storage-unavailable',
    'Photo storage unavailable',
    'Photo storage is not configured on this server (set S3_ENDPOINT or S3 credentials).',
  );

/** The job, if it belongs to one of the caller's shops; otherwise not found. */
async function jobInScope(principal: Principal, jobId: number) {
  const conn = await db();
  const [job] = await conn
    .select({ id: jobs.id, shopId: jobs.shopId, timeZone: shops.timeZone })
    .from(jobs)
    .innerJoin(shops, eq(shops.id, jobs.shopId))
    .where(and(eq(jobs.id, jobId), shopScope(principal)))
    .limit(1);
  if (!job) throw notFound('job');
  return job;
}

/** Records a pending photo and hands back where the browser uploads it. */
export async function startPhotoUpload(
  principal: Principal,
  jobId: number,
  request: PhotoUploadRequest,
): Promise<UploadTicket> {
  const job = await jobInScope(principal, jobId);
  if (!storageConfigured()) throw storageUnavailable();
  const contentType = request.contentType.toLowerCase();
  const key = uploadKey(job.shopId, job.id);
  const conn = await db();
  const [row] = await conn
    .insert(photos)
    .values({
      jobId: job.id,
      stage: request.stage,
      storageKey: key,
      contentType,
      sizeBytes: request.size,
      originalName: request.fileName?.slice(0, 255) ?? null,
      uploadedById: principal.id,
    })
    .returning({ id: photos.id });
  const uploadUrl = await presignUpload(key, { contentType, size: request.size });
  return {
    photoId: row!.id,
    uploadUrl,
    headers: { 'content-type': contentType },
    expiresAt: new Date(Date.now() + UPLOAD_URL_SECONDS * 1000).toISOString(),
  };
}

/**
 * Checks an uploaded photo from all of its stored bytes, then writes the checked image to a key of
 * its own that no upload URL can reach and removes the upload. A photo that fails is removed from
 * storage and from the job.
 */
export async function confirmPhotoUpload(
  principal: Principal,
  jobId: number,
  photoId: number,
  now = clock.now(),
): Promise<PhotoView> {
  const job = await jobInScope(principal, jobId);
  if (!storageConfigured()) throw storageUnavailable();
  const conn = await db();
  const [photo] = await conn
    .select()
    .from(photos)
    .where(and(eq(photos.id, photoId), eq(photos.jobId, job.id)))
    .limit(1);
  if (!photo) throw notFound('photo');
  if (photo.confirmedAt) return (await viewPhotos(job.id, [photo.id]))[0]!;

  const refuse = async (reason: string, keepObject = false) => {
    if (!keepObject) await deleteObject(photo.storageKey).catch(() => undefined);
    await conn.delete(photos).where(and(eq(photos.id, photo.id), isNull(photos.confirmedAt)));
    return badRequest(reason, [{ field: 'file', message: reason }]);
  };

  const head = await headObject(photo.storageKey);
  if (!head)
    throw await refuse('The photo did not arrive in storage. Please upload it again.', true);
  if (head.size > PHOTO_MAX_BYTES) throw await refuse(tooLargeReason(head.size));
  // One byte past the limit is enough to tell a file that grew since the HEAD.
  const check = await checkPhoto(await readFirstBytes(photo.storageKey, PHOTO_MAX_BYTES + 1));
  if (!check.ok) throw await refuse(check.reason);

  // The bytes that were checked are the bytes kept: a PUT racing this check changes nothing.
  const key = confirmedKey(job.shopId, job.id);
  await putObject(key, check.image, check.contentType);
  const confirmed = await conn.transaction(async (tx) => {
    const [row] = await tx
      .update(photos)
      .set({
        storageKey: key,
        contentType: check.contentType,
        sizeBytes: check.image.length,
        width: check.width,
        height: check.height,
        confirmedAt: now,
      })
      .where(and(eq(photos.id, photo.id), isNull(photos.confirmedAt)))
      .returning({ id: photos.id });
    if (!row) return false;
    await tx.insert(activityLog).values({
      userId: principal.id,
      action: 'photo.add',
      entityType: 'job',
      entityId: job.id,
      shopId: job.shopId,
      after: { photoId: photo.id, stage: photo.stage, contentType: check.contentType },
    });
    return true;
  });
  // A confirmation that lost a race leaves the winner's copy in place.
  if (!confirmed) await deleteObject(key).catch(() => undefined);
  await deleteObject(photo.storageKey).catch(() => undefined);
  return (await viewPhotos(job.id, [photo.id]))[0]!;
}

/**
 * The job's checked photos, by stage and then upload order, each with a short-lived view URL, and
 * the shop's time zone to show their times in.
 */
export async function listPhotos(
  principal: Principal,
  jobId: number,
): Promise<{ photos: PhotoView[]; timeZone: string }> {
  const job = await jobInScope(principal, jobId);
  const conn = await db();
  const rows = await conn
    .select({ id: photos.id, stage: photos.stage })
    .from(photos)
    .where(and(eq(photos.jobId, job.id), isNotNull(photos.confirmedAt)))
    .orderBy(asc(photos.createdAt), asc(photos.id));
  if (!rows.length) return { photos: [], timeZone: job.timeZone };
  if (!storageConfigured()) throw storageUnavailable();
  const views = await viewPhotos(
    job.id,
    rows.map((r) => r.id),
  );
  const order = (s: PhotoStage) => PHOTO_STAGES.indexOf(s);
  return { photos: views.sort((a, b) => order(a.stage) - order(b.stage)), timeZone: job.timeZone };
}

async function viewPhotos(jobId: number, ids: number[]): Promise<PhotoView[]> {
  const conn = await db();
  const rows = await conn
    .select({ photo: photos, uploadedBy: users.name })
    .from(photos)
    .leftJoin(users, eq(users.id, photos.uploadedById))
    .where(inArray(photos.id, ids))
    .orderBy(asc(photos.createdAt), asc(photos.id));
  return rows.map(({ photo, uploadedBy }) => ({
    id: photo.id,
    stage: photo.stage,
    contentType: photo.contentType,
    sizeBytes: photo.sizeBytes,
    originalName: photo.originalName,
    uploadedBy,
    createdAt: photo.createdAt.toISOString(),
    url: `/api/jobs/${jobId}/photos/${photo.id}`,
  }));
}

/** The file extension of each type a photo may be served as (HEIC: photos kept before it was dropped). */
const EXTENSIONS: Record<string, string> = {
  'image/jpeg': 'jpg',
  'image/png': 'png',
  'image/webp': 'webp',
  'image/heic': 'heic',
  'image/heif': 'heif',
};

/** A photo of one of the caller's jobs (bench roles). */
export async function jobPhotoResponse(principal: Principal, jobId: number, photoId: number) {
  const job = await jobInScope(principal, jobId);
  return photoResponse(job.id, photoId);
}

/**
 * A checked photo of the job as a response of its own, built so that nothing uploaded can run as
 * the app's site: the type found in its bytes, no sniffing, shown inline under a name of ours, and
 * a policy that allows no script, style or frame even if it were opened as a document. The caller
 * has checked that the job is theirs to see.
 */
export async function photoResponse(jobId: number, photoId: number): Promise<Response> {
  const conn = await db();
  const [photo] = await conn
    .select({ key: photos.storageKey, contentType: photos.contentType, stage: photos.stage })
    .from(photos)
    .where(and(eq(photos.id, photoId), eq(photos.jobId, jobId), isNotNull(photos.confirmedAt)))
    .limit(1);
  if (!photo) throw notFound('photo');
  if (!storageConfigured()) throw storageUnavailable();
  const object = await openObject(photo.key);
  if (!object) throw notFound('photo');
  const extension = EXTENSIONS[photo.contentType];
  const name = `job-${jobId}-${photo.stage.replace('_', '-')}-${photoId}.${extension ?? 'bin'}`;
  return new Response(object.body, {
    headers: {
      'content-type': extension ? photo.contentType : 'application/octet-stream',
      'content-length': String(object.size),
      'content-disposition': `${extension ? 'inline' : 'attachment'}; filename="${name}"`,
      'x-content-type-options': 'nosniff',
      'content-security-policy': API_CONTENT_SECURITY_POLICY,
      'cross-origin-resource-policy': 'same-origin',
      // A checked photo never changes under its id; access is checked again once this expires.
      'cache-control': 'private, max-age=3600',
    },
  });
}
