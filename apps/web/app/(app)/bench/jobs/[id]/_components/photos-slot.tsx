import { PhotosPanel } from '~/components/photos-panel';

/** The job's photos; the panel itself belongs to the photos work. */
export function PhotosSlot({ jobId, canUpload }: { jobId: number; canUpload: boolean }) {
  return <PhotosPanel jobId={jobId} canUpload={canUpload} />;
}
