import { sql } from 'drizzle-orm';
import { check, index, integer, pgTable, text } from 'drizzle-orm/pg-core';
import { createdAt, id, instant } from './columns';
import { photoStage } from './enums';
import { jobs } from './jobs';
import { users } from './users';

export const photos = pgTable(
  'photos',
  {
    id: id(),
    jobId: integer('job_id')
      .notNull()
      .references(() => jobs.id, { onDelete: 'cascade' }),
    stage: photoStage('stage').notNull(),
    /** Object-storage key. */
    storageKey: text('storage_key').notNull().unique(),
    /** MIME type detected from the file's bytes, not its name. */
    contentType: text('content_type').notNull(),
    sizeBytes: integer('size_bytes').notNull(),
    width: integer('width'),
    height: integer('height'),
    originalName: text('original_name'),
    caption: text('caption'),
    uploadedById: integer('uploaded_by_id').references(() => users.id),
    /** Null until the upload to storage is confirmed and checked. */
    confirmedAt: instant('confirmed_at'),
    createdAt: createdAt(),
  },
  (t) => [
    index('photos_job_id_idx').on(t.jobId),
    check('photos_size_nonnegative', sql`${t.sizeBytes} >= 0`),
  ],
);
export type Photo = typeof photos.$inferSelect;
export type NewPhoto = typeof photos.$inferInsert;
