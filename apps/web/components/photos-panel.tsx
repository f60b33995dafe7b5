'use client';

import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useEffect, useId, useRef, useState, type ChangeEvent } from 'react';
import { ProblemError } from '~/lib/api-client';
import { formatInZone } from '~/lib/format';
import { jobPhotosQuery, photoKeys, uploadPhoto } from '~/lib/queries/photos';
import {
  PHOTO_MAX_BYTES,
  PHOTO_STAGE_LABELS,
  PHOTO_STAGES,
  PHOTO_TYPES_TEXT,
  type PhotoStage,
} from '~/lib/photos';
import type { PhotoView } from '~/server/photos/service';

interface UploadState {
  key: string;
  name: string;
  progress: number;
  error?: string;
}

/** HEIC photos kept before only JPEG, PNG and WebP were accepted get a tile and a download. */
const showsInline = (type: string) => type !== 'image/heic' && type !== 'image/heif';

const sizeText = (bytes: number) =>
  bytes >= 1024 * 1024
    ? `${(bytes / (1024 * 1024)).toFixed(1)} MB`
    : `${Math.max(1, Math.round(bytes / 1024))} KB`;

/** In the shop's zone, like every other time on the job. */
const timeText = (iso: string, timeZone: string) =>
  formatInZone(new Date(iso), timeZone, 'EEE d MMM yyyy, HH:mm');

/**
 * The job's photos at check-in, teardown and reassembly. Files go straight from the browser to
 * storage; the server checks each one by its bytes before it shows here.
 */
