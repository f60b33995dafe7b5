import { queryOptions } from '@tanstack/react-query';
import type { PhotoView, UploadTicket } from '~/server/photos/service';
import { DECLARED_PHOTO_TYPE, PHOTO_TYPES_TEXT, type PhotoStage } from '../photos';
import { fetchJson, ProblemError } from '../api-client';

export const photoKeys = {
  job: (jobId: number) => ['jobs', jobId, 'photos'] as const,
};

export const jobPhotosQuery = (jobId: number) =>
  queryOptions({
    queryKey: photoKeys.job(jobId),
    queryFn: () =>
      fetchJson<{ photos: PhotoView[]; timeZone: string }>(`/api/jobs/${jobId}/photos`),
    staleTime: 5 * 60_000,
  });

const postJson = <T>(url: string, body: unknown) =>
  fetchJson<T>(url, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify(body),
  });

/** PUTs the file to storage, reporting progress (fetch cannot report upload progress). */
function putWithProgress(
  ticket: UploadTicket,
  file: File,
  onProgress: (fraction: number) => void,
): Promise<void> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('PUT', ticket.uploadUrl);
    for (const [name, value] of Object.entries(ticket.headers)) xhr.setRequestHeader(name, value);
    xhr.upload.onprogress = (event) => {
      if (event.lengthComputable) onProgress(event.loaded / event.total);
    };
    xhr.onload = () =>
      xhr.status >= 200 && xhr.status < 300
        ? resolve()
        : reject(
            new ProblemError(xhr.status, {
              title: 'Upload failed',
              detail: `Storage refused the upload (HTTP ${xhr.status}). Please try again.`,
            }),
          );
    xhr.onerror = () =>
      reject(
        new ProblemError(0, {
          title: 'Upload failed',
          detail: 'The photo could not reach storage. Check the connection and try again.',
        }),
      );
    xhr.send(file);
  });
}

/** Ask for an upload URL, send the file straight to storage, then have the server check it. */
export async function uploadPhoto(
  jobId: number,
  stage: PhotoStage,
  file: File,
  onProgress: (fraction: number) => void,
): Promise<PhotoView> {
  // Checked here too, so a file the server would refuse at the start is not offered to it.
  if (!DECLARED_PHOTO_TYPE.test(file.type)) {
    throw new ProblemError(400, {
      title: 'Not a photo',
      detail: `This file is not a ${PHOTO_TYPES_TEXT} photo.`,
    });
  }
  const ticket = await postJson<UploadTicket>(`/api/jobs/${jobId}/photos`, {
    stage,
    contentType: file.type,
    size: file.size,
    fileName: file.name,
  });
  await putWithProgress(ticket, file, onProgress);
  const { photo } = await postJson<{ photo: PhotoView }>(`/api/jobs/${jobId}/photos`, {
    confirm: ticket.photoId,
  });
  return photo;
}
