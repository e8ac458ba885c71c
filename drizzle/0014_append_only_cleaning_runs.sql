SELECT crumbtrail_make_append_only('cleaning_runs');
--> statement-breakpoint
SELECT crumbtrail_make_append_only('cleaning_run_versions');
--> statement-breakpoint
SELECT crumbtrail_make_append_only('cleaning_step_entries');
--> statement-breakpoint
SELECT crumbtrail_make_append_only('cleaning_signatures');
