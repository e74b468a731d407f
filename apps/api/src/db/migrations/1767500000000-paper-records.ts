// Qualifications brought in from paper WPQs (issue 13): what the paper record stated about the ranges,
// where it differs from the ranges the rules compute, and how the QA manager settled the difference.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class PaperRecords1767500000000 implements MigrationInterface {
  name = 'PaperRecords1767500000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE qualification_paper_records (
        qualification_id uuid PRIMARY KEY REFERENCES qualifications (id),
        organization_id uuid NOT NULL REFERENCES organizations (id),
        import_id uuid REFERENCES imports (id),
        line integer NOT NULL,
        stated jsonb NOT NULL,
        differences jsonb NOT NULL DEFAULT '[]',
        computed_ranges jsonb NOT NULL,
        settlement text CHECK (settlement IN ('computed', 'narrowed')),
        settlement_note text,
        settled_by uuid REFERENCES users (id),
        settled_at timestamptz,
        CONSTRAINT qualification_paper_records_settled_check CHECK ((settlement IS NULL) = (settled_at IS NULL))
      )`);
    await q.query(
      `CREATE INDEX qualification_paper_records_open_idx ON qualification_paper_records (organization_id)
        WHERE settlement IS NULL AND differences <> '[]'::jsonb`,
    );
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE qualification_paper_records`);
  }
}
