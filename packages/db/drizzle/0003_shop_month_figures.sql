CREATE TABLE "shop_month_figures" (
	"shop_id" integer NOT NULL,
	"month" date NOT NULL,
	"jobs_ready" integer NOT NULL,
	"customer_n" integer NOT NULL,
	"customer_total" bigint NOT NULL,
	"customer_minutes" text NOT NULL,
	"bench_n" integer NOT NULL,
	"bench_total" bigint NOT NULL,
	"bench_turnarounds" text NOT NULL,
	"waiting_minutes" bigint NOT NULL,
	"promised" integer NOT NULL,
	"on_time" integer NOT NULL,
	"revenue_cents" bigint NOT NULL,
	"labour_cents" bigint NOT NULL,
	"bench_minutes" bigint NOT NULL,
	"collected" integer NOT NULL,
	CONSTRAINT "shop_month_figures_shop_id_month_pk" PRIMARY KEY("shop_id","month")
);
--> statement-breakpoint
ALTER TABLE "comebacks" ADD COLUMN "original_collected_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "shop_month_figures" ADD CONSTRAINT "shop_month_figures_shop_id_shops_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shops"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "comebacks_original_shop_collected_idx" ON "comebacks" USING btree ("original_shop_id","original_collected_at","detected_at","original_job_id","status","attribution");--> statement-breakpoint
ALTER TABLE "jobs" ADD CONSTRAINT "jobs_turnaround_range" CHECK ("jobs"."customer_turnaround_minutes" between 0 and 9999999
        and "jobs"."bench_turnaround_minutes" between 0 and 9999999);--> statement-breakpoint
-- shop_month_figures and comebacks.original_collected_at are derived from the jobs table and kept
-- equal to it by the triggers below; the application never writes them.
--
-- The figures of a shop's jobs that became ready in [p_from, p_to): what a shop_month_figures row
-- holds for its month, and what the network comparison reads for the days of a period outside
-- whole months. Turnarounds are listed ascending, each as 7 decimal digits with no separator
-- (jobs_turnaround_range keeps them in 0…9,999,999), so a reader can pick the i-th directly.
CREATE FUNCTION shop_ready_figures(p_shop integer, p_from timestamptz, p_to timestamptz)
RETURNS TABLE (
  jobs_ready integer, customer_n integer, customer_total bigint, customer_minutes text,
  bench_n integer, bench_total bigint, bench_turnarounds text, waiting_minutes bigint,
  promised integer, on_time integer, revenue_cents bigint, labour_cents bigint,
  bench_minutes bigint
) LANGUAGE sql STABLE AS $$
  SELECT count(*)::integer,
    count(j.customer_turnaround_minutes)::integer,
    coalesce(sum(j.customer_turnaround_minutes), 0)::bigint,
    coalesce(string_agg(lpad(j.customer_turnaround_minutes::text, 7, '0'), ''
      ORDER BY j.customer_turnaround_minutes), ''),
    count(j.bench_turnaround_minutes)::integer,
    coalesce(sum(j.bench_turnaround_minutes), 0)::bigint,
    coalesce(string_agg(lpad(j.bench_turnaround_minutes::text, 7, '0'), ''
      ORDER BY j.bench_turnaround_minutes), ''),
    coalesce(sum(j.customer_turnaround_minutes - j.bench_turnaround_minutes), 0)::bigint,
    count(j.promised_at)::integer,
    (count(*) FILTER (WHERE j.ready_at <= j.promised_at))::integer,
    coalesce(sum(j.labour_cents + j.parts_cents - j.discount_cents), 0)::bigint,
    coalesce(sum(j.labour_cents), 0)::bigint,
    coalesce(sum(j.bench_minutes), 0)::bigint
  FROM jobs j
  WHERE j.shop_id = p_shop AND j.ready_at >= p_from AND j.ready_at < p_to
$$;
--> statement-breakpoint
-- The distinct (shop, first day of the shop-local month) pairs of the given instants, one shop id
-- per instant.
CREATE FUNCTION shop_months_of(p_shops integer[], p_instants timestamptz[])
RETURNS TABLE (shop_id integer, month date) LANGUAGE sql STABLE AS $$
  SELECT DISTINCT u.shop_id, date_trunc('month', u.at AT TIME ZONE s.time_zone)::date
  FROM unnest(p_shops, p_instants) AS u(shop_id, at)
  JOIN shops s ON s.id = u.shop_id
  WHERE u.at IS NOT NULL
