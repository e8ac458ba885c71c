-- The app connects as crumbtrail_app at run time; this role (the migration owner) owns the tables.
DO $$ BEGIN
  IF NOT EXISTS (SELECT 1 FROM pg_roles WHERE rolname = 'crumbtrail_app') THEN
    CREATE ROLE crumbtrail_app NOLOGIN;
  END IF;
END $$;
--> statement-breakpoint
GRANT USAGE ON SCHEMA public TO crumbtrail_app;
--> statement-breakpoint
GRANT SELECT, INSERT, UPDATE, DELETE ON ALL TABLES IN SCHEMA public TO crumbtrail_app;
--> statement-breakpoint
GRANT USAGE, SELECT ON ALL SEQUENCES IN SCHEMA public TO crumbtrail_app;
--> statement-breakpoint
ALTER DEFAULT PRIVILEGES IN SCHEMA public GRANT SELECT, INSERT, UPDATE, DELETE ON TABLES TO crumbtrail_app;
--> statement-breakpoint
ALTER DEFAULT PRIVILEGES IN SCHEMA public GRANT USAGE, SELECT ON SEQUENCES TO crumbtrail_app;
--> statement-breakpoint
-- Append-only records: refuse any change or removal, for every role (the owner too).
CREATE OR REPLACE FUNCTION crumbtrail_refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION 'records in % are append-only: add a correction instead', TG_TABLE_NAME
    USING ERRCODE = 'insufficient_privilege';
END $$;
--> statement-breakpoint
-- Call once per append-only table in the migration that creates it.
CREATE OR REPLACE FUNCTION crumbtrail_make_append_only(tbl regclass) RETURNS void LANGUAGE plpgsql AS $$
BEGIN
  EXECUTE format('REVOKE UPDATE, DELETE, TRUNCATE ON %s FROM crumbtrail_app', tbl);
  EXECUTE format('CREATE TRIGGER %I BEFORE UPDATE OR DELETE ON %s FOR EACH ROW EXECUTE FUNCTION crumbtrail_refuse_change()', 'append_only_row', tbl);
  EXECUTE format('CREATE TRIGGER %I BEFORE TRUNCATE ON %s FOR EACH STATEMENT EXECUTE FUNCTION crumbtrail_refuse_change()', 'append_only_truncate', tbl);
END $$;
--> statement-breakpoint
SELECT crumbtrail_make_append_only('record_events');
