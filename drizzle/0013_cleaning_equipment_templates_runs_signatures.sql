CREATE TABLE "cleaning_run_versions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"business_id" uuid NOT NULL,
	"run_id" uuid NOT NULL,
	"version" integer NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"reason" text,
	"created_at" timestamp with time zone NOT NULL,
	"created_by_user_id" uuid,
	"created_by_name" text NOT NULL,
	"created_by_role" text NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "cleaning_runs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"business_id" uuid NOT NULL,
	"template_id" uuid NOT NULL,
	"template_name" text NOT NULL,
	"frequency" text NOT NULL,
	"steps" jsonb NOT NULL,
	"equipment_ids" jsonb NOT NULL,
	"batch_id" uuid,
	"run_date" date NOT NULL,
	"started_at" timestamp with time zone NOT NULL,
	"started_by_user_id" uuid,
	"started_by_name" text NOT NULL,
	"started_by_role" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "cleaning_signatures" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"business_id" uuid NOT NULL,
	"run_id" uuid NOT NULL,
	"run_version_id" uuid NOT NULL,
	"version" integer NOT NULL,
	"record_hash" text NOT NULL,
	"signer_user_id" uuid NOT NULL,
	"printed_name" text NOT NULL,
	"signer_role" text NOT NULL,
	"meaning" text NOT NULL,
	"signed_at" timestamp with time zone NOT NULL,
	"device_name" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "cleaning_step_entries" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"business_id" uuid NOT NULL,
	"run_id" uuid NOT NULL,
	"run_version_id" uuid NOT NULL,
	"step_key" text NOT NULL,
	"entry_kind" text NOT NULL,
	"explains_entry_id" uuid,
	"done_at" timestamp with time zone NOT NULL,
	"done_by_user_id" uuid,
	"done_by_name" text NOT NULL,
	"done_by_role" text NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"sanitiser" text,
	"sanitiser_product_id" uuid,
	"sanitiser_label" jsonb,
	"concentration_ppm" numeric(8, 2),
	"temperature_value" numeric(6, 2),
	"temperature_unit" text,
	"ph" numeric(4, 2),
	"contact_seconds" integer,
	"hardness_ppm" integer,
	"check_passed" boolean,
	"check_problems" jsonb,
	"failure_reason" text,
	"carried_from_entry_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "cleaning_templates" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"business_id" uuid NOT NULL,
	"name" text NOT NULL,
	"frequency" text NOT NULL,
	"steps" jsonb NOT NULL,
	"equipment_ids" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"archived_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "equipment" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"business_id" uuid NOT NULL,
	"name" text NOT NULL,
	"kind" text NOT NULL,
	"is_food_contact" boolean NOT NULL,
	"location" text DEFAULT '' NOT NULL,
	"archived_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "sanitiser_products" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"business_id" uuid NOT NULL,
	"name" text NOT NULL,
	"sanitiser" text NOT NULL,
	"label_min_ppm" numeric(8, 2) NOT NULL,
	"label_max_ppm" numeric(8, 2) NOT NULL,
	"label_min_temp_c" numeric(5, 1),
	"label_contact_seconds" integer,
	"label_max_hardness_ppm" integer,
	"archived_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "cleaning_run_versions" ADD CONSTRAINT "cleaning_run_versions_business_id_businesses_id_fk" FOREIGN KEY ("business_id") REFERENCES "public"."businesses"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cleaning_run_versions" ADD CONSTRAINT "cleaning_run_versions_run_id_cleaning_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."cleaning_runs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cleaning_run_versions" ADD CONSTRAINT "cleaning_run_versions_created_by_user_id_users_id_fk" FOREIGN KEY ("created_by_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cleaning_runs" ADD CONSTRAINT "cleaning_runs_business_id_businesses_id_fk" FOREIGN KEY ("business_id") REFERENCES "public"."businesses"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cleaning_runs" ADD CONSTRAINT "cleaning_runs_template_id_cleaning_templates_id_fk" FOREIGN KEY ("template_id") REFERENCES "public"."cleaning_templates"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cleaning_runs" ADD CONSTRAINT "cleaning_runs_batch_id_batches_id_fk" FOREIGN KEY ("batch_id") REFERENCES "public"."batches"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cleaning_runs" ADD CONSTRAINT "cleaning_runs_started_by_user_id_users_id_fk" FOREIGN KEY ("started_by_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cleaning_signatures" ADD CONSTRAINT "cleaning_signatures_business_id_businesses_id_fk" FOREIGN KEY ("business_id") REFERENCES "public"."businesses"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cleaning_signatures" ADD CONSTRAINT "cleaning_signatures_run_id_cleaning_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."cleaning_runs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cleaning_signatures" ADD CONSTRAINT "cleaning_signatures_run_version_id_cleaning_run_versions_id_fk" FOREIGN KEY ("run_version_id") REFERENCES "public"."cleaning_run_versions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cleaning_signatures" ADD CONSTRAINT "cleaning_signatures_signer_user_id_users_id_fk" FOREIGN KEY ("signer_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cleaning_step_entries" ADD CONSTRAINT "cleaning_step_entries_business_id_businesses_id_fk" FOREIGN KEY ("business_id") REFERENCES "public"."businesses"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cleaning_step_entries" ADD CONSTRAINT "cleaning_step_entries_run_id_cleaning_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."cleaning_runs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cleaning_step_entries" ADD CONSTRAINT "cleaning_step_entries_run_version_id_cleaning_run_versions_id_fk" FOREIGN KEY ("run_version_id") REFERENCES "public"."cleaning_run_versions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cleaning_step_entries" ADD CONSTRAINT "cleaning_step_entries_done_by_user_id_users_id_fk" FOREIGN KEY ("done_by_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cleaning_step_entries" ADD CONSTRAINT "cleaning_step_entries_sanitiser_product_id_sanitiser_products_id_fk" FOREIGN KEY ("sanitiser_product_id") REFERENCES "public"."sanitiser_products"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "cleaning_templates" ADD CONSTRAINT "cleaning_templates_business_id_businesses_id_fk" FOREIGN KEY ("business_id") REFERENCES "public"."businesses"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "equipment" ADD CONSTRAINT "equipment_business_id_businesses_id_fk" FOREIGN KEY ("business_id") REFERENCES "public"."businesses"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sanitiser_products" ADD CONSTRAINT "sanitiser_products_business_id_businesses_id_fk" FOREIGN KEY ("business_id") REFERENCES "public"."businesses"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "cleaning_run_versions_run_id_version_key" ON "cleaning_run_versions" USING btree ("run_id","version");--> statement-breakpoint
CREATE INDEX "cleaning_runs_business_id_run_date_idx" ON "cleaning_runs" USING btree ("business_id","run_date");--> statement-breakpoint
CREATE INDEX "cleaning_runs_batch_id_idx" ON "cleaning_runs" USING btree ("batch_id");--> statement-breakpoint
CREATE UNIQUE INDEX "cleaning_signatures_run_version_id_key" ON "cleaning_signatures" USING btree ("run_version_id");--> statement-breakpoint
CREATE INDEX "cleaning_signatures_business_id_signed_at_idx" ON "cleaning_signatures" USING btree ("business_id","signed_at");--> statement-breakpoint
CREATE INDEX "cleaning_step_entries_run_version_id_idx" ON "cleaning_step_entries" USING btree ("run_version_id");--> statement-breakpoint
CREATE INDEX "cleaning_step_entries_business_id_done_at_idx" ON "cleaning_step_entries" USING btree ("business_id","done_at");--> statement-breakpoint
CREATE INDEX "cleaning_templates_business_id_idx" ON "cleaning_templates" USING btree ("business_id");--> statement-breakpoint
CREATE INDEX "equipment_business_id_idx" ON "equipment" USING btree ("business_id");--> statement-breakpoint
CREATE INDEX "sanitiser_products_business_id_idx" ON "sanitiser_products" USING btree ("business_id");