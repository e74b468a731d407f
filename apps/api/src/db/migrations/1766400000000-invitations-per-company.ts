// An e-mail address is unique per company, and signs in to one account at most (issue 11, finding 7).
// A company may invite any address: when it already signs in for another company, the invitation is
// saved and e-mailed like any other (the inviter learns nothing of the other company), and using the
// link is refused to the address's owner, so the other account is never touched. Among the accounts of
// one address only one may hold a password; sign-in and password reset look for that one.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class InvitationsPerCompany1766400000000 implements MigrationInterface {
  name = 'InvitationsPerCompany1766400000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE users DROP CONSTRAINT users_email_key`);
    await q.query(`ALTER TABLE users ADD CONSTRAINT users_org_email_key UNIQUE (organization_id, email)`);
    await q.query(
      `CREATE UNIQUE INDEX users_sign_in_email_key ON users (email) WHERE password_hash IS NOT NULL`,
    );
    await q.query(`CREATE INDEX users_email_idx ON users (email)`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP INDEX users_email_idx`);
    await q.query(`DROP INDEX users_sign_in_email_key`);
    await q.query(`ALTER TABLE users DROP CONSTRAINT users_org_email_key`);
    await q.query(`ALTER TABLE users ADD CONSTRAINT users_email_key UNIQUE (email)`);
  }
}
