// The crew finder reads, per distinct range set, every qualification of the process that is not
// superseded; fetching those rows from the heap (wide rows: the ranges) cost seconds on a cold cache at
// 20,000 welders (EXPLAIN ANALYZE in bench:crew's database). The index now carries the columns the finder
// reads, so the read is an index-only scan.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class CrewCoveringIndex1767100000001 implements MigrationInterface {
  name = 'CrewCoveringIndex1767100000001';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`DROP INDEX qualifications_crew_idx`);
    await q.query(
      `CREATE INDEX qualifications_crew_idx ON qualifications (organization_id, process, ranges_key)
         INCLUDE (welder_id, code, id, number, revoked_on, revoked_reason, certified_on)
        WHERE superseded_by_id IS NULL`,
    );
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP INDEX qualifications_crew_idx`);
    await q.query(
      `CREATE INDEX qualifications_crew_idx ON qualifications (organization_id, process, ranges_key)
        WHERE superseded_by_id IS NULL`,
    );
  }
}
