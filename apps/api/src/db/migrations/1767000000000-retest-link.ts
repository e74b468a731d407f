// A retest names the failed coupon it retests (QW-321, AWS D1.1 retest, API 1104 retest): the link becomes
// a real column with a foreign key, so the coupons of one retest are found by an index and a failed
// coupon cannot point at a coupon that does not exist. Rows recorded with the link only inside the
// examination are carried over.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class RetestLink1767000000000 implements MigrationInterface {
  name = 'RetestLink1767000000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE coupons ADD COLUMN retest_of_id uuid REFERENCES coupons (id)`);
    await q.query(`
      UPDATE coupons c SET retest_of_id = f.id
        FROM coupons f
       WHERE c.examination ? 'retest'
         AND f.id::text = c.examination->'retest'->>'of'
         AND f.welder_id = c.welder_id`);
    await q.query(`CREATE INDEX coupons_retest_of_idx ON coupons (retest_of_id) WHERE retest_of_id IS NOT NULL`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE coupons DROP COLUMN retest_of_id`);
  }
}
