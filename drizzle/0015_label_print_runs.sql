CREATE TABLE "label_print_runs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"business_id" uuid NOT NULL,
	"batch_id" uuid NOT NULL,
	"template_id" text NOT NULL,
	"count" integer NOT NULL,
	"pages" integer NOT NULL,
	"sheet" jsonb NOT NULL,
	"includes_proof_page" boolean DEFAULT false NOT NULL,
	"confirmed_needs_review" boolean DEFAULT false NOT NULL,
	"printed_text" jsonb NOT NULL,
	"lot_url" text NOT NULL,
	"pdf_sha256" text NOT NULL,
	"pdf_bytes" integer NOT NULL,
	"printed_by_user_id" uuid,
	"printed_by_name" text NOT NULL,
	"printed_at" timestamp with time zone NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "label_print_runs" ADD CONSTRAINT "label_print_runs_business_id_businesses_id_fk" FOREIGN KEY ("business_id") REFERENCES "public"."businesses"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "label_print_runs" ADD CONSTRAINT "label_print_runs_batch_id_batches_id_fk" FOREIGN KEY ("batch_id") REFERENCES "public"."batches"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "label_print_runs" ADD CONSTRAINT "label_print_runs_printed_by_user_id_users_id_fk" FOREIGN KEY ("printed_by_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "label_print_runs_business_id_printed_at_idx" ON "label_print_runs" USING btree ("business_id","printed_at");--> statement-breakpoint
CREATE INDEX "label_print_runs_batch_id_idx" ON "label_print_runs" USING btree ("batch_id");