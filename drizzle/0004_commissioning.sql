CREATE TYPE "public"."commissioning_status" AS ENUM('draft', 'signed');--> statement-breakpoint
CREATE TYPE "public"."service_visit_kind" AS ENUM('annual_inspection', 'fault', 'repair', 'other');--> statement-breakpoint
CREATE TABLE "commissioning_amendments" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"commissioning_id" uuid NOT NULL,
	"company_id" uuid NOT NULL,
	"field" text NOT NULL,
	"old_value" jsonb,
	"new_value" jsonb,
	"reason" text NOT NULL,
	"user_id" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "commissionings" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"company_id" uuid NOT NULL,
	"engineer_user_id" text,
	"status" "commissioning_status" DEFAULT 'draft' NOT NULL,
	"step" text DEFAULT 'home' NOT NULL,
	"data" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"home_id" uuid,
	"tank_id" uuid,
	"record" jsonb,
	"signed_at" timestamp with time zone,
	"signed_by" text,
	"pdf_key" text,
	"handover_sent_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "heat_pump_models" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"company_id" uuid NOT NULL,
	"name" text NOT NULL,
	"output_w" integer NOT NULL,
	"ntc_r25_ohm" real NOT NULL,
	"ntc_beta_k" real NOT NULL,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "service_visits" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"company_id" uuid NOT NULL,
	"tank_id" uuid NOT NULL,
	"kind" "service_visit_kind" NOT NULL,
	"visited_at" timestamp with time zone NOT NULL,
	"engineer_user_id" text,
	"findings" text NOT NULL,
	"parts" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"readings" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"resolved_alerts" text[] DEFAULT '{}' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "uploads" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"company_id" uuid NOT NULL,
	"commissioning_id" uuid,
	"tank_id" uuid,
	"visit_id" uuid,
	"kind" text NOT NULL,
	"filename" text NOT NULL,
	"content_type" text NOT NULL,
	"bytes" integer NOT NULL,
	"width" integer,
	"height" integer,
	"downscaled" boolean DEFAULT false NOT NULL,
	"storage_key" text NOT NULL,
	"uploaded_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "uploads_storage_key_unique" UNIQUE("storage_key")
);
--> statement-breakpoint
ALTER TABLE "commissioning_amendments" ADD CONSTRAINT "commissioning_amendments_commissioning_id_commissionings_id_fk" FOREIGN KEY ("commissioning_id") REFERENCES "public"."commissionings"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "commissioning_amendments" ADD CONSTRAINT "commissioning_amendments_company_id_companies_id_fk" FOREIGN KEY ("company_id") REFERENCES "public"."companies"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "commissioning_amendments" ADD CONSTRAINT "commissioning_amendments_user_id_user_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "commissionings" ADD CONSTRAINT "commissionings_company_id_companies_id_fk" FOREIGN KEY ("company_id") REFERENCES "public"."companies"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "commissionings" ADD CONSTRAINT "commissionings_engineer_user_id_user_id_fk" FOREIGN KEY ("engineer_user_id") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "commissionings" ADD CONSTRAINT "commissionings_home_id_homes_id_fk" FOREIGN KEY ("home_id") REFERENCES "public"."homes"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "commissionings" ADD CONSTRAINT "commissionings_tank_id_tanks_id_fk" FOREIGN KEY ("tank_id") REFERENCES "public"."tanks"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "commissionings" ADD CONSTRAINT "commissionings_signed_by_user_id_fk" FOREIGN KEY ("signed_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "heat_pump_models" ADD CONSTRAINT "heat_pump_models_company_id_companies_id_fk" FOREIGN KEY ("company_id") REFERENCES "public"."companies"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "heat_pump_models" ADD CONSTRAINT "heat_pump_models_created_by_user_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "service_visits" ADD CONSTRAINT "service_visits_company_id_companies_id_fk" FOREIGN KEY ("company_id") REFERENCES "public"."companies"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "service_visits" ADD CONSTRAINT "service_visits_tank_id_tanks_id_fk" FOREIGN KEY ("tank_id") REFERENCES "public"."tanks"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "service_visits" ADD CONSTRAINT "service_visits_engineer_user_id_user_id_fk" FOREIGN KEY ("engineer_user_id") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "uploads" ADD CONSTRAINT "uploads_company_id_companies_id_fk" FOREIGN KEY ("company_id") REFERENCES "public"."companies"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "uploads" ADD CONSTRAINT "uploads_commissioning_id_commissionings_id_fk" FOREIGN KEY ("commissioning_id") REFERENCES "public"."commissionings"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "uploads" ADD CONSTRAINT "uploads_tank_id_tanks_id_fk" FOREIGN KEY ("tank_id") REFERENCES "public"."tanks"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "uploads" ADD CONSTRAINT "uploads_visit_id_service_visits_id_fk" FOREIGN KEY ("visit_id") REFERENCES "public"."service_visits"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "uploads" ADD CONSTRAINT "uploads_uploaded_by_user_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "commissioning_amendments_record_idx" ON "commissioning_amendments" USING btree ("commissioning_id","created_at");--> statement-breakpoint
CREATE INDEX "commissionings_company_idx" ON "commissionings" USING btree ("company_id","updated_at");--> statement-breakpoint
CREATE UNIQUE INDEX "commissionings_tank_uq" ON "commissionings" USING btree ("tank_id");--> statement-breakpoint
CREATE UNIQUE INDEX "heat_pump_models_company_name_uq" ON "heat_pump_models" USING btree ("company_id","name");--> statement-breakpoint
CREATE INDEX "service_visits_tank_idx" ON "service_visits" USING btree ("tank_id","visited_at");--> statement-breakpoint
CREATE INDEX "service_visits_company_idx" ON "service_visits" USING btree ("company_id","visited_at");--> statement-breakpoint
CREATE INDEX "uploads_commissioning_idx" ON "uploads" USING btree ("commissioning_id");--> statement-breakpoint
CREATE INDEX "uploads_tank_idx" ON "uploads" USING btree ("tank_id");--> statement-breakpoint
CREATE INDEX "uploads_visit_idx" ON "uploads" USING btree ("visit_id");