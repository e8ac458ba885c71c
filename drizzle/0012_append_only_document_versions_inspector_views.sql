SELECT crumbtrail_make_append_only('document_versions');
--> statement-breakpoint
SELECT crumbtrail_make_append_only('inspector_views');
