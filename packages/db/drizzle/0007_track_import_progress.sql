ALTER TABLE "customers" ADD COLUMN "import_batch_id" integer;--> statement-breakpoint
ALTER TABLE "reels" ADD COLUMN "import_batch_id" integer;--> statement-breakpoint
ALTER TABLE "import_batches" ADD COLUMN "heartbeat_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "customers" ADD CONSTRAINT "customers_import_batch_id_import_batches_id_fk" FOREIGN KEY ("import_batch_id") REFERENCES "public"."import_batches"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reels" ADD CONSTRAINT "reels_import_batch_id_import_batches_id_fk" FOREIGN KEY ("import_batch_id") REFERENCES "public"."import_batches"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "customers_import_batch_id_idx" ON "customers" USING btree ("import_batch_id") WHERE "customers"."import_batch_id" is not null;--> statement-breakpoint
CREATE INDEX "reels_import_batch_id_idx" ON "reels" USING btree ("import_batch_id") WHERE "reels"."import_batch_id" is not null;--> statement-breakpoint
CREATE INDEX "jobs_import_batch_id_idx" ON "jobs" USING btree ("import_batch_id") WHERE "jobs"."import_batch_id" is not null;