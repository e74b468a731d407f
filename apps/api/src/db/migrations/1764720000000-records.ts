// The qualification records: uploads in the object store, the WPS register, test coupons with their
// examination, certified qualifications (never deleted) and the public verify tokens.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class Records1764720000000 implements MigrationInterface {
  name = 'Records1764720000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE uploads (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        organization_id uuid NOT NULL REFERENCES organizations (id),
        storage_key text NOT NULL,
        file_name text NOT NULL CHECK (length(file_name) BETWEEN 1 AND 255),
        content_type text NOT NULL,
        size integer NOT NULL CHECK (size >= 0),
        sha256 text NOT NULL CHECK (sha256 ~ '^[0-9a-f]{64}$'),
        kind text NOT NULL CHECK (kind IN ('wps-document', 'specimen-photo', 'examination-report', 'other')),
        uploaded_by uuid REFERENCES users (id),
        created_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT uploads_storage_key_key UNIQUE (storage_key),
        CONSTRAINT uploads_organization_id_key UNIQUE (organization_id, id)
      )`);

    await q.query(`
      CREATE TABLE procedures (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        organization_id uuid NOT NULL REFERENCES organizations (id),
        number text NOT NULL CHECK (length(number) BETWEEN 1 AND 40),
        revision text NOT NULL CHECK (length(revision) BETWEEN 1 AND 12),
        code text NOT NULL,
        processes text[] NOT NULL CHECK (cardinality(processes) >= 1),
        p_numbers text[] NOT NULL DEFAULT '{}',
        f_number integer,
        positions text[] NOT NULL DEFAULT '{}',
        thickness_min jsonb,
        thickness_max jsonb,
        status text NOT NULL CHECK (status IN ('active', 'superseded')),
        document_upload_id uuid,
        notes text NOT NULL DEFAULT '',
        version integer NOT NULL DEFAULT 1 CHECK (version >= 1),
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT procedures_number_revision_key UNIQUE (organization_id, number, revision),
        CONSTRAINT procedures_organization_id_key UNIQUE (organization_id, id),
        CONSTRAINT procedures_document_fkey FOREIGN KEY (organization_id, document_upload_id) REFERENCES uploads (organization_id, id)
      )`);

    await q.query(`
      CREATE TABLE coupons (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        organization_id uuid NOT NULL REFERENCES organizations (id),
        welder_id uuid NOT NULL,
        shop_id uuid NOT NULL,
        procedure_id uuid NOT NULL,
        tested_on date NOT NULL,
        code text NOT NULL,
        process text NOT NULL,
        coupon jsonb NOT NULL,
        pipe jsonb,
        p_numbers text[] NOT NULL DEFAULT '{}',
        examiner jsonb NOT NULL,
        lab_report_number text NOT NULL DEFAULT '',
        visual text NOT NULL CHECK (visual IN ('accept', 'reject')),
        examination jsonb NOT NULL,
        result text NOT NULL CHECK (result IN ('accept', 'reject', 'replace-specimen')),
        reasons jsonb NOT NULL DEFAULT '[]',
        criteria_id text,
        rules_version text NOT NULL,
        notes text NOT NULL DEFAULT '',
        version integer NOT NULL DEFAULT 1 CHECK (version >= 1),
        recorded_by uuid REFERENCES users (id),
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT coupons_welder_fkey FOREIGN KEY (organization_id, welder_id) REFERENCES welders (organization_id, id),
        CONSTRAINT coupons_shop_fkey FOREIGN KEY (organization_id, shop_id) REFERENCES shops (organization_id, id),
        CONSTRAINT coupons_procedure_fkey FOREIGN KEY (organization_id, procedure_id) REFERENCES procedures (organization_id, id),
        CONSTRAINT coupons_organization_id_key UNIQUE (organization_id, id)
      )`);
    await q.query(`CREATE INDEX coupons_welder_idx ON coupons (organization_id, welder_id, tested_on DESC)`);
    await q.query(
      `CREATE INDEX coupons_passing_idx ON coupons (welder_id, process, tested_on) WHERE result = 'accept'`,
    );

    // The uploads a coupon refers to (specimen photos, examination report), for scoping their downloads.
    await q.query(`
      CREATE TABLE coupon_uploads (
        coupon_id uuid NOT NULL REFERENCES coupons (id),
        upload_id uuid NOT NULL REFERENCES uploads (id),
        PRIMARY KEY (coupon_id, upload_id)
      )`);
    await q.query(`CREATE INDEX coupon_uploads_upload_idx ON coupon_uploads (upload_id)`);

    await q.query(`
      CREATE TABLE qualifications (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        organization_id uuid NOT NULL REFERENCES organizations (id),
        welder_id uuid NOT NULL,
        coupon_id uuid NOT NULL,
        code text NOT NULL,
        process text NOT NULL,
        transfer_mode text,
        progression text,
        ranges jsonb NOT NULL,
        certified_on date NOT NULL,
        certified_by uuid NOT NULL REFERENCES users (id),
        certified_by_name text NOT NULL,
        rules_version text NOT NULL,
        revoked_on date,
        revoked_reason text,
        revoked_by uuid REFERENCES users (id),
        supersedes_id uuid REFERENCES qualifications (id),
        superseded_by_id uuid REFERENCES qualifications (id),
        version integer NOT NULL DEFAULT 1 CHECK (version >= 1),
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT qualifications_coupon_key UNIQUE (coupon_id),
        CONSTRAINT qualifications_welder_fkey FOREIGN KEY (organization_id, welder_id) REFERENCES welders (organization_id, id),
        CONSTRAINT qualifications_coupon_fkey FOREIGN KEY (organization_id, coupon_id) REFERENCES coupons (organization_id, id),
        CONSTRAINT qualifications_revoked_check CHECK ((revoked_on IS NULL) = (revoked_reason IS NULL))
      )`);
    await q.query(`CREATE INDEX qualifications_welder_idx ON qualifications (organization_id, welder_id)`);
    // A certified qualification is never deleted: corrections supersede it.
    await q.query(`
      CREATE FUNCTION qualifications_refuse_delete() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        RAISE EXCEPTION 'certified qualifications are never deleted; supersede or revoke them' USING ERRCODE = 'insufficient_privilege';
      END
      $$`);
    await q.query(`
      CREATE TRIGGER qualifications_no_delete BEFORE DELETE ON qualifications
      FOR EACH ROW EXECUTE FUNCTION qualifications_refuse_delete()`);
    await q.query(`
      CREATE TRIGGER qualifications_no_truncate BEFORE TRUNCATE ON qualifications
      FOR EACH STATEMENT EXECUTE FUNCTION qualifications_refuse_delete()`);

    // One active token per welder; the token itself is kept only as a hash (for lookup) and encrypted
    // with a key derived from the server secret (so a reprinted card carries the same QR code).
    await q.query(`
      CREATE TABLE verify_tokens (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        organization_id uuid NOT NULL REFERENCES organizations (id),
        welder_id uuid NOT NULL,
        token_hash text NOT NULL,
        token_sealed text NOT NULL,
        issued_at timestamptz NOT NULL DEFAULT now(),
        issued_by uuid REFERENCES users (id),
        revoked_at timestamptz,
        CONSTRAINT verify_tokens_hash_key UNIQUE (token_hash),
        CONSTRAINT verify_tokens_welder_fkey FOREIGN KEY (organization_id, welder_id) REFERENCES welders (organization_id, id)
      )`);
    await q.query(
      `CREATE UNIQUE INDEX verify_tokens_active_key ON verify_tokens (welder_id) WHERE revoked_at IS NULL`,
    );
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE IF EXISTS verify_tokens`);
    await q.query(`DROP TABLE IF EXISTS qualifications`);
    await q.query(`DROP FUNCTION IF EXISTS qualifications_refuse_delete()`);
    await q.query(`DROP TABLE IF EXISTS coupon_uploads`);
    await q.query(`DROP TABLE IF EXISTS coupons`);
    await q.query(`DROP TABLE IF EXISTS procedures`);
    await q.query(`DROP TABLE IF EXISTS uploads`);
  }
}
