SELECT crumbtrail_make_append_only('label_print_runs');
