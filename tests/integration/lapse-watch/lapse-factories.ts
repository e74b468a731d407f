// Rows for the lapse-watch and Overview tests: certified qualifications written straight to PostgreSQL,
// each with its continuity_states row (the state the continuity log maintains, set here to the lapse
// date the test needs), a flagged continuity entry, a world with a foreman
// per shop and two QA managers, and an in-test mail catcher on a free port with its own folder.
import { mkdtemp } from 'node:fs/promises';
import net from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { DataSource } from 'typeorm';
import { RULES_VERSION } from '@beadroll/rules';
import { makeProcedure } from '../../support/api-records.js';
import {
  makeUser,
  makeWorld,
  uniq,
  type Company,
  type UserRow,
  type WelderRow,
} from '../../support/factories.js';

export interface QualificationRow {
  id: string;
  welderId: string;
  process: string;
  code: string;
}

/** A certified qualification of `welder` (coupon + qualification rows) whose pair lapses on `lapsesOn`. */
export async function makeQualification(
  ds: DataSource,
  org: Company,
  certifier: UserRow,
  welder: WelderRow,
  q: { process?: string; code?: string; lapsesOn: string; lastEvidence: string; revokedOn?: string },
): Promise<QualificationRow> {
  const process = q.process ?? 'SMAW';
  const code = q.code ?? 'asme-ix';
  const procedure = await makeProcedure(ds, org, {
    number: uniq('WPS'),
    processes: [process as 'SMAW'],
    code: code as 'asme-ix',
  });
  const testedOn = q.lastEvidence;
  const [coupon] = await ds.query<{ id: string }[]>(
    `INSERT INTO coupons (organization_id, welder_id, shop_id, procedure_id, tested_on, code, process, coupon,
                          examiner, visual, examination, result, rules_version)
     VALUES ($1, $2, $3, $4, $5, $6, $7, '{}', '{"name":"Ivo Testbench"}', 'accept', '{"method":"bend"}', 'accept', $8)
     RETURNING id`,
    [org.id, welder.id, welder.homeShopId, procedure.id, testedOn, code, process, RULES_VERSION],
  );
  const [row] = await ds.query<QualificationRow[]>(
    `INSERT INTO qualifications (organization_id, welder_id, coupon_id, code, process, ranges, certified_on,
                                 certified_by, certified_by_name, rules_version, revoked_on, revoked_reason, revoked_by)
     VALUES ($1, $2, $3, $4, $5, '{}', $6, $7, $8, $9, $10, CASE WHEN $10::date IS NULL THEN NULL ELSE 'Test revocation' END,
             CASE WHEN $10::date IS NULL THEN NULL ELSE $7::uuid END)
     RETURNING id, welder_id AS "welderId", process, code`,
    [
      org.id,
      welder.id,
      coupon!.id,
      code,
      process,
      testedOn,
      certifier.id,
      certifier.name,
      RULES_VERSION,
      q.revokedOn ?? null,
    ],
  );
  await ds.query(
    `INSERT INTO continuity_states (welder_id, process, code, organization_id, qualified_on, last_evidence, last_test, lapses_on)
     VALUES ($1, $2, $3, $4, $5, $6, $5, $7)
     ON CONFLICT (welder_id, process, code) DO UPDATE SET last_evidence = EXCLUDED.last_evidence, lapses_on = EXCLUDED.lapses_on`,
    [welder.id, process, code, org.id, testedOn, q.lastEvidence, q.lapsesOn],
  );
  return row!;
}

/** A continuity entry logged while the pair had lapsed, awaiting the QA manager's review. */
export async function makeFlaggedEntry(
  ds: DataSource,
  org: Company,
  welder: WelderRow,
  shopId: string,
  usedOn: string,
): Promise<void> {
  await ds.query(
    `INSERT INTO continuity_entries (organization_id, welder_id, shop_id, process, month, used_on, job_reference,
                                     flagged_lapsed, review_status)
     VALUES ($1, $2, $3, 'SMAW', date_trunc('month', $4::date)::date, $4, 'JOB-4471', true, 'pending')`,
    [org.id, welder.id, shopId, usedOn],
  );
}

/** makeWorld plus a foreman of shop B and a second QA manager. */
export async function makeLapseWorld(ds: DataSource) {
  const world = await makeWorld(ds);
  const foremanB = await makeUser(ds, world.org, {
    role: 'foreman',
    name: 'Gale Birchall',
    shops: [world.shopB],
  });
  const qa2 = await makeUser(ds, world.org, { role: 'qa_manager', name: 'Rhea Tallis' });
  return { ...world, foremanB, qa2 };
}

export const freePort = () =>
  new Promise<number>((resolve, reject) => {
    const s = net.createServer().listen(0, '127.0.0.1', () => {
      const { port } = s.address() as net.AddressInfo;
      s.close(() => resolve(port));
    });
    s.once('error', reject);
  });

export const mailFolder = () => mkdtemp(path.join(tmpdir(), 'beadroll-lapse-mail-'));

/** A clock the test sets to an instant and moves forward (the API's "now"). */
export function settableClock(start = '2026-06-01T12:00:00Z') {
  let at = new Date(start).getTime();
  return {
    now: () => new Date(at),
    set: (iso: string) => void (at = new Date(iso).getTime()),
    /** Noon UTC of the day: the same calendar day in every zone from UTC−11 to UTC+11. */
    day: (day: string) => void (at = new Date(`${day}T12:00:00Z`).getTime()),
    advance: (ms: number) => void (at += ms),
  };
}
