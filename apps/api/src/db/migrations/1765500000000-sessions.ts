// Sessions that can end (issue 11, finding 1). Each sign-in is a row; the session cookie's JWT names it
// (`sid`) and every request looks it up by primary key together with its user, in the one query that
// already loaded the caller. Signing out ends the row; so does the owner from another device.
// A trigger on users ends every open session of an account whose password, active flag, role, company or
// welder record changes — whichever code path makes the change — so no session outlives the facts it
// was granted on.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class Sessions1765500000000 implements MigrationInterface {
  name = 'Sessions1765500000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE sessions (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        user_id uuid NOT NULL REFERENCES users (id) ON DELETE CASCADE,
        created_at timestamptz NOT NULL,
        last_seen_at timestamptz NOT NULL,
        expires_at timestamptz NOT NULL,
        ended_at timestamptz,
        ended_reason text CHECK (ended_reason IN ('signed-out', 'ended-by-owner', 'password', 'deactivated', 'role')),
        user_agent text NOT NULL DEFAULT '' CHECK (length(user_agent) <= 300),
        address text NOT NULL DEFAULT '' CHECK (length(address) <= 64),
        CHECK ((ended_at IS NULL) = (ended_reason IS NULL))
      )`);
    await q.query(`CREATE INDEX sessions_user_open_idx ON sessions (user_id, created_at DESC) WHERE ended_at IS NULL`);
    await q.query(`
      CREATE FUNCTION users_end_sessions() RETURNS trigger LANGUAGE plpgsql AS $$
      DECLARE reason text;
      BEGIN
        IF NEW.password_hash IS DISTINCT FROM OLD.password_hash THEN reason := 'password';
        ELSIF NEW.active IS DISTINCT FROM OLD.active THEN reason := 'deactivated';
        ELSIF NEW.role IS DISTINCT FROM OLD.role OR NEW.organization_id IS DISTINCT FROM OLD.organization_id
           OR NEW.welder_id IS DISTINCT FROM OLD.welder_id THEN reason := 'role';
        ELSE RETURN NEW;
        END IF;
        UPDATE sessions SET ended_at = now(), ended_reason = reason WHERE user_id = NEW.id AND ended_at IS NULL;
        RETURN NEW;
      END $$`);
    await q.query(`
      CREATE TRIGGER users_end_sessions AFTER UPDATE OF password_hash, active, role, organization_id, welder_id
        ON users FOR EACH ROW EXECUTE FUNCTION users_end_sessions()`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TRIGGER users_end_sessions ON users`);
    await q.query(`DROP FUNCTION users_end_sessions()`);
    await q.query(`DROP TABLE sessions`);
  }
}
