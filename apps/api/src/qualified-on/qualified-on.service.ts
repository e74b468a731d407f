// "Was this welder qualified for this joint on that day?" — the auditor's question, the check of every
// production weld on entry, and (for today and a later day) the crew finder's. For each qualification of
// the welder for the process: the joint within its ranges (the rules' jointWithin, each refusal with its
// clause) AND in force on that day — tested by then, not superseded by a newer test by then, not revoked
// by then, and not lapsed as of that day, judged by the continuity walk cut at the day (evidence known on
// that day only; a pair that lapsed and was renewed since reads lapsed inside the gap, and use logged after
// the lapse revives nothing). The answer carries the proof chain the auditor reads.
import type { EntityManager } from 'typeorm';
import {
  codeNames,
  formatLength,
  jointWithin,
  lapseRules,
  qualifiedOnInputSchema,
  RULES_VERSION,
  weldingPositionNames,
  type CodeId,
  type JointReason,
  type ProofEvidence,
  type ProofQualification,
  type QualifiedOnAnswer,
  type QualifiedOnInput,
  type QualifiedOnReason,
  type QualifiedRanges,
  type WeldingPosition,
} from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { AppError } from '../lib/errors.js';
import { isUuid, scopeWelders, type Actor } from '../lib/scope.js';
import * as repo from './qualified-on.repository.js';

export const QUALIFIED_ON_NOTICE =
  'Computed from Beadroll’s records as they stand now, for the day asked. It supports, and does not replace, the code edition in force, the company’s quality manual and the judgment of the responsible inspector; each limit names its clause.';

type Parsed = ReturnType<typeof qualifiedOnInputSchema.parse>;

/** The clause behind a revocation for cause (from memory: QW-322.1(b) for ASME IX). */
export const revocationClause = (code: string) =>
  code === 'asme-ix' ? 'QW-322.1(b)' : `${codeNames[code as CodeId] ?? code}: revocation for cause`;

/** The joint against one qualification's ranges, in every position it is welded in; reasons once each. */
export function jointAgainst(ranges: QualifiedRanges, q: Pick<Parsed, 'joint' | 'positions'>): { within: boolean; reasons: JointReason[] } {
  if (!ranges || typeof ranges !== 'object' || !('positions' in ranges))
    return {
      within: false,
      reasons: [{ variable: 'qualification', clause: 'WPQ', message: 'The qualified ranges of this WPQ are not on record.' }],
    };
  const positions: WeldingPosition[] = q.positions?.length ? q.positions : [q.joint.position];
  const seen = new Set<string>();
  const reasons: JointReason[] = [];
  for (const position of positions)
    for (const r of jointWithin(ranges, { ...q.joint, position }).reasons) {
      const key = `${r.variable}\u0000${r.message}`;
      if (!seen.has(key)) {
        seen.add(key);
        reasons.push(r);
      }
    }
  return { within: reasons.length === 0, reasons };
}

/** "SMAW, 6.625 in OD pipe, groove, 0.432 in, positions F, H, V, O, without backing, F-No. 4". */
export function describeJoint(q: Pick<Parsed, 'process' | 'joint' | 'positions'>): string {
  const j = q.joint;
  const positions = q.positions?.length ? q.positions : [j.position];
  return [
    q.process,
    j.form === 'pipe' && j.outsideDiameter ? `pipe ${formatLength(j.outsideDiameter)} OD` : j.form,
    `${j.weld} weld`,
    `${formatLength(j.thickness)} ${j.weld === 'fillet' ? 'base metal' : 'weld metal'}`,
    `${positions.length > 1 ? 'positions' : 'position'} ${positions.map((p) => `${p} (${weldingPositionNames[p]})`).join(', ')}`,
    j.weld === 'groove' ? (j.backing ? 'with backing' : 'without backing') : null,
    j.withoutFiller ? 'without filler metal' : j.fNumber !== undefined ? `F-No. ${j.fNumber}` : null,
    j.progression ? `${j.progression}` : null,
    j.transferMode ? `${j.transferMode} transfer` : null,
  ]
    .filter(Boolean)
    .join(', ');
}

function examinationWords(q: repo.ProofQualificationRow): string {
  const ex = q.examination ?? {};
  const parts: string[] = [`visual ${q.visual === 'accept' ? 'accepted' : q.visual}`];
  if ('bend' in ex && ex.bend) parts.push('guided bend tests');
  if ('radiography' in ex && ex.radiography) parts.push('radiography');
  if ('ultrasonic' in ex && ex.ultrasonic) parts.push('ultrasonic examination');
  for (const k of Object.keys(ex))
    if (!['bend', 'radiography', 'ultrasonic'].includes(k) && ex[k]) parts.push(k.replace(/([A-Z])/g, ' $1').toLowerCase());
  return `${parts.join(', ')}; result ${q.result === 'accept' ? 'accepted' : q.result}`;
}