$$;
--> statement-breakpoint
-- Recomputes the shop_month_figures rows of the months holding the given instants from the jobs
-- table: the jobs that became ready in each month and those collected in it. A month with
-- neither has no row. Transactions recomputing the same shop's months take turns (a lock per
-- shop, held to commit, taken in shop order), so that the later one counts the earlier one's
-- jobs and neither inserts a row the other has just written.
CREATE FUNCTION refresh_shop_month_figures(p_shops integer[], p_instants timestamptz[])
RETURNS void LANGUAGE plpgsql AS $$
BEGIN
  PERFORM pg_advisory_xact_lock(20260301, x.shop_id)
  FROM (SELECT DISTINCT u.shop_id FROM unnest(p_shops) AS u(shop_id) ORDER BY 1) x;
  DELETE FROM shop_month_figures f USING shop_months_of(p_shops, p_instants) k
  WHERE f.shop_id = k.shop_id AND f.month = k.month;
  INSERT INTO shop_month_figures
  SELECT k.shop_id, k.month, r.jobs_ready, r.customer_n, r.customer_total, r.customer_minutes,
    r.bench_n, r.bench_total, r.bench_turnarounds, r.waiting_minutes, r.promised, r.on_time,
    r.revenue_cents, r.labour_cents, r.bench_minutes, c.collected
  FROM shop_months_of(p_shops, p_instants) k
  JOIN shops s ON s.id = k.shop_id
  CROSS JOIN LATERAL (
    SELECT (k.month::timestamp AT TIME ZONE s.time_zone) AS t0,
      ((k.month + interval '1 month')::timestamp AT TIME ZONE s.time_zone) AS t1
  ) b
  CROSS JOIN LATERAL shop_ready_figures(k.shop_id, b.t0, b.t1) r
  CROSS JOIN LATERAL (
    SELECT count(*)::integer AS collected
    FROM jobs j
    WHERE j.shop_id = k.shop_id AND j.collected_at >= b.t0 AND j.collected_at < b.t1
  ) c
  WHERE r.jobs_ready > 0 OR c.collected > 0;
END $$;
--> statement-breakpoint
-- Rebuilds every derived figure of one shop, or of all shops when called without one: after a
-- shop's time zone changes (its local months move), and after a bulk load with triggers off.
CREATE FUNCTION rebuild_shop_month_figures(p_shop integer DEFAULT NULL)
RETURNS void LANGUAGE plpgsql AS $$
BEGIN
  DELETE FROM shop_month_figures WHERE p_shop IS NULL OR shop_id = p_shop;
  PERFORM refresh_shop_month_figures(k.shops, k.instants)
  FROM (
    SELECT array_agg(j.shop_id) AS shops, array_agg(x.at) AS instants
    FROM jobs j
    CROSS JOIN LATERAL (VALUES (j.ready_at), (j.collected_at)) AS x(at)
    WHERE x.at IS NOT NULL AND (p_shop IS NULL OR j.shop_id = p_shop)
  ) k
  WHERE k.shops IS NOT NULL;
  UPDATE comebacks c SET original_collected_at = j.collected_at
  FROM jobs j
  WHERE j.id = c.original_job_id AND (p_shop IS NULL OR c.original_shop_id = p_shop)
    AND c.original_collected_at IS DISTINCT FROM j.collected_at;
END $$;
--> statement-breakpoint
-- After each statement that inserts, updates or deletes jobs: the months the changed jobs were
-- ready or collected in, before and after the change, are recomputed; a changed collection time
-- is copied to the job's comebacks.
CREATE FUNCTION jobs_refresh_figures() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
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
--> statement-breakpoint
CREATE TRIGGER jobs_insert_figures AFTER INSERT ON jobs
  REFERENCING NEW TABLE AS new_jobs FOR EACH STATEMENT EXECUTE FUNCTION jobs_refresh_figures();
--> statement-breakpoint
CREATE TRIGGER jobs_update_figures AFTER UPDATE ON jobs
  REFERENCING OLD TABLE AS old_jobs NEW TABLE AS new_jobs
  FOR EACH STATEMENT EXECUTE FUNCTION jobs_refresh_figures();
--> statement-breakpoint
CREATE TRIGGER jobs_delete_figures AFTER DELETE ON jobs
  REFERENCING OLD TABLE AS old_jobs FOR EACH STATEMENT EXECUTE FUNCTION jobs_refresh_figures();
--> statement-breakpoint
-- A comeback carries its original job's collection time from the start.
CREATE FUNCTION comebacks_copy_collected_at() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  NEW.original_collected_at := (SELECT j.collected_at FROM jobs j WHERE j.id = NEW.original_job_id);
  RETURN NEW;
END $$;
--> statement-breakpoint
CREATE TRIGGER comebacks_copy_collected_at BEFORE INSERT OR UPDATE OF original_job_id ON comebacks
  FOR EACH ROW EXECUTE FUNCTION comebacks_copy_collected_at();
--> statement-breakpoint
-- A shop's local months move with its time zone.
CREATE FUNCTION shops_rebuild_figures() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  PERFORM rebuild_shop_month_figures(NEW.id);
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER shops_time_zone_figures AFTER UPDATE OF time_zone ON shops
  FOR EACH ROW WHEN (OLD.time_zone IS DISTINCT FROM NEW.time_zone)
  EXECUTE FUNCTION shops_rebuild_figures();
--> statement-breakpoint
-- The figures of the jobs already recorded.
SELECT rebuild_shop_month_figures();
