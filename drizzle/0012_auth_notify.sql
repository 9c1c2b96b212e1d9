-- Every server process may remember who a session token belongs to (server/services/auth/
-- session-cache.ts). These triggers tell every process, at the commit of the change, what to
-- forget: a session revoked, shortened or removed ("s:<id>"), a user whose roles, active flag,
-- name, e-mail or password changed, or who was removed ("u:<id>").
CREATE OR REPLACE FUNCTION auth_notify_change() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF TG_TABLE_NAME = 'sessions' THEN
    PERFORM pg_notify('tacklog_auth', 's:' || OLD.id::text);
  ELSE
    PERFORM pg_notify('tacklog_auth', 'u:' || OLD.id::text);
  END IF;
  RETURN NULL;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER sessions_auth_notify AFTER UPDATE OF revoked_at, expires_at, user_id OR DELETE ON sessions
  FOR EACH ROW EXECUTE FUNCTION auth_notify_change();
--> statement-breakpoint
CREATE TRIGGER users_auth_notify AFTER UPDATE OF roles, active, name, email, password_hash OR DELETE ON users
  FOR EACH ROW EXECUTE FUNCTION auth_notify_change();
