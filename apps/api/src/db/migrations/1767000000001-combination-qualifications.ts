// A combination coupon (QW-306: a GTAW root and an SMAW fill in one coupon) qualifies each of its processes
// with the weld metal that process deposited: certifying it issues one qualification per process. So a
// coupon has one qualification per process (no longer one in all), and `processes` lists every process a
// coupon was welded with — its own and those of its combination layers — computed by PostgreSQL from the
// coupon itself, so the continuity walk counts a passing combination coupon for each of its processes
// whoever wrote the row.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class CombinationQualifications1767000000001 implements MigrationInterface {
  name = 'CombinationQualifications1767000000001';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE FUNCTION coupon_processes(process text, examination jsonb) RETURNS text[]
        LANGUAGE sql IMMUTABLE PARALLEL SAFE AS $$
        SELECT ARRAY(SELECT DISTINCT p FROM unnest(
          ARRAY[process] || ARRAY(SELECT jsonb_array_elements(
            CASE WHEN jsonb_typeof(examination->'layers') = 'array' THEN examination->'layers' ELSE '[]'::jsonb END
          )->>'process')) AS p WHERE p IS NOT NULL ORDER BY p)
      $$`);
    await q.query(
      `ALTER TABLE coupons ADD COLUMN processes text[] GENERATED ALWAYS AS (coupon_processes(process, examination)) STORED`,
    );
    await q.query(
      `CREATE INDEX coupons_passing_welder_idx ON coupons (welder_id, tested_on) WHERE result = 'accept'`,
    );
    await q.query(`ALTER TABLE qualifications DROP CONSTRAINT qualifications_coupon_key`);
    await q.query(
      `ALTER TABLE qualifications ADD CONSTRAINT qualifications_coupon_process_key UNIQUE (coupon_id, process)`,
    );
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE qualifications DROP CONSTRAINT qualifications_coupon_process_key`);
    await q.query(`ALTER TABLE qualifications ADD CONSTRAINT qualifications_coupon_key UNIQUE (coupon_id)`);
    await q.query(`DROP INDEX coupons_passing_welder_idx`);
    await q.query(`ALTER TABLE coupons DROP COLUMN processes`);
    await q.query(`DROP FUNCTION coupon_processes(text, jsonb)`);
  }
}
