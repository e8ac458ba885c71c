SELECT crumbtrail_make_append_only('sales');
--> statement-breakpoint
SELECT crumbtrail_make_append_only('recall_batches');
--> statement-breakpoint
SELECT crumbtrail_make_append_only('recall_notifications');
