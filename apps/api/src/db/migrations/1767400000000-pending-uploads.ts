// A file uploaded from a form is pending until the record that names it (a coupon, a WPS) is saved; then
// it is attached (`attached_at`, set in the same transaction as that record). A pending file older than a
// day belongs to a form that was abandoned: the hourly sweep removes its row and its object and writes
// why in the audit trail. Files already named by a record are attached as of their upload.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class PendingUploads1767400000000 implements MigrationInterface {
  name = 'PendingUploads1767400000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE uploads ADD COLUMN attached_at timestamptz`);
    await q.query(`
      UPDATE uploads u SET attached_at = u.created_at
       WHERE EXISTS (SELECT 1 FROM coupon_uploads cu WHERE cu.upload_id = u.id)
          OR EXISTS (SELECT 1 FROM procedures p WHERE p.document_upload_id = u.id)`);
    await q.query(`CREATE INDEX uploads_pending_idx ON uploads (created_at) WHERE attached_at IS NULL`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP INDEX IF EXISTS uploads_pending_idx`);
    await q.query(`ALTER TABLE uploads DROP COLUMN IF EXISTS attached_at`);
  }
}
