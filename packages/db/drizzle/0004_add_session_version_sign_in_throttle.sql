CREATE TABLE "sign_in_throttle" (
	"key" varchar(255) PRIMARY KEY NOT NULL,
	"points" integer DEFAULT 0 NOT NULL,
	"expire" bigint
);
--> statement-breakpoint
ALTER TABLE "users" ADD COLUMN "session_version" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
-- A change to what a session may do ends the user's sessions: a new password, deactivation, or a
-- new role, shop or region bumps session_version, which every session cookie is checked against.
-- A trigger rather than application code so that every present and future writer of users does it.
CREATE FUNCTION users_bump_session_version() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  NEW.session_version := greatest(NEW.session_version, OLD.session_version + 1);
  RETURN NEW;
END $$;
--> statement-breakpoint
CREATE TRIGGER users_end_sessions BEFORE UPDATE ON users FOR EACH ROW
  WHEN ((OLD.password_hash, OLD.active, OLD.role, OLD.shop_id, OLD.region_id)
    IS DISTINCT FROM (NEW.password_hash, NEW.active, NEW.role, NEW.shop_id, NEW.region_id))
  EXECUTE FUNCTION users_bump_session_version();
