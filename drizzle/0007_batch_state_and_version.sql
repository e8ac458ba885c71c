ALTER TABLE "batches" ADD COLUMN "state" text DEFAULT 'in_progress' NOT NULL;--> statement-breakpoint
ALTER TABLE "batches" ADD COLUMN "current_version" integer DEFAULT 1 NOT NULL;--> statement-breakpoint
CREATE UNIQUE INDEX "batches_business_id_made_on_day_sequence_key" ON "batches" USING btree ("business_id","made_on","day_sequence");--> statement-breakpoint
CREATE INDEX "batches_business_id_state_idx" ON "batches" USING btree ("business_id","state");