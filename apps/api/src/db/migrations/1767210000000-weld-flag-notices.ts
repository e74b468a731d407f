// Welds newly flagged by a re-check go into the lapse-watch digest (issue 12, "Re-checking"): one notice
// per weld and flag (the re-check's time), delivered through the same outbox as the lapse notices — a
// delivery row is for a lapse notice or for a weld notice, never both — so the same claim, re-check
// before sending, one digest per recipient and at-least-once recording apply to both.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class WeldFlagNotices1767210000000 implements MigrationInterface {
  name = 'WeldFlagNotices1767210000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE weld_flag_notices (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        organization_id uuid NOT NULL REFERENCES organizations(id),
        weld_id uuid NOT NULL REFERENCES welds(id) ON DELETE CASCADE,
        flagged_at timestamptz NOT NULL,
        cause text NOT NULL,
        created_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT weld_flag_notices_once_key UNIQUE (weld_id, flagged_at)
      )`);
    await q.query(`ALTER TABLE notice_deliveries ALTER COLUMN notice_id DROP NOT NULL`);
    await q.query(`ALTER TABLE notice_deliveries
                     ADD COLUMN weld_notice_id uuid REFERENCES weld_flag_notices(id) ON DELETE CASCADE,
                     ADD CONSTRAINT notice_deliveries_one_notice_check CHECK (num_nonnulls(notice_id, weld_notice_id) = 1),
                     ADD CONSTRAINT notice_deliveries_weld_once_key UNIQUE (weld_notice_id, user_id)`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DELETE FROM notice_deliveries WHERE weld_notice_id IS NOT NULL`);
    await q.query(`ALTER TABLE notice_deliveries DROP COLUMN weld_notice_id`);
    await q.query(`ALTER TABLE notice_deliveries ALTER COLUMN notice_id SET NOT NULL`);
    await q.query(`DROP TABLE weld_flag_notices`);
  }
}
