CREATE TABLE "holding_actions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"business_id" uuid NOT NULL,
	"period_id" uuid NOT NULL,
	"action" text NOT NULL,
	"reason" text DEFAULT '' NOT NULL,
	"recorded_at" timestamp with time zone NOT NULL,
	"recorded_by_user_id" uuid,
	"recorded_by_name" text NOT NULL,
	"recorded_by_role" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "holding_periods" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"business_id" uuid NOT NULL,
	"batch_id" uuid NOT NULL,
	"kind" text NOT NULL,
	"label" text DEFAULT '' NOT NULL,
	"policy" text NOT NULL,
	"custom_limit_minutes" integer,
	"limit_minutes" integer,
	"policy_source" text NOT NULL,
	"rule_profile_id" text NOT NULL,
	"written_procedure_id" uuid,
	"started_at" timestamp with time zone NOT NULL,
	"started_by_user_id" uuid,
	"started_by_name" text NOT NULL,
	"started_by_role" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "holding_readings" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"business_id" uuid NOT NULL,
	"period_id" uuid NOT NULL,
	"value" numeric(7, 2) NOT NULL,
	"unit" text NOT NULL,
	"taken_at" timestamp with time zone NOT NULL,
	"taken_by_user_id" uuid,
	"taken_by_name" text NOT NULL,
	"taken_by_role" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "holding_stops" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"business_id" uuid NOT NULL,
	"period_id" uuid NOT NULL,
	"stopped_at" timestamp with time zone NOT NULL,
	"stopped_by_user_id" uuid,
	"stopped_by_name" text NOT NULL,
	"stopped_by_role" text NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "written_procedures" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"business_id" uuid NOT NULL,
	"topic" text NOT NULL,
	"version" integer NOT NULL,
	"title" text NOT NULL,
	"body" text NOT NULL,
	"created_by_user_id" uuid,
	"created_by_name" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "holding_actions" ADD CONSTRAINT "holding_actions_business_id_businesses_id_fk" FOREIGN KEY ("business_id") REFERENCES "public"."businesses"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "holding_actions" ADD CONSTRAINT "holding_actions_period_id_holding_periods_id_fk" FOREIGN KEY ("period_id") REFERENCES "public"."holding_periods"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "holding_actions" ADD CONSTRAINT "holding_actions_recorded_by_user_id_users_id_fk" FOREIGN KEY ("recorded_by_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "holding_periods" ADD CONSTRAINT "holding_periods_business_id_businesses_id_fk" FOREIGN KEY ("business_id") REFERENCES "public"."businesses"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "holding_periods" ADD CONSTRAINT "holding_periods_batch_id_batches_id_fk" FOREIGN KEY ("batch_id") REFERENCES "public"."batches"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "holding_periods" ADD CONSTRAINT "holding_periods_written_procedure_id_written_procedures_id_fk" FOREIGN KEY ("written_procedure_id") REFERENCES "public"."written_procedures"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "holding_periods" ADD CONSTRAINT "holding_periods_started_by_user_id_users_id_fk" FOREIGN KEY ("started_by_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "holding_readings" ADD CONSTRAINT "holding_readings_business_id_businesses_id_fk" FOREIGN KEY ("business_id") REFERENCES "public"."businesses"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "holding_readings" ADD CONSTRAINT "holding_readings_period_id_holding_periods_id_fk" FOREIGN KEY ("period_id") REFERENCES "public"."holding_periods"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "holding_readings" ADD CONSTRAINT "holding_readings_taken_by_user_id_users_id_fk" FOREIGN KEY ("taken_by_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "holding_stops" ADD CONSTRAINT "holding_stops_business_id_businesses_id_fk" FOREIGN KEY ("business_id") REFERENCES "public"."businesses"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "holding_stops" ADD CONSTRAINT "holding_stops_period_id_holding_periods_id_fk" FOREIGN KEY ("period_id") REFERENCES "public"."holding_periods"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "holding_stops" ADD CONSTRAINT "holding_stops_stopped_by_user_id_users_id_fk" FOREIGN KEY ("stopped_by_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "written_procedures" ADD CONSTRAINT "written_procedures_business_id_businesses_id_fk" FOREIGN KEY ("business_id") REFERENCES "public"."businesses"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "written_procedures" ADD CONSTRAINT "written_procedures_created_by_user_id_users_id_fk" FOREIGN KEY ("created_by_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "holding_actions_period_id_idx" ON "holding_actions" USING btree ("period_id");--> statement-breakpoint
CREATE INDEX "holding_periods_business_id_started_at_idx" ON "holding_periods" USING btree ("business_id","started_at");--> statement-breakpoint
CREATE INDEX "holding_periods_batch_id_idx" ON "holding_periods" USING btree ("batch_id");--> statement-breakpoint
CREATE INDEX "holding_readings_period_id_idx" ON "holding_readings" USING btree ("period_id");--> statement-breakpoint
CREATE UNIQUE INDEX "holding_stops_period_id_key" ON "holding_stops" USING btree ("period_id");--> statement-breakpoint
CREATE UNIQUE INDEX "written_procedures_business_id_topic_version_key" ON "written_procedures" USING btree ("business_id","topic","version");