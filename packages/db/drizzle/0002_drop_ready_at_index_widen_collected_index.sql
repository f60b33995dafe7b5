DROP INDEX "jobs_shop_ready_at_idx";--> statement-breakpoint
DROP INDEX "jobs_shop_collected_at_idx";--> statement-breakpoint
CREATE INDEX "jobs_shop_collected_at_idx" ON "jobs" USING btree ("shop_id","collected_at","id");