function evidenceRows(
  q: repo.ProofQualificationRow,
  pair: repo.PairAsOf | undefined,
  walk: repo.WalkRowAsOf[],
  entries: Map<string, repo.EntryDetail>,
  coupons: repo.CouponOnDay[],
): ProofEvidence[] {
  if (!pair) return [];
  // The chain that decides the day: from the latest counted test on or before it, every row after.
  return walk
    .filter((w) => w.code === q.code && w.date >= pair.lastTest)
    .map((w) => {
      const e = w.entryId ? entries.get(w.entryId) : undefined;
      const c = e
        ? undefined
        : coupons.find((x) =>
            x.testedOn === w.date && (w.kind === 'test' ? x.code === q.code && x.certified : !(x.code === q.code && x.certified)),
          );
      const note = !w.counted
        ? w.outside
          ? w.date < pair.qualifiedOn
            ? 'Before the qualification date: not evidence.'
            : 'On or after the revocation: not evidence.'
          : 'Logged after the lapse date: not evidence; only a renewal test brings the qualification back.'
        : w.renewal
          ? 'Renewal test after a lapse: the qualification is back in force from this day.'
          : w.kind === 'test'
            ? 'Passing, certified test coupon under this code.'
            : c
              ? 'Passing coupon under another code or not certified: use of the process.'
              : e
                ? e.source === 'weld'
                  ? 'Production weld: use of the process.'
                  : 'Logged use of the process.'
                : 'Documented use of the process.';
      return {
        date: w.date,
        kind: w.kind,
        source: e ? (e.source === 'weld' ? 'weld-log' : 'continuity-log') : c ? 'coupon' : 'other',
        counted: w.counted,
        renewal: w.renewal,
        note,
        entryId: w.entryId,
        couponId: c?.id ?? null,
        weldId: e?.weldId ?? null,
        weldNumber: e?.weldNumber ?? null,
        job: e?.job ?? null,
        shop: e?.shop ?? c?.shop ?? null,
        loggedBy: e ? e.loggedBy : (c?.recordedBy ?? null),
        loggedAt: e ? e.loggedAt : (c?.recordedAt ?? null),
        flagged: e?.flagged ?? false,
        reviewStatus: e?.reviewStatus ?? null,
      } satisfies ProofEvidence;
    });
}

type Standing = ProofQualification['continuity']['state'];

function standingOf(
  q: repo.ProofQualificationRow,
  pair: repo.PairAsOf | undefined,
  date: string,
): { state: Standing; reason: JointReason | null; lapsesOn: string | null } {
  const rule = lapseRules[q.code as CodeId];
  const pairLapse = pair?.lapsesOn ?? q.testedOn;
  const lapsesOn = q.revokedOn && q.revokedOn < pairLapse ? q.revokedOn : pairLapse;
  if (q.testedOn > date)
    return {
      state: 'not-yet-qualified',
      lapsesOn: null,
      reason: {
        variable: 'not-yet-qualified',
        clause: `WPQ ${q.number}`,
        message: `WPQ ${q.number} comes from a test on ${q.testedOn}, after ${date}.`,
      },
    };
  if (q.supersededById && q.supersededByTestedOn && q.supersededByTestedOn <= date)
    return {
      state: 'superseded',
      lapsesOn,
      reason: {
        variable: 'superseded',
        clause: `WPQ ${q.supersededByNumber ?? ''}`.trim(),
        message: `WPQ ${q.number} was replaced by WPQ ${q.supersededByNumber} (tested ${q.supersededByTestedOn}) before ${date}.`,
      },
    };
  if (q.revokedOn && q.revokedOn <= date)
    return {
      state: 'revoked',
      lapsesOn,
      reason: {
        variable: 'revoked',
        clause: revocationClause(q.code),
        message: `WPQ ${q.number} was revoked on ${q.revokedOn}${q.revokedReason ? `: ${q.revokedReason}` : ''}.`,
      },
    };
  if (!pair || pair.lapsesOn <= date)
    return {
      state: 'lapsed',
      lapsesOn,
      reason: {
        variable: 'lapsed',
        clause: rule?.clause ?? q.code,
        message: `Lapsed on ${pair?.lapsesOn ?? q.testedOn}: no counted use of ${q.process} after ${pair?.lastEvidence ?? q.testedOn} within the window (${rule?.text ?? ''}). Use logged after a lapse does not renew it; only a renewal test does.`.replace(' ()', ''),
      },
    };
  return { state: 'in-force', reason: null, lapsesOn };
}

