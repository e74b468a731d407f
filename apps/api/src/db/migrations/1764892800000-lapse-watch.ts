// Lapse watch: per-company settings, the history of job runs, the notice outbox (one notice per
// qualification, threshold and lapse date, whoever runs the job and however often) and the e-mail
// deliveries of each notice to each recipient with their retry state.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class LapseWatch1764892800000 implements MigrationInterface {
  name = 'LapseWatch1764892800000';

  async up(q: QueryRunner): Promise<void> {
    // A missing row means the defaults.
    await q.query(`
      CREATE TABLE company_settings (
        organization_id uuid PRIMARY KEY REFERENCES organizations (id),
        warn_days integer[] NOT NULL DEFAULT '{30,7}'
          CHECK (cardinality(warn_days) BETWEEN 1 AND 4 AND 1 <= ALL (warn_days) AND 180 >= ALL (warn_days)),
        closed_month_after integer NOT NULL DEFAULT 2 CHECK (closed_month_after BETWEEN 1 AND 12),
        lapse_watch_time text NOT NULL DEFAULT '06:00' CHECK (lapse_watch_time ~ '^([01][0-9]|2[0-3]):[0-5][0-9]$'),
        updated_at timestamptz NOT NULL DEFAULT now()
      )`);

    await q.query(`
      CREATE TABLE lapse_watch_runs (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        organization_id uuid REFERENCES organizations (id),
        as_of date NOT NULL,
        started_at timestamptz NOT NULL,
        finished_at timestamptz,
        trigger text NOT NULL CHECK (trigger IN ('schedule', 'manual', 'cli')),
        instance text NOT NULL,
        status text NOT NULL CHECK (status IN ('done', 'skipped', 'failed')),
        notices_created integer NOT NULL DEFAULT 0,
        emails_sent integer NOT NULL DEFAULT 0,
        emails_failed integer NOT NULL DEFAULT 0,
        error text
      )`);
    await q.query(
      `CREATE INDEX lapse_watch_runs_organization_idx ON lapse_watch_runs (organization_id, started_at DESC)`,
    );

    await q.query(`
      CREATE TABLE lapse_notices (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        organization_id uuid NOT NULL REFERENCES organizations (id),
        qualification_id uuid NOT NULL REFERENCES qualifications (id),
        threshold text NOT NULL CHECK (threshold ~ '^(lapsed|[0-9]{1,3})$'),
        lapses_on date NOT NULL,
        created_at timestamptz NOT NULL DEFAULT now(),
        run_id uuid REFERENCES lapse_watch_runs (id),
        CONSTRAINT lapse_notices_once_key UNIQUE (qualification_id, threshold, lapses_on)
      )`);
    await q.query(
      `CREATE INDEX lapse_notices_organization_idx ON lapse_notices (organization_id, created_at DESC)`,
    );

    await q.query(`
      CREATE TABLE notice_deliveries (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        notice_id uuid NOT NULL REFERENCES lapse_notices (id),
        user_id uuid NOT NULL REFERENCES users (id) ON DELETE CASCADE,
        email text NOT NULL,
        status text NOT NULL DEFAULT 'pending' CHECK (status IN ('pending', 'sent', 'failed')),
        attempts integer NOT NULL DEFAULT 0 CHECK (attempts >= 0),
        next_attempt_at timestamptz,
        last_error text,
        sent_at timestamptz,
        message_id text,
        CONSTRAINT notice_deliveries_once_key UNIQUE (notice_id, user_id),
        CONSTRAINT notice_deliveries_sent_check CHECK ((status = 'sent') = (sent_at IS NOT NULL))
      )`);
    await q.query(
      `CREATE INDEX notice_deliveries_due_idx ON notice_deliveries (next_attempt_at, user_id) WHERE status = 'pending'`,
    );
    await q.query(
      `CREATE INDEX notice_deliveries_failed_idx ON notice_deliveries (notice_id) WHERE status = 'failed'`,
    );
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE IF EXISTS notice_deliveries`);
    await q.query(`DROP TABLE IF EXISTS lapse_notices`);
    await q.query(`DROP TABLE IF EXISTS lapse_watch_runs`);
    await q.query(`DROP TABLE IF EXISTS company_settings`);
  }
}
