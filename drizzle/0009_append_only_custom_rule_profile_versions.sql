SELECT crumbtrail_make_append_only('custom_rule_profile_versions');
