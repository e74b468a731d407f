// The stored evaluation of a coupon (issue 9): the parts, reasons, the code's criteria and an in-house set
// applied in addition, with the rules version. Coupons recorded before it keep evaluation NULL and are
// read as recorded (criteria_id, result, reasons); a coupon judged by in-house criteria instead of its
// code's cannot be certified (the certification checks criteria_id against code).
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class CouponEvaluation1765300000000 implements MigrationInterface {
  name = 'CouponEvaluation1765300000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE coupons ADD COLUMN evaluation jsonb`);
    await q.query(`ALTER TABLE coupons ADD COLUMN additional_criteria_id text`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE coupons DROP COLUMN additional_criteria_id`);
    await q.query(`ALTER TABLE coupons DROP COLUMN evaluation`);
  }
}
