CREATE TABLE "custom_rule_profile_versions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"business_id" uuid NOT NULL,
	"profile_id" uuid NOT NULL,
	"version" integer NOT NULL,
	"profile" jsonb NOT NULL,
	"reason" text,
	"created_by_user_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "custom_rule_profiles" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"business_id" uuid NOT NULL,
	"based_on_id" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "recipe_versions" ALTER COLUMN "yield_grams" SET DATA TYPE numeric;--> statement-breakpoint
ALTER TABLE "recipe_versions" ALTER COLUMN "piece_grams" SET DATA TYPE numeric;--> statement-breakpoint
ALTER TABLE "custom_rule_profile_versions" ADD CONSTRAINT "custom_rule_profile_versions_business_id_businesses_id_fk" FOREIGN KEY ("business_id") REFERENCES "public"."businesses"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "custom_rule_profile_versions" ADD CONSTRAINT "custom_rule_profile_versions_profile_id_custom_rule_profiles_id_fk" FOREIGN KEY ("profile_id") REFERENCES "public"."custom_rule_profiles"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "custom_rule_profile_versions" ADD CONSTRAINT "custom_rule_profile_versions_created_by_user_id_users_id_fk" FOREIGN KEY ("created_by_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "custom_rule_profiles" ADD CONSTRAINT "custom_rule_profiles_business_id_businesses_id_fk" FOREIGN KEY ("business_id") REFERENCES "public"."businesses"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "custom_rule_profile_versions_profile_id_version_key" ON "custom_rule_profile_versions" USING btree ("profile_id","version");--> statement-breakpoint
CREATE INDEX "custom_rule_profile_versions_business_id_idx" ON "custom_rule_profile_versions" USING btree ("business_id");--> statement-breakpoint
CREATE INDEX "custom_rule_profiles_business_id_idx" ON "custom_rule_profiles" USING btree ("business_id");