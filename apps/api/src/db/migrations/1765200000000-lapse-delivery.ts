// Lapse watch, second shape: each company's own time zone; runs that stay open ("sending") until every
// delivery of their notices is settled; deliveries claimed with a lease (so a crashed sender's claim
// expires and another picks it up) and dropped as "superseded" when they no longer apply; "restored"
// notices for a lapse that moved away again; every run (skipped ones too) belongs to one company.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class LapseDelivery1765200000000 implements MigrationInterface {
  name = 'LapseDelivery1765200000000';

  async up(q: QueryRunner): Promise<void> {
    // NULL: the server's zone (shown as such in Settings).
    await q.query(`ALTER TABLE company_settings ADD COLUMN time_zone text
                     CHECK (time_zone IS NULL OR length(time_zone) BETWEEN 1 AND 64)`);

    await q.query(`ALTER TABLE lapse_watch_runs DROP CONSTRAINT IF EXISTS lapse_watch_runs_status_check`);
    await q.query(`ALTER TABLE lapse_watch_runs ADD CONSTRAINT lapse_watch_runs_status_check
                     CHECK (status IN ('sending', 'done', 'skipped', 'failed'))`);
    await q.query(`ALTER TABLE lapse_watch_runs ADD COLUMN emails_superseded integer NOT NULL DEFAULT 0`);
    // Skipped runs used to be stored without a company and shown to every company: they say nothing
    // to anyone now, so they go.
    await q.query(`DELETE FROM lapse_watch_runs r WHERE r.organization_id IS NULL
                     AND NOT EXISTS (SELECT 1 FROM lapse_notices n WHERE n.run_id = r.id)`);
    await q.query(`ALTER TABLE lapse_watch_runs ALTER COLUMN organization_id SET NOT NULL`);
    await q.query(`CREATE INDEX lapse_watch_runs_open_idx ON lapse_watch_runs (organization_id) WHERE status = 'sending'`);

    await q.query(`ALTER TABLE lapse_notices DROP CONSTRAINT IF EXISTS lapse_notices_threshold_check`);
    await q.query(`ALTER TABLE lapse_notices ADD CONSTRAINT lapse_notices_threshold_check
                     CHECK (threshold ~ '^(lapsed|restored|[0-9]{1,3})$')`);
    await q.query(`CREATE INDEX lapse_notices_run_idx ON lapse_notices (run_id) WHERE run_id IS NOT NULL`);

    await q.query(`ALTER TABLE notice_deliveries DROP CONSTRAINT IF EXISTS notice_deliveries_status_check`);
    await q.query(`ALTER TABLE notice_deliveries ADD CONSTRAINT notice_deliveries_status_check
                     CHECK (status IN ('pending', 'sent', 'failed', 'superseded'))`);
    await q.query(`ALTER TABLE notice_deliveries
                     ADD COLUMN claim_token uuid,
                     ADD COLUMN claimed_until timestamptz,
                     ADD COLUMN settled_at timestamptz,
                     ADD COLUMN superseded_reason text`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DELETE FROM notice_deliveries WHERE status = 'superseded'`);
    await q.query(`ALTER TABLE notice_deliveries DROP COLUMN claim_token, DROP COLUMN claimed_until,
                     DROP COLUMN settled_at, DROP COLUMN superseded_reason`);
    await q.query(`ALTER TABLE notice_deliveries DROP CONSTRAINT notice_deliveries_status_check`);
    await q.query(`ALTER TABLE notice_deliveries ADD CONSTRAINT notice_deliveries_status_check
                     CHECK (status IN ('pending', 'sent', 'failed'))`);
    await q.query(`DELETE FROM notice_deliveries d USING lapse_notices n WHERE n.id = d.notice_id AND n.threshold = 'restored'`);
    await q.query(`DELETE FROM lapse_notices WHERE threshold = 'restored'`);
    await q.query(`DROP INDEX lapse_notices_run_idx`);
    await q.query(`ALTER TABLE lapse_notices DROP CONSTRAINT lapse_notices_threshold_check`);
    await q.query(`ALTER TABLE lapse_notices ADD CONSTRAINT lapse_notices_threshold_check
                     CHECK (threshold ~ '^(lapsed|[0-9]{1,3})$')`);
    await q.query(`DROP INDEX lapse_watch_runs_open_idx`);
    await q.query(`ALTER TABLE lapse_watch_runs ALTER COLUMN organization_id DROP NOT NULL`);
    await q.query(`ALTER TABLE lapse_watch_runs DROP COLUMN emails_superseded`);
    await q.query(`UPDATE lapse_watch_runs SET status = 'done' WHERE status = 'sending'`);
    await q.query(`ALTER TABLE lapse_watch_runs DROP CONSTRAINT lapse_watch_runs_status_check`);
    await q.query(`ALTER TABLE lapse_watch_runs ADD CONSTRAINT lapse_watch_runs_status_check
                     CHECK (status IN ('done', 'skipped', 'failed'))`);
    await q.query(`ALTER TABLE company_settings DROP COLUMN time_zone`);
  }
}
