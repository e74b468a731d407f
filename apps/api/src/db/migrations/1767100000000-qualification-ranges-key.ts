// The crew finder (issue 12): a company holds thousands of qualifications of a process but few distinct
// sets of qualified ranges (one per kind of coupon). ranges_key names each set, so the finder asks
// jointWithin once per distinct set and then reads the welders of the sets that fit through an index,
// instead of parsing every qualification's ranges. Stored and computed by PostgreSQL from the ranges
// themselves, so no writer of qualifications can leave it stale.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class QualificationRangesKey1767100000000 implements MigrationInterface {
  name = 'QualificationRangesKey1767100000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE qualifications ADD COLUMN ranges_key text GENERATED ALWAYS AS (md5(ranges::text)) STORED`);
    await q.query(
      `CREATE INDEX qualifications_crew_idx ON qualifications (organization_id, process, ranges_key)
        WHERE superseded_by_id IS NULL`,
    );
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP INDEX qualifications_crew_idx`);
    await q.query(`ALTER TABLE qualifications DROP COLUMN ranges_key`);
  }
}
