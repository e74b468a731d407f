// API tokens for other systems, and imports of spreadsheets (issue 13).
// - api_tokens: only the SHA-256 of a token is kept (tokens are 256 random bits, so a fast hash is enough
//   and lets every request find its token through a unique index); revoked tokens stay for the record.
// - import_mappings: the column mapping a company last used for each kind of import (headers are theirs).
// - imports: one row per uploaded file; the file itself is in the object store under object_key. The
//   running import's progress and a cancel request live here, so any API instance can answer a poll.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class ImportsAndApiTokens1765700000000 implements MigrationInterface {
  name = 'ImportsAndApiTokens1765700000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE api_tokens (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        organization_id uuid NOT NULL REFERENCES organizations (id),
        name text NOT NULL CHECK (length(name) BETWEEN 1 AND 80),
        access text NOT NULL CHECK (access IN ('read', 'read-write')),
        shop_ids uuid[] NOT NULL DEFAULT '{}',
        prefix text NOT NULL,
        token_hash text NOT NULL UNIQUE,
        created_by uuid NOT NULL REFERENCES users (id),
        created_at timestamptz NOT NULL DEFAULT now(),
        last_used_at timestamptz,
        revoked_at timestamptz,
        revoked_by uuid REFERENCES users (id)
      )`);
    await q.query(`CREATE INDEX api_tokens_organization_idx ON api_tokens (organization_id, created_at DESC)`);

    await q.query(`
      CREATE TABLE import_mappings (
        organization_id uuid NOT NULL REFERENCES organizations (id),
        kind text NOT NULL,
        mapping jsonb NOT NULL,
        options jsonb NOT NULL DEFAULT '{}',
        updated_at timestamptz NOT NULL DEFAULT now(),
        PRIMARY KEY (organization_id, kind)
      )`);

    await q.query(`
      CREATE TABLE imports (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        organization_id uuid NOT NULL REFERENCES organizations (id),
        kind text NOT NULL CHECK (kind IN ('welders', 'qualifications', 'continuity', 'welds')),
        file_name text NOT NULL,
        file_type text NOT NULL CHECK (file_type IN ('csv', 'xlsx')),
        file_sha256 text NOT NULL,
        size_bytes integer NOT NULL,
        object_key text NOT NULL,
        status text NOT NULL DEFAULT 'uploaded'
          CHECK (status IN ('uploaded', 'checked', 'running', 'committed', 'failed', 'cancelled')),
        options jsonb NOT NULL DEFAULT '{}',
        summary jsonb,
        total_rows integer NOT NULL DEFAULT 0,
        processed_rows integer NOT NULL DEFAULT 0,
        cancel_requested boolean NOT NULL DEFAULT false,
        error text,
        created_by uuid NOT NULL REFERENCES users (id),
        created_at timestamptz NOT NULL DEFAULT now(),
        finished_at timestamptz
      )`);
    await q.query(`CREATE INDEX imports_organization_idx ON imports (organization_id, created_at DESC)`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE imports`);
    await q.query(`DROP TABLE import_mappings`);
    await q.query(`DROP TABLE api_tokens`);
  }
}
