-- A user who must change their password (an administrator's temporary one) is remembered with
-- that flag by every server process (session-cache.ts): changing the flag alone must tell them too.
DROP TRIGGER IF EXISTS users_auth_notify ON users;
--> statement-breakpoint
CREATE TRIGGER users_auth_notify AFTER UPDATE OF roles, active, name, email, password_hash, must_change_password OR DELETE ON users
  FOR EACH ROW EXECUTE FUNCTION auth_notify_change();
