CREATE TABLE "batch_inputs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"business_id" uuid NOT NULL,
	"batch_id" uuid NOT NULL,
	"batch_version_id" uuid NOT NULL,
	"ingredient_id" uuid,
	"supplier_lot_id" uuid,
	"sub_recipe_id" uuid,
	"source_batch_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "batch_state_changes" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"business_id" uuid NOT NULL,
	"batch_id" uuid NOT NULL,
	"from_state" text,
	"to_state" text NOT NULL,
	"reason" text DEFAULT '' NOT NULL,
	"changed_by_user_id" uuid,
	"changed_by_name" text NOT NULL,
	"changed_at" timestamp with time zone NOT NULL,
	"details" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "batch_versions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"business_id" uuid NOT NULL,
	"batch_id" uuid NOT NULL,
	"version" integer NOT NULL,
	"made_by_user_id" uuid,
	"quantity_pieces" integer,
	"quantity_packages" integer,
	"shelf_life_days" integer,
	"best_by" date,
	"notes" text DEFAULT '' NOT NULL,
	"label_snapshot" jsonb,
	"reason" text,
	"created_by_user_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "batches" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"business_id" uuid NOT NULL,
	"lot_code" text NOT NULL,
	"public_code" text NOT NULL,
	"recipe_id" uuid NOT NULL,
	"recipe_version_id" uuid NOT NULL,
	"made_on" date NOT NULL,
	"day_sequence" integer NOT NULL,
	"created_by_user_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "ingredient_label_files" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"business_id" uuid NOT NULL,
	"ingredient_id" uuid NOT NULL,
	"storage_key" text NOT NULL,
	"original_name" text NOT NULL,
	"content_type" text NOT NULL,
	"byte_size" integer NOT NULL,
	"sha256" text NOT NULL,
	"uploaded_by_user_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "ingredient_versions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"business_id" uuid NOT NULL,
	"ingredient_id" uuid NOT NULL,
	"version" integer NOT NULL,
	"label_name" text NOT NULL,
	"sub_ingredients" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"allergens" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"allergens_confirmed" boolean DEFAULT false NOT NULL,
	"sulphites_mg_per_kg" numeric(12, 3),
	"needs_time_temperature_control" boolean DEFAULT false NOT NULL,
	"supplier_name" text DEFAULT '' NOT NULL,
	"supplier_item_code" text DEFAULT '' NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"is_archived" boolean DEFAULT false NOT NULL,
	"verified_by_user_id" uuid,
	"verified_at" timestamp with time zone,
	"reason" text,
	"created_by_user_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "ingredients" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"business_id" uuid NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "supplier_lot_label_checks" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"business_id" uuid NOT NULL,
	"supplier_lot_id" uuid NOT NULL,
	"outcome" text NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"checked_by_user_id" uuid NOT NULL,
	"checked_at" timestamp with time zone NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "supplier_lots" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"business_id" uuid NOT NULL,
	"ingredient_id" uuid NOT NULL,
	"lot_code" text NOT NULL,
	"received_on" date NOT NULL,
	"best_by" date,
	"quantity" text DEFAULT '' NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"created_by_user_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "recipe_versions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"business_id" uuid NOT NULL,
	"recipe_id" uuid NOT NULL,
	"version" integer NOT NULL,
	"name" text NOT NULL,
	"is_sellable" boolean DEFAULT true NOT NULL,
	"components" jsonb NOT NULL,
	"yield_grams" numeric(14, 5),
	"yield_pieces" integer,
	"piece_grams" numeric(14, 5),
	"pieces_per_package" integer,
	"shelf_life_days" integer,
	"ph" numeric(4, 2),
	"water_activity" numeric(4, 3),
	"is_heat_treated_and_packaged" boolean DEFAULT true NOT NULL,
	"holding_policy" text,
	"notes" text DEFAULT '' NOT NULL,
	"label_snapshot" jsonb,
	"reason" text,
	"created_by_user_id" uuid,
	"is_archived" boolean DEFAULT false NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "recipes" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"business_id" uuid NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "batch_inputs" ADD CONSTRAINT "batch_inputs_business_id_businesses_id_fk" FOREIGN KEY ("business_id") REFERENCES "public"."businesses"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batch_inputs" ADD CONSTRAINT "batch_inputs_batch_id_batches_id_fk" FOREIGN KEY ("batch_id") REFERENCES "public"."batches"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batch_inputs" ADD CONSTRAINT "batch_inputs_batch_version_id_batch_versions_id_fk" FOREIGN KEY ("batch_version_id") REFERENCES "public"."batch_versions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batch_inputs" ADD CONSTRAINT "batch_inputs_ingredient_id_ingredients_id_fk" FOREIGN KEY ("ingredient_id") REFERENCES "public"."ingredients"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batch_inputs" ADD CONSTRAINT "batch_inputs_supplier_lot_id_supplier_lots_id_fk" FOREIGN KEY ("supplier_lot_id") REFERENCES "public"."supplier_lots"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batch_inputs" ADD CONSTRAINT "batch_inputs_sub_recipe_id_recipes_id_fk" FOREIGN KEY ("sub_recipe_id") REFERENCES "public"."recipes"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batch_inputs" ADD CONSTRAINT "batch_inputs_source_batch_id_batches_id_fk" FOREIGN KEY ("source_batch_id") REFERENCES "public"."batches"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batch_state_changes" ADD CONSTRAINT "batch_state_changes_business_id_businesses_id_fk" FOREIGN KEY ("business_id") REFERENCES "public"."businesses"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batch_state_changes" ADD CONSTRAINT "batch_state_changes_batch_id_batches_id_fk" FOREIGN KEY ("batch_id") REFERENCES "public"."batches"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batch_state_changes" ADD CONSTRAINT "batch_state_changes_changed_by_user_id_users_id_fk" FOREIGN KEY ("changed_by_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batch_versions" ADD CONSTRAINT "batch_versions_business_id_businesses_id_fk" FOREIGN KEY ("business_id") REFERENCES "public"."businesses"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batch_versions" ADD CONSTRAINT "batch_versions_batch_id_batches_id_fk" FOREIGN KEY ("batch_id") REFERENCES "public"."batches"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batch_versions" ADD CONSTRAINT "batch_versions_made_by_user_id_users_id_fk" FOREIGN KEY ("made_by_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batch_versions" ADD CONSTRAINT "batch_versions_created_by_user_id_users_id_fk" FOREIGN KEY ("created_by_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batches" ADD CONSTRAINT "batches_business_id_businesses_id_fk" FOREIGN KEY ("business_id") REFERENCES "public"."businesses"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batches" ADD CONSTRAINT "batches_recipe_id_recipes_id_fk" FOREIGN KEY ("recipe_id") REFERENCES "public"."recipes"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batches" ADD CONSTRAINT "batches_recipe_version_id_recipe_versions_id_fk" FOREIGN KEY ("recipe_version_id") REFERENCES "public"."recipe_versions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batches" ADD CONSTRAINT "batches_created_by_user_id_users_id_fk" FOREIGN KEY ("created_by_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "ingredient_label_files" ADD CONSTRAINT "ingredient_label_files_business_id_businesses_id_fk" FOREIGN KEY ("business_id") REFERENCES "public"."businesses"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "ingredient_label_files" ADD CONSTRAINT "ingredient_label_files_ingredient_id_ingredients_id_fk" FOREIGN KEY ("ingredient_id") REFERENCES "public"."ingredients"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "ingredient_label_files" ADD CONSTRAINT "ingredient_label_files_uploaded_by_user_id_users_id_fk" FOREIGN KEY ("uploaded_by_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "ingredient_versions" ADD CONSTRAINT "ingredient_versions_business_id_businesses_id_fk" FOREIGN KEY ("business_id") REFERENCES "public"."businesses"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "ingredient_versions" ADD CONSTRAINT "ingredient_versions_ingredient_id_ingredients_id_fk" FOREIGN KEY ("ingredient_id") REFERENCES "public"."ingredients"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "ingredient_versions" ADD CONSTRAINT "ingredient_versions_verified_by_user_id_users_id_fk" FOREIGN KEY ("verified_by_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "ingredient_versions" ADD CONSTRAINT "ingredient_versions_created_by_user_id_users_id_fk" FOREIGN KEY ("created_by_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "ingredients" ADD CONSTRAINT "ingredients_business_id_businesses_id_fk" FOREIGN KEY ("business_id") REFERENCES "public"."businesses"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "supplier_lot_label_checks" ADD CONSTRAINT "supplier_lot_label_checks_business_id_businesses_id_fk" FOREIGN KEY ("business_id") REFERENCES "public"."businesses"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "supplier_lot_label_checks" ADD CONSTRAINT "supplier_lot_label_checks_supplier_lot_id_supplier_lots_id_fk" FOREIGN KEY ("supplier_lot_id") REFERENCES "public"."supplier_lots"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "supplier_lot_label_checks" ADD CONSTRAINT "supplier_lot_label_checks_checked_by_user_id_users_id_fk" FOREIGN KEY ("checked_by_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "supplier_lots" ADD CONSTRAINT "supplier_lots_business_id_businesses_id_fk" FOREIGN KEY ("business_id") REFERENCES "public"."businesses"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "supplier_lots" ADD CONSTRAINT "supplier_lots_ingredient_id_ingredients_id_fk" FOREIGN KEY ("ingredient_id") REFERENCES "public"."ingredients"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "supplier_lots" ADD CONSTRAINT "supplier_lots_created_by_user_id_users_id_fk" FOREIGN KEY ("created_by_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "recipe_versions" ADD CONSTRAINT "recipe_versions_business_id_businesses_id_fk" FOREIGN KEY ("business_id") REFERENCES "public"."businesses"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "recipe_versions" ADD CONSTRAINT "recipe_versions_recipe_id_recipes_id_fk" FOREIGN KEY ("recipe_id") REFERENCES "public"."recipes"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "recipe_versions" ADD CONSTRAINT "recipe_versions_created_by_user_id_users_id_fk" FOREIGN KEY ("created_by_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "recipes" ADD CONSTRAINT "recipes_business_id_businesses_id_fk" FOREIGN KEY ("business_id") REFERENCES "public"."businesses"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "batch_inputs_batch_version_id_idx" ON "batch_inputs" USING btree ("batch_version_id");--> statement-breakpoint
CREATE INDEX "batch_inputs_supplier_lot_id_idx" ON "batch_inputs" USING btree ("supplier_lot_id");--> statement-breakpoint
CREATE INDEX "batch_inputs_source_batch_id_idx" ON "batch_inputs" USING btree ("source_batch_id");--> statement-breakpoint
CREATE INDEX "batch_state_changes_batch_id_idx" ON "batch_state_changes" USING btree ("batch_id");--> statement-breakpoint
CREATE UNIQUE INDEX "batch_versions_batch_id_version_key" ON "batch_versions" USING btree ("batch_id","version");--> statement-breakpoint
CREATE UNIQUE INDEX "batches_business_id_lot_code_key" ON "batches" USING btree ("business_id","lot_code");--> statement-breakpoint
CREATE UNIQUE INDEX "batches_public_code_key" ON "batches" USING btree ("public_code");--> statement-breakpoint
CREATE INDEX "batches_business_id_made_on_idx" ON "batches" USING btree ("business_id","made_on");--> statement-breakpoint
CREATE INDEX "ingredient_label_files_ingredient_id_idx" ON "ingredient_label_files" USING btree ("ingredient_id");--> statement-breakpoint
CREATE UNIQUE INDEX "ingredient_versions_ingredient_id_version_key" ON "ingredient_versions" USING btree ("ingredient_id","version");--> statement-breakpoint
CREATE INDEX "ingredient_versions_business_id_idx" ON "ingredient_versions" USING btree ("business_id");--> statement-breakpoint
CREATE INDEX "ingredients_business_id_idx" ON "ingredients" USING btree ("business_id");--> statement-breakpoint
CREATE INDEX "supplier_lot_label_checks_supplier_lot_id_idx" ON "supplier_lot_label_checks" USING btree ("supplier_lot_id");--> statement-breakpoint
CREATE INDEX "supplier_lots_business_id_idx" ON "supplier_lots" USING btree ("business_id");--> statement-breakpoint
CREATE INDEX "supplier_lots_ingredient_id_idx" ON "supplier_lots" USING btree ("ingredient_id");--> statement-breakpoint
CREATE UNIQUE INDEX "recipe_versions_recipe_id_version_key" ON "recipe_versions" USING btree ("recipe_id","version");--> statement-breakpoint
CREATE INDEX "recipe_versions_business_id_idx" ON "recipe_versions" USING btree ("business_id");--> statement-breakpoint
CREATE INDEX "recipes_business_id_idx" ON "recipes" USING btree ("business_id");