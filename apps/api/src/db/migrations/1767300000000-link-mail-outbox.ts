// Link e-mails (invitations, password resets) go through an outbox (issue 11, finding 7): the request
// writes a row in its own transaction and answers; the sender makes the single-use link and mails it
// after the response, and retries with backoff when the relay does not answer. No request waits on SMTP,
// so an invitation to an address that signs in elsewhere answers like any other, in the same time.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class LinkMailOutbox1767300000000 implements MigrationInterface {
  name = 'LinkMailOutbox1767300000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE link_mails (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        organization_id uuid NOT NULL REFERENCES organizations (id),
        user_id uuid NOT NULL REFERENCES users (id),
        purpose text NOT NULL CHECK (purpose IN ('invitation', 'password-reset')),
        requested_at timestamptz NOT NULL,
        status text NOT NULL DEFAULT 'pending' CHECK (status IN ('pending', 'sent', 'superseded', 'given_up')),
        attempts integer NOT NULL DEFAULT 0,
        next_attempt_at timestamptz NOT NULL,
        claimed_until timestamptz,
        sent_at timestamptz,
        message_id text,
        last_error text
      )`);
    await q.query(`CREATE INDEX link_mails_due_idx ON link_mails (next_attempt_at) WHERE status = 'pending'`);
    await q.query(`CREATE INDEX link_mails_user_idx ON link_mails (user_id, requested_at)`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE link_mails`);
  }
}
