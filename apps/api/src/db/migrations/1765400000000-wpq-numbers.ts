// WPQ record numbers a person can read and quote: 'WPQ-2026-0042', the company's own sequence per year of
// certification, instead of the record's UUID. A BEFORE INSERT trigger draws the next number from a
// per-company, per-year counter row (the upsert locks that row, so concurrent certifications never share
// a number), so every way a qualification is written gets one. Existing records are numbered in the order
// they were certified.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class WpqNumbers1765400000000 implements MigrationInterface {
  name = 'WpqNumbers1765400000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE wpq_number_counters (
        organization_id uuid NOT NULL REFERENCES organizations (id),
        year int NOT NULL,
        last int NOT NULL,
        PRIMARY KEY (organization_id, year)
      )`);
    await q.query(`ALTER TABLE qualifications ADD COLUMN number text`);
    await q.query(`
      CREATE FUNCTION wpq_number(y int, n int) RETURNS text LANGUAGE sql IMMUTABLE AS $$
        SELECT 'WPQ-' || y || '-' || CASE WHEN n < 10000 THEN lpad(n::text, 4, '0') ELSE n::text END
      $$`);
    await q.query(`
      UPDATE qualifications q SET number = wpq_number(x.y, x.n::int)
        FROM (SELECT id, extract(year FROM certified_on)::int AS y,
                     row_number() OVER (PARTITION BY organization_id, extract(year FROM certified_on)
                                        ORDER BY certified_on, created_at, id) AS n
                FROM qualifications) x
       WHERE x.id = q.id`);
    await q.query(`
      INSERT INTO wpq_number_counters (organization_id, year, last)
      SELECT organization_id, extract(year FROM certified_on)::int, count(*)
        FROM qualifications GROUP BY 1, 2`);
    await q.query(`
      CREATE FUNCTION qualifications_assign_number() RETURNS trigger LANGUAGE plpgsql AS $$
      DECLARE
        y int := extract(year FROM NEW.certified_on)::int;
        n int;
      BEGIN
        IF NEW.number IS NULL THEN
          INSERT INTO wpq_number_counters AS c (organization_id, year, last) VALUES (NEW.organization_id, y, 1)
            ON CONFLICT (organization_id, year) DO UPDATE SET last = c.last + 1
            RETURNING c.last INTO n;
          NEW.number := wpq_number(y, n);
        END IF;
        RETURN NEW;
      END $$`);
    await q.query(`
      CREATE TRIGGER qualifications_number BEFORE INSERT ON qualifications
        FOR EACH ROW EXECUTE FUNCTION qualifications_assign_number()`);
    await q.query(`ALTER TABLE qualifications ALTER COLUMN number SET NOT NULL`);
    await q.query(
      `ALTER TABLE qualifications ADD CONSTRAINT qualifications_number_key UNIQUE (organization_id, number)`,
    );
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TRIGGER qualifications_number ON qualifications`);
    await q.query(`DROP FUNCTION qualifications_assign_number()`);
    await q.query(`ALTER TABLE qualifications DROP COLUMN number`);
    await q.query(`DROP FUNCTION wpq_number(int, int)`);
    await q.query(`DROP TABLE wpq_number_counters`);
  }
}
