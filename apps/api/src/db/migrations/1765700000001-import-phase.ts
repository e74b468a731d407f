// The phase of a running import (reading, checking, writing, refreshing continuity), for its progress bar.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class ImportPhase1765700000001 implements MigrationInterface {
  name = 'ImportPhase1765700000001';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE imports ADD COLUMN phase text NOT NULL DEFAULT ''`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE imports DROP COLUMN phase`);
  }
}