export function PhotosPanel({ jobId, canUpload }: { jobId: number; canUpload: boolean }) {
  const queryClient = useQueryClient();
  const { data, isPending, isError, error } = useQuery(jobPhotosQuery(jobId));
  const [stage, setStage] = useState<PhotoStage>('check_in');
  const [uploads, setUploads] = useState<UploadState[]>([]);
  const [open, setOpen] = useState<number | null>(null);
  const id = useId();

  const photos = data?.photos ?? [];

  const upload = useMutation({
    mutationFn: async (files: File[]) => {
      for (const [index, file] of files.entries()) {
        const key = `${Date.now()}-${index}-${file.name}`;
        const patch = (change: Partial<UploadState>) =>
          setUploads((list) => list.map((u) => (u.key === key ? { ...u, ...change } : u)));
        setUploads((list) => [...list, { key, name: file.name, progress: 0 }]);
        if (file.size > PHOTO_MAX_BYTES) {
          patch({ error: `${sizeText(file.size)} is over the 10 MB limit.` });
          continue;
        }
        try {
          await uploadPhoto(jobId, stage, file, (progress) => patch({ progress }));
          setUploads((list) => list.filter((u) => u.key !== key));
        } catch (e) {
          patch({
            error: e instanceof ProblemError ? e.message : 'The upload failed. Please try again.',
          });
        }
        await queryClient.invalidateQueries({ queryKey: photoKeys.job(jobId) });
      }
    },
  });

  const onFiles = (event: ChangeEvent<HTMLInputElement>) => {
    const files = Array.from(event.target.files ?? []);
    event.target.value = '';
    if (files.length) upload.mutate(files);
  };

  return (
    <section
      aria-labelledby={`${id}-title`}
      className="rounded-lg border border-sand-200 bg-white shadow-sm"
    >
      <div className="flex flex-wrap items-end justify-between gap-4 border-b border-sand-200 px-5 py-4">
        <div>
          <h2 id={`${id}-title`} className="text-lg font-semibold text-slate-900">
            Photos
          </h2>
          <p className="mt-1 text-slate-600">
            {canUpload
              ? `Photograph the reel before teardown so it goes back together right. ${PHOTO_TYPES_TEXT}, up to 10 MB.`
              : 'Taken by the shop at check-in, teardown and reassembly.'}
          </p>
        </div>
        {canUpload && (
          <div className="flex flex-wrap items-end gap-3">
            <div>
              <label htmlFor={`${id}-stage`} className="block text-sm font-medium text-slate-700">
                Stage
              </label>
              <select
                id={`${id}-stage`}
                value={stage}
                onChange={(e) => setStage(e.target.value as PhotoStage)}
                className="mt-1 min-h-11 rounded-md border border-slate-400 bg-white px-3 text-slate-900"
              >
                {PHOTO_STAGES.map((s) => (
                  <option key={s} value={s}>
                    {PHOTO_STAGE_LABELS[s]}
                  </option>
                ))}
              </select>
            </div>
            <label className="inline-flex min-h-11 cursor-pointer items-center gap-2 rounded-md bg-sea-700 px-4 font-medium text-white hover:bg-sea-800 has-[:focus-visible]:outline-2 has-[:focus-visible]:outline-offset-2 has-[:focus-visible]:outline-sea-700">
              <input
                type="file"
                accept="image/*"
                capture="environment"
                multiple
                onChange={onFiles}
                className="sr-only"
              />
              <CameraIcon />
              Take or add photos
            </label>
          </div>
        )}
      </div>

      <div className="space-y-6 p-5">
        {uploads.length > 0 && (
          <ul className="space-y-2" aria-label="Uploads">
            {uploads.map((u) => (
              <li
                key={u.key}
                className={`rounded-md border px-3 py-2 ${u.error ? 'border-brick-300 bg-brick-50' : 'border-sand-200'}`}
              >
                {u.error ? (
                  <div role="alert" className="flex flex-wrap items-start justify-between gap-2">
                    <p className="text-brick-800">
                      <span className="font-medium">{u.name} was not added.</span> {u.error}
                    </p>
                    <button
                      type="button"
                      className="rounded px-2 text-sm font-medium text-brick-800 underline"
                      onClick={() => setUploads((list) => list.filter((x) => x.key !== u.key))}
                    >
                      Dismiss
                    </button>
                  </div>
                ) : (
                  <label className="flex items-center gap-3 text-slate-700">
                    <span className="min-w-0 flex-1 truncate">Uploading {u.name}</span>
                    <progress
                      max={1}
                      value={u.progress}
                      className="h-2 w-40 appearance-none overflow-hidden rounded-full bg-sand-200 [&::-moz-progress-bar]:bg-sea-700 [&::-webkit-progress-bar]:bg-sand-200 [&::-webkit-progress-value]:bg-sea-700"
                      aria-valuetext={`${Math.round(u.progress * 100)}%`}
                    />
                    <span className="num w-12 text-sm">{Math.round(u.progress * 100)}%</span>
                  </label>
                )}
              </li>
            ))}
          </ul>
        )}

        {isPending ? (
          <p className="text-slate-600">Loading photos…</p>
        ) : isError ? (
          <p role="alert" className="text-brick-800">
            Photos could not be loaded: {error.message}
          </p>
        ) : (
          PHOTO_STAGES.map((s) => {
            const inStage = photos.filter((p) => p.stage === s);
            return (
              <div key={s}>
                <h3 className="mb-2 font-semibold text-slate-800">
                  {PHOTO_STAGE_LABELS[s]}{' '}
                  <span className="font-normal text-slate-600">({inStage.length})</span>
                </h3>
                {inStage.length === 0 ? (
                  <p className="text-slate-600">No photos yet.</p>
                ) : (
                  <ul className="grid grid-cols-[repeat(auto-fill,minmax(8rem,1fr))] gap-3">
                    {inStage.map((photo, i) => (
                      <li key={photo.id}>
                        <button
                          type="button"
                          onClick={() => setOpen(photo.id)}
                          className="group block aspect-square w-full overflow-hidden rounded-md border border-sand-300 bg-sand-100"
                          aria-label={`Open ${PHOTO_STAGE_LABELS[s].toLowerCase()} photo ${i + 1} of ${inStage.length}`}
                        >
                          {showsInline(photo.contentType) ? (
                            // eslint-disable-next-line @next/next/no-img-element -- served by the app's photo route, not optimisable
                            <img
                              src={photo.url}
                              alt=""
                              loading="lazy"
                              className="size-full object-cover transition group-hover:opacity-90"
                            />
                          ) : (
                            <span className="flex size-full flex-col items-center justify-center gap-1 text-slate-700">
                              <CameraIcon />
                              <span className="text-sm font-medium">HEIC photo</span>
                            </span>
                          )}
                        </button>
                      </li>
                    ))}
                  </ul>
                )}
              </div>
            );
          })
        )}
      </div>

      <PhotoDialog
        photos={photos}
        timeZone={data?.timeZone ?? 'UTC'}
        openId={open}
        onChange={setOpen}
      />
    </section>
  );
}

