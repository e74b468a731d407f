// The audit report: for a shop (its home welders) or the company and a period, everything an auditor asks
// for, computed from the same records and the same continuity walk the screens use. The register and each
// month's "lapsed" come from the full recompute of the walk as of that day (recomputeAll with asOf), so a
// past period reads as it stood then, and the status of a qualification is the one status function
// (qualificationStatus) the qualifications API answers with.
import {
  RANGES_NOTICE,
  matrixMarks,
  reviewDecisionLabels,
  type AuditReport,
  type AuditReportQuery,
  type ReviewDecision,
} from '@beadroll/rules';
import type { EntityManager } from 'typeorm';
import type { AppDeps } from '../lib/context.js';
import { AppError } from '../lib/errors.js';
import type { Actor } from '../lib/scope.js';
import { companyWarnDaysSql, recomputeAll, type RecomputedState } from '../continuity/continuity-state.repository.js';
import { qualificationStatus, rangeSummary } from '../qualifications/qualifications.service.js';

type Mark = (typeof matrixMarks)[number];

/** The last day of each month from `from` to `to` (the last one is `to` itself). */
function monthEnds(from: string, to: string): { month: string; end: string }[] {
  const out: { month: string; end: string }[] = [];
  let y = Number(from.slice(0, 4));
  let m = Number(from.slice(5, 7));
  for (;;) {
    const month = `${y}-${String(m).padStart(2, '0')}`;
    const last = new Date(Date.UTC(y, m, 0)).toISOString().slice(0, 10);
    out.push({ month, end: last < to ? last : to });
    if (month >= to.slice(0, 7)) return out;
    m = m === 12 ? 1 : m + 1;
    if (m === 1) y++;
  }
}

interface QualRow {
  id: string;
  welderId: string;
  stamp: string;
  name: string;
  number: string;
  code: string;
  process: string;
  certifiedOn: string;
  qualifiedOn: string;
  revokedOn: string | null;
  revokedReason: string | null;
  ranges: Record<string, unknown>;
  warnDays: number;
}

async function scope(db: EntityManager, actor: Actor, shopId: string | undefined) {
  const [org] = await db.query<{ name: string }[]>(`SELECT name FROM organizations WHERE id = $1`, [actor.organizationId]);
  let shop: AuditReport['shop'] = null;
  if (shopId) {
    const [s] = await db.query<{ id: string; code: string; name: string }[]>(
      `SELECT id, code, name FROM shops WHERE organization_id = $1 AND id = $2`,
      [actor.organizationId, shopId],
    );
    if (!s) throw AppError.validation({ shopId: 'Choose a shop of your company' });
    shop = s;
  }
  const welders = await db.query<{ id: string; stamp: string; name: string }[]>(
    `SELECT id, stamp, name FROM welders WHERE organization_id = $1 AND ($2::uuid IS NULL OR home_shop_id = $2) ORDER BY stamp`,
    [actor.organizationId, shopId ?? null],
  );
  return { company: org?.name ?? '', shop, welders };
}

