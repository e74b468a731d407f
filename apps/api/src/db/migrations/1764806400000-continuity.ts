// Continuity (issue 5): the monthly log of process use per welder, shop and month, and the maintained
// continuity state of every (welder, process, code) pair that lists, the Overview and the lapse scan read.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class Continuity1764806400000 implements MigrationInterface {
  name = 'Continuity1764806400000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE continuity_entries (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        organization_id uuid NOT NULL REFERENCES organizations (id),
        welder_id uuid NOT NULL,
        shop_id uuid NOT NULL,
        process text NOT NULL,
        month date NOT NULL CHECK (month = date_trunc('month', month)::date),
        used_on date NOT NULL,
        job_reference text NOT NULL CHECK (length(job_reference) BETWEEN 1 AND 80),
        note text NOT NULL DEFAULT '' CHECK (length(note) <= 500),
        flagged_lapsed boolean NOT NULL DEFAULT false,
        review_status text CHECK (review_status IN ('pending', 'reviewed')),
        review_note text,
        reviewed_by uuid REFERENCES users (id),
        reviewed_at timestamptz,
        logged_by uuid REFERENCES users (id),
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        version integer NOT NULL DEFAULT 1 CHECK (version >= 1),
        CONSTRAINT continuity_entries_cell_key UNIQUE (welder_id, process, shop_id, month),
        CONSTRAINT continuity_entries_used_on_check CHECK (date_trunc('month', used_on)::date = month),
        CONSTRAINT continuity_entries_welder_fkey FOREIGN KEY (organization_id, welder_id) REFERENCES welders (organization_id, id),
        CONSTRAINT continuity_entries_shop_fkey FOREIGN KEY (organization_id, shop_id) REFERENCES shops (organization_id, id)
      )`);
    // The pair walk reads a welder's use of one process in date order.
    await q.query(`CREATE INDEX continuity_entries_pair_idx ON continuity_entries (welder_id, process, used_on)`);
    await q.query(`CREATE INDEX continuity_entries_grid_idx ON continuity_entries (organization_id, shop_id, month)`);
    await q.query(`
      CREATE INDEX continuity_entries_review_idx ON continuity_entries (organization_id, used_on)
        WHERE flagged_lapsed AND review_status = 'pending'`);

    await q.query(`
      CREATE TABLE continuity_states (
        welder_id uuid NOT NULL REFERENCES welders (id),
        process text NOT NULL,
        code text NOT NULL,
        organization_id uuid NOT NULL REFERENCES organizations (id),
        qualified_on date NOT NULL,
        last_evidence date NOT NULL,
        last_test date NOT NULL,
        lapses_on date NOT NULL,
        renewed_on date,
        ignored date[] NOT NULL DEFAULT '{}',
        updated_at timestamptz NOT NULL DEFAULT now(),
        PRIMARY KEY (welder_id, process, code)
      )`);
    await q.query(`CREATE INDEX continuity_states_lapses_idx ON continuity_states (organization_id, lapses_on)`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE continuity_states`);
    await q.query(`DROP TABLE continuity_entries`);
  }
}
