CREATE TYPE "public"."command_kind" AS ENUM('boost', 'set_target', 'set_schedule');--> statement-breakpoint
CREATE TYPE "public"."command_state" AS ENUM('queued', 'sent', 'acknowledged', 'applied', 'rejected', 'failed');--> statement-breakpoint
CREATE TYPE "public"."telemetry_event_kind" AS ENUM('compressor_run', 'immersion_run', 'draw');--> statement-breakpoint
CREATE TABLE "commands" (
	"tank_id" uuid NOT NULL,
	"id" uuid DEFAULT gen_random_uuid() NOT NULL,
	"kind" "command_kind" NOT NULL,
	"params" jsonb NOT NULL,
	"state" "command_state" DEFAULT 'queued' NOT NULL,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"expires_at" timestamp with time zone NOT NULL,
	"sent_at" timestamp with time zone,
	"acknowledged_at" timestamp with time zone,
	"applied_at" timestamp with time zone,
	"detail" text,
	CONSTRAINT "commands_tank_id_id_pk" PRIMARY KEY("tank_id","id")
);
--> statement-breakpoint
CREATE TABLE "dead_letters" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"tank_id" uuid,
	"serial" text,
	"received_at" timestamp with time zone DEFAULT now() NOT NULL,
	"transport" text NOT NULL,
	"topic" text,
	"reason_code" text NOT NULL,
	"reason" text NOT NULL,
	"fields" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"payload" "bytea" NOT NULL,
	"payload_bytes" integer NOT NULL
);
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
	CONSTRAINT "readings_tank_id_ts_pk" PRIMARY KEY("tank_id","ts")
);
--> statement-breakpoint
CREATE TABLE "rollup_dirty" (
	"tank_id" uuid NOT NULL,
	"bucket" timestamp with time zone NOT NULL,
	CONSTRAINT "rollup_dirty_tank_id_bucket_pk" PRIMARY KEY("tank_id","bucket")
);
--> statement-breakpoint
CREATE TABLE "rollups_15m" (
	"tank_id" uuid NOT NULL,
	"bucket" timestamp with time zone NOT NULL,
	"samples" integer NOT NULL,
	"layers_avg_cc" smallint[] NOT NULL,
	"top_min_cc" smallint,
	"top_max_cc" smallint,
	"flow_avg_cc" smallint,
	"compressor_samples" integer NOT NULL,
	"immersion_samples" integer NOT NULL,
	"power_avg_w" real,
	"draw_avg_lpm" real,
	CONSTRAINT "rollups_15m_tank_id_bucket_pk" PRIMARY KEY("tank_id","bucket")
);
--> statement-breakpoint
CREATE TABLE "rollups_1h" (
	"tank_id" uuid NOT NULL,
	"bucket" timestamp with time zone NOT NULL,
	"samples" integer NOT NULL,
	"layers_avg_cc" smallint[] NOT NULL,
	"top_min_cc" smallint,
	"top_max_cc" smallint,
	"flow_avg_cc" smallint,
	"compressor_samples" integer NOT NULL,
	"immersion_samples" integer NOT NULL,
	"power_avg_w" real,
	"draw_avg_lpm" real,
	CONSTRAINT "rollups_1h_tank_id_bucket_pk" PRIMARY KEY("tank_id","bucket")
);
--> statement-breakpoint
CREATE TABLE "tank_latest_state" (
	"tank_id" uuid PRIMARY KEY NOT NULL,
	"ts" timestamp with time zone,
	"last_seen_at" timestamp with time zone,
	"seq" integer,
	"layers_cc" smallint[],
	"flow_cc" smallint,
	"return_cc" smallint,
	"compressor" boolean,
	"immersion_w" smallint,
	"power_w" smallint,
	"pump_pct" smallint,
	"draw_dlpm" smallint,
	"soc" real,
	"v40_l" real,
	"online" boolean,
	"status_at" timestamp with time zone,
	"derive" jsonb DEFAULT '{"lastTs":null,"open":{}}'::jsonb NOT NULL
);
--> statement-breakpoint
CREATE TABLE "telemetry_events" (
	"tank_id" uuid NOT NULL,
	"kind" "telemetry_event_kind" NOT NULL,
	"started_at" timestamp with time zone NOT NULL,
	"ended_at" timestamp with time zone,
	"energy_wh" real DEFAULT 0 NOT NULL,
	"litres" real DEFAULT 0 NOT NULL,
	"start_top_cc" smallint,
	"end_top_cc" smallint,
	"complete" boolean DEFAULT true NOT NULL,
	CONSTRAINT "telemetry_events_tank_id_kind_started_at_pk" PRIMARY KEY("tank_id","kind","started_at")
);
--> statement-breakpoint
ALTER TABLE "commands" ADD CONSTRAINT "commands_tank_id_tanks_id_fk" FOREIGN KEY ("tank_id") REFERENCES "public"."tanks"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "commands" ADD CONSTRAINT "commands_created_by_user_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dead_letters" ADD CONSTRAINT "dead_letters_tank_id_tanks_id_fk" FOREIGN KEY ("tank_id") REFERENCES "public"."tanks"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "rollups_15m" ADD CONSTRAINT "rollups_15m_tank_id_tanks_id_fk" FOREIGN KEY ("tank_id") REFERENCES "public"."tanks"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "rollups_1h" ADD CONSTRAINT "rollups_1h_tank_id_tanks_id_fk" FOREIGN KEY ("tank_id") REFERENCES "public"."tanks"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tank_latest_state" ADD CONSTRAINT "tank_latest_state_tank_id_tanks_id_fk" FOREIGN KEY ("tank_id") REFERENCES "public"."tanks"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "telemetry_events" ADD CONSTRAINT "telemetry_events_tank_id_tanks_id_fk" FOREIGN KEY ("tank_id") REFERENCES "public"."tanks"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "commands_tank_created_idx" ON "commands" USING btree ("tank_id","created_at");--> statement-breakpoint
CREATE INDEX "dead_letters_tank_time_idx" ON "dead_letters" USING btree ("tank_id","received_at");--> statement-breakpoint
CREATE INDEX "telemetry_events_tank_time_idx" ON "telemetry_events" USING btree ("tank_id","started_at");