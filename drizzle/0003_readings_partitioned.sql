-- Readings become a range-partitioned table (one partition a day), managed by pg_partman 4.7
-- (`partman.create_parent`, native partitioning). drizzle-kit cannot express partitioning, so
-- 0002 created a plain table from the schema and this migration replaces it while it is still
-- empty. The column list matches src/db/schema/telemetry.ts.
DROP TABLE "readings";
--> statement-breakpoint
CREATE TABLE "readings" (
	"tank_id" uuid NOT NULL,
	"ts" timestamp with time zone NOT NULL,
	"seq" integer,
	"layers_cc" smallint[] NOT NULL,
	"flow_cc" smallint,
	"return_cc" smallint,
	"compressor" boolean,
	"immersion_w" smallint,
	"power_w" smallint,
	"pump_pct" smallint,
	"draw_dlpm" smallint,
	CONSTRAINT "readings_tank_id_ts_pk" PRIMARY KEY ("tank_id", "ts")
) PARTITION BY RANGE ("ts");
--> statement-breakpoint
-- Partitions from 30 days back (the simulator backfills 14) to a week ahead; pg_partman's
-- background worker (preloaded by scripts/lib/postgres.ts) and the ingest worker's maintenance
-- keep premaking and apply the retention that the ingest worker sets from READINGS_RETENTION_DAYS.
SELECT partman.create_parent(
	p_parent_table => 'public.readings',
	p_control => 'ts',
	p_type => 'native',
	p_interval => 'daily',
	p_premake => 7,
	p_start_partition => to_char(now() - interval '30 days', 'YYYY-MM-DD'),
	p_jobmon => false
);
--> statement-breakpoint
UPDATE partman.part_config
SET infinite_time_partitions = true, retention = '90 days', retention_keep_table = false
WHERE parent_table = 'public.readings';
--> statement-breakpoint
-- Broker and HTTP authentication look a device up by the hash of its token. The tanks table is
-- defined elsewhere; this index is only an access path (and guarantees no two tanks share a token).
CREATE UNIQUE INDEX IF NOT EXISTS "tanks_device_token_hash_uq" ON "tanks" ("device_token_hash") WHERE "device_token_hash" IS NOT NULL;