export async function auditReport(deps: AppDeps, actor: Actor, q: AuditReportQuery): Promise<AuditReport> {
  const db = deps.dataSource.manager;
  const { company, shop, welders } = await scope(db, actor, q.shopId);
  const ids = welders.map((w) => w.id);
  const who = new Map(welders.map((w) => [w.id, { stamp: w.stamp, name: w.name }]));
  const params = [actor.organizationId, ids, q.from, q.to];

  const quals = await db.query<QualRow[]>(
    `SELECT q.id, q.welder_id AS "welderId", w.stamp, w.name, q.number, q.code, q.process,
            to_char(q.certified_on, 'YYYY-MM-DD') AS "certifiedOn", to_char(c.tested_on, 'YYYY-MM-DD') AS "qualifiedOn",
            to_char(q.revoked_on, 'YYYY-MM-DD') AS "revokedOn", q.revoked_reason AS "revokedReason", q.ranges,
            ${companyWarnDaysSql('q.organization_id')} AS "warnDays"
       FROM qualifications q JOIN coupons c ON c.id = q.coupon_id JOIN welders w ON w.id = q.welder_id
      WHERE q.organization_id = $1 AND q.welder_id = ANY ($2::uuid[]) AND q.certified_on <= $3
        -- as of the period's end: one superseded by then is not on the register
        AND NOT EXISTS (SELECT 1 FROM qualifications n WHERE n.id = q.superseded_by_id AND n.certified_on <= $3)
      ORDER BY w.stamp, q.process, q.code, q.certified_on`,
    [actor.organizationId, ids, q.to],
  );

  // The walk as of each month's end: the register uses the last, the matrix each one.
  const ends = monthEnds(q.from, q.to);
  const pairKey = (s: { welderId: string; process: string; code: string }) => `${s.welderId}|${s.process}|${s.code}`;
  const inScope = new Set(ids);
  const states: Map<string, RecomputedState>[] = [];
  for (const e of ends)
    states.push(
      new Map(
        (await recomputeAll(db, { organizationId: actor.organizationId, asOf: e.end }))
          .filter((s) => inScope.has(s.welderId))
          .map((s) => [pairKey(s), s]),
      ),
    );
  const atEnd = states.at(-1)!;

  const register: AuditReport['register'] = quals.map((x) => {
    const s = atEnd.get(pairKey(x));
    const status = qualificationStatus(
      { qualifiedOn: x.qualifiedOn, revokedOn: x.revokedOn, stateLapsesOn: s?.lapsesOn ?? null, stateLastEvidence: s?.lastEvidence ?? null, warnDays: x.warnDays },
      q.to,
    );
    const limits = (x.ranges.limits ?? []) as { clause: string }[];
    return {
      stamp: x.stamp,
      name: x.name,
      qualificationId: x.id,
      number: x.number,
      code: x.code,
      process: x.process,
      certifiedOn: x.certifiedOn,
      state: status.state,
      lapsesOn: status.lapsesOn,
      ranges: rangeSummary(x.ranges),
      clauses: [...new Set(limits.map((l) => l.clause))].join('; '),
    };
  });

  // Evidence in the period, per welder, process and month.
  const entries = await db.query<{ id: string; welderId: string; process: string; usedOn: string; job: string; shop: string; review: string | null; decision: string | null; note: string | null }[]>(
    `SELECT e.id, e.welder_id AS "welderId", e.process, to_char(e.used_on, 'YYYY-MM-DD') AS "usedOn", e.job_reference AS job,
            s.code AS shop, e.review_status AS review, e.review_decision AS decision, e.review_note AS note
       FROM continuity_entries e JOIN shops s ON s.id = e.shop_id
      WHERE e.organization_id = $1 AND e.welder_id = ANY ($2::uuid[]) AND e.used_on BETWEEN $3 AND $4
      ORDER BY e.used_on, e.id`,
    params,
  );
  const tests = await db.query<{ welderId: string; process: string; testedOn: string }[]>(
    `SELECT welder_id AS "welderId", process, to_char(tested_on, 'YYYY-MM-DD') AS "testedOn"
       FROM coupons WHERE organization_id = $1 AND welder_id = ANY ($2::uuid[]) AND result = 'accept' AND tested_on BETWEEN $3 AND $4`,
    params,
  );
  const monthIndex = new Map(ends.map((e, i) => [e.month, i]));
  const rows = new Map<string, { welderId: string; process: string; cells: Set<Mark>[] }>();
  const rowOf = (welderId: string, process: string) => {
    const k = `${welderId}|${process}`;
    let r = rows.get(k);
    if (!r) rows.set(k, (r = { welderId, process, cells: ends.map(() => new Set<Mark>()) }));
    return r;
  };
  for (const x of quals) if (x.qualifiedOn <= q.to) rowOf(x.welderId, x.process);
  for (const t of tests) rowOf(t.welderId, t.process).cells[monthIndex.get(t.testedOn.slice(0, 7))!]!.add('tested');
  for (const e of entries) rowOf(e.welderId, e.process).cells[monthIndex.get(e.usedOn.slice(0, 7))!]!.add(e.review ? 'flagged' : 'used');
  // Lapsed in a month: every pair of the welder and process qualified by then is out of force at its end.
  const pairsOf = new Map<string, RecomputedState[]>();
  ends.forEach((e, i) => {
    for (const s of states[i]!.values()) {
      if (s.qualifiedOn > e.end) continue;
      const k = `${s.welderId}|${s.process}`;
      const list = pairsOf.get(`${k}|${i}`) ?? [];
      list.push(s);
      pairsOf.set(`${k}|${i}`, list);
    }
  });
  const revokedBy = new Map<string, string>();
  for (const x of quals) if (x.revokedOn) revokedBy.set(`${pairKey(x)}|${x.revokedOn}`, x.revokedOn);
  for (const r of rows.values())
    ends.forEach((e, i) => {
      const pairs = pairsOf.get(`${r.welderId}|${r.process}|${i}`) ?? [];
      if (pairs.length > 0 && pairs.every((s) => s.lapsesOn <= e.end)) r.cells[i]!.add('lapsed');
    });

  // Lapses and renewals in the period, as the walk dated them (a revocation is listed as such, not as a lapse).
  const lapses = new Map<string, AuditReport['lapses'][number]>();
  const renewals = new Map<string, AuditReport['renewals'][number]>();
  ends.forEach((e, i) => {
    for (const s of states[i]!.values()) {
      const w = who.get(s.welderId)!;
      if (s.lapsesOn >= q.from && s.lapsesOn <= e.end && !revokedBy.has(`${pairKey(s)}|${s.lapsesOn}`))
        lapses.set(`${pairKey(s)}|${s.lapsesOn}`, { ...w, code: s.code, process: s.process, lapsedOn: s.lapsesOn });
      if (s.renewedOn && s.renewedOn >= q.from && s.renewedOn <= e.end)
        renewals.set(`${pairKey(s)}|${s.renewedOn}`, { ...w, code: s.code, process: s.process, renewedOn: s.renewedOn });
    }
  });
  const byDate = <T>(key: (t: T) => string) => (a: T, b: T) => key(a).localeCompare(key(b));

  const revocations: AuditReport['revocations'] = quals
    .filter((x) => x.revokedOn && x.revokedOn >= q.from && x.revokedOn <= q.to)
    .map((x) => ({ stamp: x.stamp, name: x.name, number: x.number, code: x.code, process: x.process, revokedOn: x.revokedOn!, reason: x.revokedReason ?? '' }));

  const flaggedUse: AuditReport['flaggedUse'] = entries
    .filter((e) => e.review)
    .map((e) => ({
      ...who.get(e.welderId)!,
      entryId: e.id,
      process: e.process,
      usedOn: e.usedOn,
      job: e.job,
      shop: e.shop,
      review: e.review === 'reviewed' ? 'reviewed' : 'waiting for review',
      decision: e.decision ? reviewDecisionLabels[e.decision as ReviewDecision] : '',
      note: e.note ?? '',
    }));

  const notices = await db.query<AuditReport['notices']>(
    `SELECT w.stamp, w.name, q.number, q.process, n.threshold, to_char(n.lapses_on, 'YYYY-MM-DD') AS "lapsesOn", d.email AS recipient,
            to_char(d.sent_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI"Z"') AS "sentAt"
       FROM notice_deliveries d JOIN lapse_notices n ON n.id = d.notice_id JOIN qualifications q ON q.id = n.qualification_id
       JOIN welders w ON w.id = q.welder_id
      WHERE n.organization_id = $1 AND q.welder_id = ANY ($2::uuid[]) AND d.status = 'sent'
        AND d.sent_at >= $3::date AND d.sent_at < $4::date + 1
      ORDER BY d.sent_at, w.stamp`,
    params,
  );

  const counts = { current: 0, lapsing: 0, lapsed: 0, revoked: 0 };
  for (const r of register) counts[r.state]++;
  const matrixRows = [...rows.values()]
    .map((r) => ({ ...who.get(r.welderId)!, process: r.process, cells: r.cells.map((c) => matrixMarks.filter((m) => c.has(m))) }))
    .sort((a, b) => a.stamp.localeCompare(b.stamp) || a.process.localeCompare(b.process));
  return {
    company,
    shop,
    from: q.from,
    to: q.to,
    generatedAt: deps.clock.now().toISOString(),
    summary: {
      welders: welders.length,
      qualifications: counts,
      lapses: lapses.size,
      renewals: renewals.size,
      revocations: revocations.length,
      flaggedUse: {
        pending: flaggedUse.filter((f) => f.review !== 'reviewed').length,
        reviewed: flaggedUse.filter((f) => f.review === 'reviewed').length,
      },
      noticesSent: notices.length,
    },
    register,
    matrix: { months: ends.map((e) => e.month), rows: matrixRows },
    lapses: [...lapses.values()].sort(byDate((x) => x.lapsedOn)),
    renewals: [...renewals.values()].sort(byDate((x) => x.renewedOn)),
    revocations,
    flaggedUse,
    notices,
    notice: RANGES_NOTICE,
  };
}
