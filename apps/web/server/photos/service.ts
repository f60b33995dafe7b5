import { and, asc, eq, inArray, isNotNull, isNull } from '@reelwright/db';
import { activityLog, jobs, photos, shops, users } from '@reelwright/db/schema';
import { PHOTO_STAGES, type PhotoStage, type PhotoUploadRequest } from '~/lib/validators/photos';
import { db } from '../db';
import { ApiError, badRequest, notFound } from '../errors';
import type { Principal } from '../principal';
import { shopScope } from '../queries/scope';
import {
  deleteObject,
  headObject,
  photoKey,
  presignUpload,
  presignView,
  readFirstBytes,
  storageConfigured,
  UPLOAD_URL_SECONDS,
  VIEW_URL_SECONDS,
} from '../storage';
import { checkPhoto, SNIFF_BYTES } from './check';

export interface PhotoView {
  id: number;
  stage: PhotoStage;
  contentType: string;
  sizeBytes: number;
  originalName: string | null;
  uploadedBy: string | null;
  createdAt: string;
  /** Short-lived URL that shows the photo. */
  url: string;
  urlExpiresAt: string;
}

export interface UploadTicket {
  photoId: number;
  uploadUrl: string;
  /** The headers the PUT must carry exactly (they are part of the signature). */
  headers: Record<string, string>;
  expiresAt: string;
}

const storageUnavailable = () =>
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
  const contentType = request.contentType || 'application/octet-stream';
  const key = photoKey(job.shopId, job.id);
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
 * Checks an uploaded photo where it is stored: its real size (HEAD) and its type from its first
 * bytes (ranged GET). A photo that fails is removed from storage and from the job.
 */
export async function confirmPhotoUpload(
  principal: Principal,
  jobId: number,
  photoId: number,
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
  if (photo.confirmedAt) return (await viewPhotos([photo.id]))[0]!;

  const refuse = async (reason: string, keepObject = false) => {
    if (!keepObject) await deleteObject(photo.storageKey).catch(() => undefined);
    await conn.delete(photos).where(and(eq(photos.id, photo.id), isNull(photos.confirmedAt)));
    return badRequest(reason, [{ field: 'file', message: reason }]);
  };

  const head = await headObject(photo.storageKey);
  if (!head)
    throw await refuse('The photo did not arrive in storage. Please upload it again.', true);
  const bytes = await readFirstBytes(photo.storageKey, Math.min(SNIFF_BYTES, head.size || 1));
  const check = await checkPhoto(bytes, head.size);
  if (!check.ok) throw await refuse(check.reason);

  await conn.transaction(async (tx) => {
    await tx
      .update(photos)
      .set({ contentType: check.contentType, sizeBytes: head.size, confirmedAt: new Date() })
      .where(eq(photos.id, photo.id));
    await tx.insert(activityLog).values({
      userId: principal.id,
      action: 'photo.add',
      entityType: 'job',
      entityId: job.id,
      shopId: job.shopId,
      after: { photoId: photo.id, stage: photo.stage, contentType: check.contentType },
    });
  });
  return (await viewPhotos([photo.id]))[0]!;
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
  const views = await viewPhotos(rows.map((r) => r.id));
  const order = (s: PhotoStage) => PHOTO_STAGES.indexOf(s);
  return { photos: views.sort((a, b) => order(a.stage) - order(b.stage)), timeZone: job.timeZone };
}

async function viewPhotos(ids: number[]): Promise<PhotoView[]> {
  const conn = await db();
  const rows = await conn
    .select({ photo: photos, uploadedBy: users.name })
    .from(photos)
    .leftJoin(users, eq(users.id, photos.uploadedById))
    .where(inArray(photos.id, ids))
    .orderBy(asc(photos.createdAt), asc(photos.id));
  const expiresAt = new Date(Date.now() + VIEW_URL_SECONDS * 1000).toISOString();
  return Promise.all(
    rows.map(async ({ photo, uploadedBy }) => ({
      id: photo.id,
      stage: photo.stage,
      contentType: photo.contentType,
      sizeBytes: photo.sizeBytes,
      originalName: photo.originalName,
      uploadedBy,
      createdAt: photo.createdAt.toISOString(),
      url: await presignView(photo.storageKey, photo.contentType),
      urlExpiresAt: expiresAt,
    })),
  );
}
