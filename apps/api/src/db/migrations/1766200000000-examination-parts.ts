// A coupon's examination is stored as its parts (visual findings, bends, radiography or ultrasonics,
// fillet break, macro-etch, nick-breaks, combination layers, retest) instead of one method: the rows
// recorded in the first shape ({ method: 'bend' | 'radiography' | 'ultrasonic', … }) are rewritten.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class ExaminationParts1766200000000 implements MigrationInterface {
  name = 'ExaminationParts1766200000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      UPDATE coupons SET examination = CASE
        WHEN examination->>'method' = 'bend' THEN jsonb_strip_nulls(jsonb_build_object(
          'criteria', examination->'criteria',
          'additionalCriteria', examination->'additionalCriteria',
          'bend', jsonb_build_object('specimens', examination->'specimens')))
        ELSE jsonb_build_object('volumetric', jsonb_strip_nulls(jsonb_build_object(
          'method', examination->'method',
          'indications', '[]'::jsonb,
          'examinerResult', examination->'result',
          'reportNumber', NULLIF(examination->>'reportNumber', ''),
          'reportUploadId', examination->'reportUploadId')))
        END
      WHERE examination ? 'method'`);
  }

  async down(q: QueryRunner): Promise<void> {
    // Only bends or radiography/ultrasonics fit the first shape; other examinations stay as they are.
    await q.query(`
      UPDATE coupons SET examination = CASE
        WHEN examination ? 'bend' THEN jsonb_strip_nulls(jsonb_build_object(
          'method', 'bend',
          'criteria', COALESCE(examination->'criteria', to_jsonb(code)),
          'additionalCriteria', examination->'additionalCriteria',
          'specimens', examination->'bend'->'specimens'))
        ELSE jsonb_build_object(
          'method', examination->'volumetric'->'method',
          'result', COALESCE(examination->'volumetric'->'examinerResult', to_jsonb(result)),
          'reportNumber', COALESCE(examination->'volumetric'->'reportNumber', '""'::jsonb),
          'reportUploadId', examination->'volumetric'->'reportUploadId')
        END
      WHERE NOT examination ? 'method' AND (examination ? 'bend' OR examination ? 'volumetric')`);
  }
}
