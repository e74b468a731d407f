// Indexes and one maintained column the continuity reads need at company scale (issue 5 benchmark:
// 20,000 welders, 60,000 qualifications, 1.5 million evidence rows).
// - Qualifications are found by their pair (welder, process, code): the state refresh after a save, the
//   lapse scan's join from continuity_states and the Welders list's per-welder status look them up so.
// - welders.soonest_lapses_on: the soonest lapsesOn among the welder's qualifications in force (not
//   superseded, not revoked), kept by the continuity state refresh in the same transaction as the change.
//   The Welders list sorted by soonest lapse then reads one shop's first page straight from an index
//   instead of aggregating every welder of the shop.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class ContinuityIndexes1764979200000 implements MigrationInterface {
  name = 'ContinuityIndexes1764979200000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE INDEX qualifications_pair_idx ON qualifications (welder_id, process, code)`);
    await q.query(`ALTER TABLE welders ADD COLUMN soonest_lapses_on date`);
    await q.query(`
      UPDATE welders w SET soonest_lapses_on = x.m
        FROM (SELECT q.welder_id, min(cs.lapses_on) AS m
                FROM qualifications q
                JOIN continuity_states cs ON cs.welder_id = q.welder_id AND cs.process = q.process AND cs.code = q.code
               WHERE q.superseded_by_id IS NULL AND q.revoked_on IS NULL
               GROUP BY q.welder_id) x
       WHERE x.welder_id = w.id`);
    await q.query(
      `CREATE INDEX welders_shop_soonest_lapse_idx ON welders (organization_id, home_shop_id, soonest_lapses_on, stamp, id)`,
    );
    await q.query(`CREATE INDEX welders_soonest_lapse_idx ON welders (organization_id, soonest_lapses_on, stamp, id)`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP INDEX welders_soonest_lapse_idx`);
    await q.query(`DROP INDEX welders_shop_soonest_lapse_idx`);
    await q.query(`ALTER TABLE welders DROP COLUMN soonest_lapses_on`);
    await q.query(`DROP INDEX qualifications_pair_idx`);
  }
}
