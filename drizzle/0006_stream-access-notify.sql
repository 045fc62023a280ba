-- Custom SQL migration file, put your code below! --
-- Written by hand (drizzle-kit does not model triggers). When a session ends (sign-out, reset,
-- expiry), an API token is revoked or deleted, or a membership is removed or its role changes,
-- the database tells every app instance on the live channel, so open live streams of that user
-- ask again at once whether they may stay open (src/lib/server/live/stream.ts). The NOTIFY is
-- delivered at commit, and repeats within one transaction are folded into one by PostgreSQL.
CREATE FUNCTION burndown_access_changed() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
	PERFORM pg_notify('burndown_live', json_build_object('u', OLD.user_id)::text);
	RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER sessions_access_changed AFTER DELETE ON sessions FOR EACH ROW EXECUTE FUNCTION burndown_access_changed();
--> statement-breakpoint
CREATE TRIGGER api_tokens_access_changed AFTER DELETE OR UPDATE OF revoked_at ON api_tokens FOR EACH ROW EXECUTE FUNCTION burndown_access_changed();
--> statement-breakpoint
CREATE TRIGGER memberships_access_changed AFTER DELETE OR UPDATE OF role, user_id, org_id ON memberships FOR EACH ROW EXECUTE FUNCTION burndown_access_changed();