function PhotoDialog(props: {
  photos: PhotoView[];
  timeZone: string;
  openId: number | null;
  onChange: (id: number | null) => void;
}) {
  const ref = useRef<HTMLDialogElement>(null);
  const titleId = useId();
  const index = props.photos.findIndex((p) => p.id === props.openId);
  const photo = index >= 0 ? props.photos[index] : undefined;

  useEffect(() => {
    const dialog = ref.current;
    if (!dialog) return;
    if (photo && !dialog.open) dialog.showModal();
    if (!photo && dialog.open) dialog.close();
  }, [photo]);

  const step = (by: number) => {
    if (index < 0 || props.photos.length < 2) return;
    const next = props.photos[(index + by + props.photos.length) % props.photos.length];
    props.onChange(next?.id ?? null);
  };

  return (
    <dialog
      ref={ref}
      aria-labelledby={titleId}
      onClose={() => props.onChange(null)}
      onKeyDown={(e) => {
        if (e.key === 'ArrowRight') step(1);
        if (e.key === 'ArrowLeft') step(-1);
      }}
      onClick={(e) => {
        // A click on the backdrop (outside the content box) closes, as Escape does.
        if (e.target === ref.current) ref.current?.close();
      }}
      className="m-auto max-h-[95vh] w-[min(64rem,95vw)] rounded-lg bg-white p-0 shadow-xl backdrop:bg-slate-950/70"
    >
      {photo && (
        <div className="flex max-h-[95vh] flex-col">
          <div className="flex flex-wrap items-center justify-between gap-3 border-b border-sand-200 px-5 py-3">
            <h2 id={titleId} className="text-lg font-semibold text-slate-900">
              {PHOTO_STAGE_LABELS[photo.stage]} photo{' '}
              <span className="font-normal text-slate-600">
                {index + 1} of {props.photos.length}
              </span>
            </h2>
            <div className="flex gap-2">
              {props.photos.length > 1 && (
                <>
                  <button type="button" className={dialogButton} onClick={() => step(-1)}>
                    ← Previous
                  </button>
                  <button type="button" className={dialogButton} onClick={() => step(1)}>
                    Next →
                  </button>
                </>
              )}
              <button
                type="button"
                className={dialogButton}
                onClick={() => ref.current?.close()}
                autoFocus
              >
                Close
              </button>
            </div>
          </div>
          <div className="flex min-h-0 flex-1 items-center justify-center bg-slate-900">
            {showsInline(photo.contentType) ? (
              // eslint-disable-next-line @next/next/no-img-element -- served by the app's photo route, not optimisable
              <img
                src={photo.url}
                alt={`${PHOTO_STAGE_LABELS[photo.stage]} photo of the reel`}
                className="h-[75vh] w-full object-contain"
              />
            ) : (
              <p className="p-10 text-center text-white">
                This browser cannot show HEIC photos.{' '}
                <a href={photo.url} className="font-medium underline" download>
                  Download the photo
                </a>{' '}
                to view it.
              </p>
            )}
          </div>
          <p className="px-5 py-3 text-sm text-slate-600">
            {photo.uploadedBy ? `Added by ${photo.uploadedBy}` : 'Added'} on{' '}
            {timeText(photo.createdAt, props.timeZone)} · {sizeText(photo.sizeBytes)}
            {photo.originalName ? ` · ${photo.originalName}` : ''}
          </p>
        </div>
      )}
    </dialog>
  );
}

const dialogButton =
  'min-h-11 rounded-md border border-slate-400 bg-white px-3 font-medium text-slate-800 hover:bg-sand-100';

function CameraIcon() {
  return (
    <svg
      viewBox="0 0 24 24"
      aria-hidden="true"
      className="size-5"
      fill="none"
      stroke="currentColor"
    >
      <path
        strokeWidth="1.8"
        strokeLinejoin="round"
        d="M4 8h3l1.5-2h7L17 8h3a1 1 0 0 1 1 1v9a1 1 0 0 1-1 1H4a1 1 0 0 1-1-1V9a1 1 0 0 1 1-1Z"
      />
      <circle cx="12" cy="13.5" r="3.5" strokeWidth="1.8" />
    </svg>
  );
}
