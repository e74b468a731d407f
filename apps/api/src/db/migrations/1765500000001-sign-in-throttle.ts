// Sign-in throttling kept in PostgreSQL (issue 11, finding 6), so every API instance sees the same
// counts. One row per key: an account (its e-mail) or a client address. Failures count within a
// 15-minute window; past the limit the key is held back for a while that doubles with each further
// failure (1 minute, 2, 4 … at most 15). Only refused passwords count: an outage never reaches here.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class SignInThrottle1765500000001 implements MigrationInterface {
  name = 'SignInThrottle1765500000001';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE sign_in_throttle (
        kind text NOT NULL CHECK (kind IN ('account', 'address')),
        key text NOT NULL CHECK (length(key) BETWEEN 1 AND 300),
        failures integer NOT NULL CHECK (failures >= 0),
        window_started_at timestamptz NOT NULL,
        held_until timestamptz,
        PRIMARY KEY (kind, key)
      )`);
    await q.query(`CREATE INDEX sign_in_throttle_window_idx ON sign_in_throttle (window_started_at)`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE sign_in_throttle`);
  }
}
