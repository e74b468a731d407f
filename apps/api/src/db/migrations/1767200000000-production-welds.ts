// Production welds (issue 12): a weld of a job with the welder of each process, checked on entry against
// each welder's qualification and continuity on the date welded. A weld outside a qualification is kept
// and flagged for the QA manager's disposition; every pass is documented use of its process for continuity.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class ProductionWelds1767200000000 implements MigrationInterface {
  name = 'ProductionWelds1767200000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE welds (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        organization_id uuid NOT NULL REFERENCES organizations(id),
        shop_id uuid NOT NULL REFERENCES shops(id),
        job_reference text NOT NULL,
        weld_number text NOT NULL,
        welded_on date NOT NULL,
        procedure_id uuid REFERENCES procedures(id),
        joint jsonb NOT NULL,
        examination jsonb,
        note text NOT NULL DEFAULT '',
        flagged boolean NOT NULL DEFAULT false,
        checked_at timestamptz NOT NULL,
        rules_version text NOT NULL,
        review_status text CHECK (review_status IN ('pending', 'dispositioned')),
        disposition text CHECK (disposition IN ('accepted', 'cut-out', 'requalify')),
        disposition_reason text,
        disposition_by uuid REFERENCES users(id),
        disposition_at timestamptz,
        logged_by uuid REFERENCES users(id),
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        version integer NOT NULL DEFAULT 1,
        CONSTRAINT welds_job_number_key UNIQUE (organization_id, job_reference, weld_number),
        CONSTRAINT welds_flag_review CHECK ((review_status IS NULL) = (NOT flagged) OR review_status = 'dispositioned')
      )`);
    await q.query(`CREATE INDEX welds_org_job ON welds (organization_id, job_reference, weld_number)`);
    await q.query(`CREATE INDEX welds_org_date ON welds (organization_id, welded_on)`);
    await q.query(`CREATE INDEX welds_review ON welds (organization_id) WHERE review_status = 'pending'`);
    await q.query(`
      CREATE TABLE weld_passes (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        weld_id uuid NOT NULL REFERENCES welds(id) ON DELETE CASCADE,
        organization_id uuid NOT NULL REFERENCES organizations(id),
        welder_id uuid NOT NULL REFERENCES welders(id),
        process text NOT NULL,
        layer text NOT NULL CHECK (layer IN ('root', 'fill', 'cap', 'all')),
        welded_on date NOT NULL,
        -- The check on entry (or the latest re-check): qualified, the qualification that allows it, the reasons.
        qualified boolean NOT NULL,
        qualification_id uuid REFERENCES qualifications(id),
        reasons jsonb NOT NULL DEFAULT '[]',
        -- An accepted examined weld is a tested weld (49 CFR 192.229(c), 195.222(b)).
        tested boolean NOT NULL DEFAULT false,
        position integer NOT NULL,
        UNIQUE (weld_id, welder_id, process, layer)
      )`);
    // Continuity reads a welder's use of a process in date order, like continuity_entries.
    await q.query(`CREATE INDEX weld_passes_use ON weld_passes (welder_id, process, welded_on)`);
    await q.query(`CREATE INDEX weld_passes_weld ON weld_passes (weld_id)`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE weld_passes`);
    await q.query(`DROP TABLE welds`);
  }
}
