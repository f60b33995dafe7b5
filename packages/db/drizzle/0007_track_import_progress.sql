ALTER TABLE "customers" ADD COLUMN "import_batch_id" integer;--> statement-breakpoint
ALTER TABLE "reels" ADD COLUMN "import_batch_id" integer;--> statement-breakpoint
ALTER TABLE "import_batches" ADD COLUMN "heartbeat_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "customers" ADD CONSTRAINT "customers_import_batch_id_import_batches_id_fk" FOREIGN KEY ("import_batch_id") REFERENCES "public"."import_batches"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reels" ADD CONSTRAINT "reels_import_batch_id_import_batches_id_fk" FOREIGN KEY ("import_batch_id") REFERENCES "public"."import_batches"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "customers_import_batch_id_idx" ON "customers" USING btree ("import_batch_id") WHERE "customers"."import_batch_id" is not null;--> statement-breakpoint
CREATE INDEX "reels_import_batch_id_idx" ON "reels" USING btree ("import_batch_id") WHERE "reels"."import_batch_id" is not null;--> statement-breakpoint
CREATE INDEX "jobs_import_batch_id_idx" ON "jobs" USING btree ("import_batch_id") WHERE "jobs"."import_batch_id" is not null;--> statement-breakpoint
-- The monthly figures' trigger, as in 0003, but skipped while reelwright.defer_figures is on.
CREATE OR REPLACE FUNCTION jobs_refresh_figures() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  -- A bulk load in short transactions (the CSV import) sets this for its own transactions and
  -- recomputes the months it touched once, at the end.
  IF current_setting('reelwright.defer_figures', true) = 'on' THEN
    RETURN NULL;
  END IF;
  IF TG_OP = 'INSERT' THEN
    PERFORM refresh_shop_month_figures(k.shops, k.instants)
    FROM (
      SELECT array_agg(n.shop_id) AS shops, array_agg(x.at) AS instants
      FROM new_jobs n
      CROSS JOIN LATERAL (VALUES (n.ready_at), (n.collected_at)) AS x(at)
      WHERE x.at IS NOT NULL
    ) k
    WHERE k.shops IS NOT NULL;
  ELSIF TG_OP = 'DELETE' THEN
    PERFORM refresh_shop_month_figures(k.shops, k.instants)
    FROM (
      SELECT array_agg(o.shop_id) AS shops, array_agg(x.at) AS instants
      FROM old_jobs o
      CROSS JOIN LATERAL (VALUES (o.ready_at), (o.collected_at)) AS x(at)
      WHERE x.at IS NOT NULL
    ) k
    WHERE k.shops IS NOT NULL;
  ELSE
    PERFORM refresh_shop_month_figures(k.shops, k.instants)
    FROM (
      SELECT array_agg(v.shop_id) AS shops, array_agg(v.at) AS instants
      FROM old_jobs o
      JOIN new_jobs n ON n.id = o.id
      CROSS JOIN LATERAL (VALUES (o.shop_id, o.ready_at), (o.shop_id, o.collected_at),
        (n.shop_id, n.ready_at), (n.shop_id, n.collected_at)) AS v(shop_id, at)
      WHERE v.at IS NOT NULL
        AND (o.shop_id, o.ready_at, o.collected_at, o.promised_at,
          o.customer_turnaround_minutes, o.bench_turnaround_minutes, o.labour_cents,
          o.parts_cents, o.discount_cents, o.bench_minutes)
        IS DISTINCT FROM (n.shop_id, n.ready_at, n.collected_at, n.promised_at,
          n.customer_turnaround_minutes, n.bench_turnaround_minutes, n.labour_cents,
          n.parts_cents, n.discount_cents, n.bench_minutes)
    ) k
    WHERE k.shops IS NOT NULL;
    UPDATE comebacks c SET original_collected_at = n.collected_at
    FROM old_jobs o
    JOIN new_jobs n ON n.id = o.id
    WHERE c.original_job_id = n.id AND n.collected_at IS DISTINCT FROM o.collected_at;
  END IF;
  RETURN NULL;
END $$;
