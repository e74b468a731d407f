// The foundation schema: companies, shops, sign-ins, foreman assignments, welders, link tokens and the
// append-only audit trail. Hand-written SQL; the schema is never synchronized from the entities.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class Foundation1764633600000 implements MigrationInterface {
  name = 'Foundation1764633600000';

  async up(q: QueryRunner): Promise<void> {
    // pg_trgm is a trusted extension (PostgreSQL 13+): the database owner may create it. It backs the
    // substring search on welder stamp and name.
    await q.query(`CREATE EXTENSION IF NOT EXISTS pg_trgm`);

    await q.query(`
      CREATE TABLE organizations (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        name text NOT NULL CHECK (length(name) BETWEEN 1 AND 200),
        created_at timestamptz NOT NULL DEFAULT now()
      )`);

    await q.query(`
      CREATE TABLE shops (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        organization_id uuid NOT NULL REFERENCES organizations (id),
        name text NOT NULL CHECK (length(name) BETWEEN 1 AND 120),
        code text NOT NULL CHECK (code ~ '^[A-Z0-9-]{2,12}$'),
        location text NOT NULL DEFAULT '',
        active boolean NOT NULL DEFAULT true,
        created_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT shops_organization_code_key UNIQUE (organization_id, code),
        -- target of the composite foreign keys that keep a welder's home shop inside its company
        CONSTRAINT shops_organization_id_key UNIQUE (organization_id, id)
      )`);

    await q.query(`
      CREATE TABLE welders (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        organization_id uuid NOT NULL REFERENCES organizations (id),
        stamp text NOT NULL CHECK (stamp ~ '^[A-Z0-9-]{1,12}$'),
        name text NOT NULL CHECK (length(name) BETWEEN 1 AND 120),
        home_shop_id uuid NOT NULL,
        email text NOT NULL DEFAULT '' CHECK (email = lower(email)),
        active boolean NOT NULL DEFAULT true,
        left_at timestamptz,
        version integer NOT NULL DEFAULT 1 CHECK (version >= 1),
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT welders_home_shop_fkey FOREIGN KEY (organization_id, home_shop_id) REFERENCES shops (organization_id, id),
        CONSTRAINT welders_organization_id_key UNIQUE (organization_id, id)
      )`);
    await q.query(`CREATE UNIQUE INDEX welders_organization_stamp_key ON welders (organization_id, stamp)`);
    await q.query(
      `CREATE INDEX welders_organization_home_shop_idx ON welders (organization_id, home_shop_id)`,
    );
    await q.query(`CREATE INDEX welders_name_trgm_idx ON welders USING gin (name gin_trgm_ops)`);
    await q.query(`CREATE INDEX welders_stamp_trgm_idx ON welders USING gin (stamp gin_trgm_ops)`);

    await q.query(`
      CREATE TABLE users (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        organization_id uuid NOT NULL REFERENCES organizations (id),
        email text NOT NULL CHECK (email = lower(email) AND length(email) BETWEEN 3 AND 254),
        name text NOT NULL CHECK (length(name) BETWEEN 1 AND 120),
        role text NOT NULL CHECK (role IN ('qa_manager', 'foreman', 'welder')),
        password_hash text,
        active boolean NOT NULL DEFAULT true,
        welder_id uuid,
        invited_at timestamptz,
        last_sign_in_at timestamptz,
        created_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT users_email_key UNIQUE (email),
        CONSTRAINT users_welder_key UNIQUE (welder_id),
        CONSTRAINT users_welder_fkey FOREIGN KEY (organization_id, welder_id) REFERENCES welders (organization_id, id),
        CONSTRAINT users_welder_role_check CHECK ((role = 'welder') = (welder_id IS NOT NULL))
      )`);
    await q.query(`CREATE INDEX users_organization_idx ON users (organization_id)`);

    await q.query(`
      CREATE TABLE foreman_shops (
        user_id uuid NOT NULL REFERENCES users (id) ON DELETE CASCADE,
        shop_id uuid NOT NULL REFERENCES shops (id),
        PRIMARY KEY (user_id, shop_id)
      )`);
    await q.query(`CREATE INDEX foreman_shops_shop_idx ON foreman_shops (shop_id)`);

    await q.query(`
      CREATE TABLE auth_tokens (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        user_id uuid NOT NULL REFERENCES users (id) ON DELETE CASCADE,
        token_hash text NOT NULL,
        purpose text NOT NULL CHECK (purpose IN ('invitation', 'password-reset')),
        expires_at timestamptz NOT NULL,
        used_at timestamptz,
        created_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT auth_tokens_hash_key UNIQUE (token_hash)
      )`);
    await q.query(`CREATE INDEX auth_tokens_user_idx ON auth_tokens (user_id) WHERE used_at IS NULL`);

    await q.query(`
      CREATE TABLE audit_events (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        organization_id uuid NOT NULL REFERENCES organizations (id),
        actor_id uuid REFERENCES users (id),
        at timestamptz NOT NULL DEFAULT now(),
        action text NOT NULL,
        entity_type text NOT NULL,
        entity_id uuid NOT NULL,
        before jsonb,
        after jsonb
      )`);
    await q.query(`CREATE INDEX audit_events_organization_at_idx ON audit_events (organization_id, at DESC)`);
    await q.query(
      `CREATE INDEX audit_events_entity_idx ON audit_events (organization_id, entity_type, entity_id, at DESC)`,
    );
    // Append-only: the table refuses every UPDATE, DELETE and TRUNCATE, whoever asks.
    await q.query(`
      CREATE FUNCTION audit_events_refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        RAISE EXCEPTION 'audit_events is append-only: % is not allowed', TG_OP USING ERRCODE = 'insufficient_privilege';
      END
      $$`);
    await q.query(`
      CREATE TRIGGER audit_events_no_update_or_delete BEFORE UPDATE OR DELETE ON audit_events
      FOR EACH ROW EXECUTE FUNCTION audit_events_refuse_change()`);
    await q.query(`
      CREATE TRIGGER audit_events_no_truncate BEFORE TRUNCATE ON audit_events
      FOR EACH STATEMENT EXECUTE FUNCTION audit_events_refuse_change()`);
    await q.query(`REVOKE UPDATE, DELETE, TRUNCATE ON audit_events FROM PUBLIC`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE IF EXISTS audit_events`);
    await q.query(`DROP FUNCTION IF EXISTS audit_events_refuse_change()`);
    await q.query(`DROP TABLE IF EXISTS auth_tokens`);
    await q.query(`DROP TABLE IF EXISTS foreman_shops`);
    await q.query(`DROP TABLE IF EXISTS users`);
    await q.query(`DROP TABLE IF EXISTS welders`);
    await q.query(`DROP TABLE IF EXISTS shops`);
    await q.query(`DROP TABLE IF EXISTS organizations`);
  }
}