/** No scoping: the caller has scoped the welder (e.g. a weld check inside its own transaction). */
export async function qualifiedOnInCompany(
  db: EntityManager,
  organizationId: string,
  welderId: string,
  input: QualifiedOnInput,
  now: Date = new Date(),
): Promise<QualifiedOnAnswer> {
  const q = qualifiedOnInputSchema.parse(input);
  const welder = isUuid(welderId) ? await repo.findWelderInCompany(db, organizationId, welderId) : null;
  if (!welder) throw AppError.notFound('welder');
  const quals = await repo.qualificationsOf(db, organizationId, welderId, q.process, q.code);
  const { pairs, rows } = quals.length ? await repo.walkAsOf(db, welderId, q.process, q.date) : { pairs: [], rows: [] };
  const entryIds = [...new Set(rows.flatMap((r) => (r.entryId ? [r.entryId] : [])))];
  const [entries, coupons] = quals.length
    ? await Promise.all([repo.entryDetails(db, entryIds), repo.passingCoupons(db, welderId, q.process, q.date)])
    : [[], []];
  const entryMap = new Map(entries.map((e) => [e.id, e]));

  const proofs: ProofQualification[] = quals.map((row) => {
    const pair = pairs.find((p) => p.code === row.code);
    const ranges = row.ranges as unknown as QualifiedRanges;
    const joint = jointAgainst(ranges, q);
    const standing = standingOf(row, pair, q.date);
    const reasons = [...(standing.reason ? [standing.reason] : []), ...joint.reasons];
    const rule = lapseRules[row.code as CodeId];
    return {
      id: row.id,
      number: row.number,
      code: row.code,
      codeName: codeNames[row.code as CodeId] ?? row.code,
      process: row.process,
      certifiedOn: row.certifiedOn,
      certifiedBy: row.certifiedBy,
      rulesVersion: row.rulesVersion,
      coupon: {
        id: row.couponId,
        testedOn: row.testedOn,
        wps: row.wps,
        shop: row.couponShop,
        testPosition: row.testPosition,
        result: row.result,
        visual: row.visual,
        examination: examinationWords(row),
        labReportNumber: row.labReportNumber,
      },
      limits: Array.isArray(ranges?.limits)
        ? ranges.limits.map((l) => ({ variable: l.variable, clause: l.clause, text: l.text, source: String(l.source) }))
        : [],
      joint,
      continuity: {
        inForce: standing.state === 'in-force',
        state: standing.state,
        qualifiedOn: pair?.qualifiedOn ?? row.testedOn,
        lastEvidence: pair && standing.state !== 'not-yet-qualified' ? pair.lastEvidence : null,
        lastTest: pair && standing.state !== 'not-yet-qualified' ? pair.lastTest : null,
        lapsesOn: standing.lapsesOn,
        renewedOn: pair?.renewedOn ?? null,
        clause: rule?.clause ?? row.code,
        rule: rule?.wording ?? '',
        evidence: standing.state === 'not-yet-qualified' ? [] : evidenceRows(row, pair, rows, entryMap, coupons),
      },
      revocation: row.revokedOn ? { revokedOn: row.revokedOn, reason: row.revokedReason ?? '', by: row.revokedBy } : null,
      supersededBy:
        row.supersededById && row.supersededByNumber && row.supersededByTestedOn
          ? { id: row.supersededById, number: row.supersededByNumber, testedOn: row.supersededByTestedOn }
          : null,
      qualified: reasons.length === 0,
      reasons,
    };
  });

  // The qualification that allows the joint and stays in force longest; else the closest one.
  const allowing = proofs
    .filter((p) => p.qualified)
    .sort((a, b) => ((b.continuity.lapsesOn ?? '') > (a.continuity.lapsesOn ?? '') ? 1 : -1))[0];
  const current = proofs.filter((p) => p.continuity.state !== 'superseded');
  const considered = current.length ? current : proofs;
  const closest = [...considered].sort((a, b) => a.reasons.length - b.reasons.length)[0];
  const reasons: QualifiedOnReason[] = allowing
    ? []
    : considered.length
      ? considered.flatMap((p) => p.reasons.map((r) => ({ ...r, qualificationId: p.id })))
      : [
          {
            variable: 'qualification',
            clause: q.code ? codeNames[q.code] : 'WPQ',
            message: `${welder.stamp} holds no ${q.process} qualification${q.code ? ` under ${codeNames[q.code]}` : ''} on record.`,
            qualificationId: null,
          },
        ];
  return {
    qualified: Boolean(allowing),
    qualificationId: allowing?.id ?? closest?.id ?? null,
    reasons,
    evidence: {
      welder,
      asked: {
        date: q.date,
        process: q.process,
        code: q.code ?? null,
        joint: q.joint,
        positions: q.positions?.length ? q.positions : [q.joint.position],
        description: describeJoint(q),
      },
      qualifications: proofs,
      answeredAt: now.toISOString(),
    },
    rulesVersion: RULES_VERSION,
    notice: QUALIFIED_ON_NOTICE,
  };
}

/** Scoped like every read: 404 'welder' when the welder is not the actor's to see. */
export async function qualifiedOn(
  deps: AppDeps,
  actor: Actor,
  welderId: string,
  input: QualifiedOnInput,
  db: EntityManager = deps.dataSource.manager,
): Promise<QualifiedOnAnswer> {
  await assertWelderInScope(db, actor, welderId);
  return qualifiedOnInCompany(db, actor.organizationId, welderId, input, deps.clock.now());
}

/** 404 'welder' unless the actor may see the welder (the one scoping rule of lib/scope). */
export async function assertWelderInScope(db: EntityManager, actor: Actor, welderId: string): Promise<void> {
  if (!isUuid(welderId)) throw AppError.notFound('welder');
  const qb = db.createQueryBuilder().select('w.id', 'id').from('welders', 'w').where('w.id = :welderId', { welderId });
  if (!(await scopeWelders(qb, 'w', actor).getRawOne())) throw AppError.notFound('welder');
}
