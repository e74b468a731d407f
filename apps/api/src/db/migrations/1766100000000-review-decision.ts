// Lapsed-use review (issue 10, item 2): a review records a decision about the welds made while the
// welder was out of continuity, besides the note. Reviews closed before this change have no decision.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class ReviewDecision1766100000000 implements MigrationInterface {
  name = 'ReviewDecision1766100000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      ALTER TABLE continuity_entries
        ADD COLUMN review_decision text
          CHECK (review_decision IN ('welds-examined', 'welds-repaired', 'logged-in-error'))`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE continuity_entries DROP COLUMN review_decision`);
  }
}
