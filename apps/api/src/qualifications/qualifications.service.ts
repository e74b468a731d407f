// Certified qualifications (WPQs): certifying a passing coupon with the ranges it qualifies, revoking,
// superseding, their continuity status, and the WPQ record and wallet card PDFs.
import { recheckWelds } from '../welds/welds.service.js';
import { recordLapseMoves } from '../lapse-watch/lapse-events.js';
import type { EntityManager } from 'typeorm';
import type { z } from 'zod';
import {
  couponPerProcess,
  daysBetween,
  qualifiedRanges,
  RULES_VERSION,
  type CertifyInput,
  type Coupon,
  type CouponRecord,
  type Qualification,
  type qualificationListQuery,
  type QualifiedRanges,
  type RevokeInput,
} from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { AppError } from '../lib/errors.js';
import { isUuid, type Actor } from '../lib/scope.js';
import { recordAudit } from '../lib/audit.js';
import { todayIn } from '../lib/dates.js';
import { companyTimeZone, companyToday } from '../settings/settings.repository.js';
import { isUniqueViolation } from '../lib/db-errors.js';
import { getCoupon, lockCouponForCertification, retestSetForCertification } from '../coupons/coupons.service.js';
import { currentVerifyUrl } from '../verify/verify-tokens.service.js';
import { renderWpqPdf } from '../documents/wpq-pdf.js';
import { examinationPartsData, visualFindingLines } from '../documents/examination-parts.js';
import { renderWalletCardPdf } from '../documents/wallet-card-pdf.js';
import { formatDiameterRange, formatThicknessRange } from '../documents/document-format.js';
import type {
  BendSpecimenData,
  WalletCardQualification,
  WpqDocumentData,
} from '../documents/document-data.js';
import { refreshContinuityState } from '../continuity/continuity-state.repository.js';
import * as repo from './qualifications.repository.js';

type ListQuery = z.output<typeof qualificationListQuery>;
type Status = Qualification['status'];

const STALE_COUPON =
  'Someone changed this coupon since you opened it; reload it and check the result before certifying';

/**
 * The continuity status of a qualification as of a day. The one place it is decided, from the pair's
 * maintained state (continuity_states, refreshed in every transaction that can move it): revoked from
 * revokedOn (from memory: QW-322.1(b)); else lapsed when lapsesOn <= asOf; lapsing within the company's
 * largest lead time; else current — the same decision as the rules package's continuityStatus.
 */
export function qualificationStatus(
  q: Pick<
    repo.QualificationRaw,
    'qualifiedOn' | 'revokedOn' | 'stateLapsesOn' | 'stateLastEvidence' | 'warnDays'
  >,
  asOf: string,
): Status {
  // No state row only if the refresh never ran for this pair: lapsed at the test date, the safe answer.
  const pairLapsesOn = q.stateLapsesOn ?? q.qualifiedOn;
  const lapsesOn = q.revokedOn && q.revokedOn < pairLapsesOn ? q.revokedOn : pairLapsesOn;
  const daysLeft = daysBetween(asOf, lapsesOn);
  const state: Status['state'] =
    q.revokedOn && q.revokedOn <= asOf
      ? 'revoked'
      : daysLeft <= 0
        ? 'lapsed'
        : daysLeft <= Number(q.warnDays)
          ? 'lapsing'
          : 'current';
  return { state, lapsesOn, daysLeft, lastEvidence: q.stateLastEvidence ?? q.qualifiedOn };
}

function toQualification(r: repo.QualificationRaw, asOf: string): Qualification {
  return {
    id: r.id,
    number: r.number,
    welder: r.welder,
    couponId: r.couponId,
    code: r.code as Qualification['code'],
    process: r.process as Qualification['process'],
    transferMode: r.transferMode as Qualification['transferMode'],
    progression: r.progression as Qualification['progression'],
    ranges: r.ranges,
    certifiedOn: r.certifiedOn,
    certifiedBy: r.certifiedBy,
    rulesVersion: r.rulesVersion,
    status: qualificationStatus(r, asOf),
    revokedOn: r.revokedOn,
    revokedReason: r.revokedReason,
    supersededById: r.supersededById,
    version: r.version,
  };
}

/** Today in the company's own time zone (Settings). */
const today = (deps: AppDeps, actor: Actor) => companyToday(deps.dataSource.manager, actor, deps.clock);

export async function listQualifications(deps: AppDeps, actor: Actor, q: ListQuery) {
  const superseded = q.state === 'all' ? undefined : q.state === 'superseded';
  const rows = await repo.listQualifications(deps.dataSource.manager, actor, {
    ...(q.welderId ? { welderId: q.welderId } : {}),
    ...(superseded === undefined ? {} : { superseded }),
  });
  const asOf = (await today(deps, actor));
  const items = rows.map((r) => toQualification(r, asOf));
  const state = q.state;
  const byState = state && state !== 'all' && state !== 'superseded';
  return { items: byState ? items.filter((i) => i.status.state === state) : items };
}

async function findRaw(deps: AppDeps, actor: Actor, id: string, db: EntityManager = deps.dataSource.manager) {
  const row = isUuid(id) ? await repo.findQualification(db, actor, id) : null;
  if (!row) throw AppError.notFound('qualification');
  return row;
}

export async function getQualification(deps: AppDeps, actor: Actor, id: string): Promise<Qualification> {
  return toQualification(await findRaw(deps, actor, id), (await today(deps, actor)));
}

export async function certifyCoupon(
  deps: AppDeps,
  actor: Actor,
  couponId: string,
  input: CertifyInput,
): Promise<Qualification> {
  const id = await deps.dataSource
    .transaction(async (db) => {
      const coupon = await lockCouponForCertification(db, actor, couponId);
      if (coupon.qualificationId) throw AppError.conflict('This coupon is already certified');
      if (coupon.version !== input.version) throw AppError.conflict(STALE_COUPON);
      if (coupon.result !== 'accept') throw AppError.conflict('Only a passing coupon can be certified');
      // a certified WPQ names the code's criteria it met; in-house criteria alone never qualify (issue 9)
      if (coupon.criteriaId !== null && coupon.criteriaId !== coupon.code)
        throw AppError.conflict(
          "This coupon was judged by in-house criteria instead of its code's; record it again judged by the code's criteria (in-house criteria can be added to them) before certifying",
        );
      // a retest qualifies only as a whole (QW-321.2: two consecutive coupons, all passing), and once
      const set = await retestSetForCertification(db, { ...coupon, basis: coupon.retestBasis });
      if (set && set.verdict.result !== 'accept')
        throw AppError.conflict(`This coupon is part of a retest that has not passed as a whole: ${set.verdict.message} (${set.verdict.clause})`);
      const certifiedTwin = set?.coupons.find((c) => c.id !== coupon.id && c.qualificationId);
      if (certifiedTwin)
        throw AppError.conflict(
          `This retest is already certified from its coupon of ${certifiedTwin.testedOn}; one retest gives one qualification`,
        );
      const now = deps.clock.now();
      if (input.certifiedOn < coupon.testedOn)
        throw AppError.validation({
          certifiedOn: `Certification cannot be before the test (${coupon.testedOn})`,
        });
      if (input.certifiedOn > todayIn(await companyTimeZone(db, actor.organizationId), now))
        throw AppError.validation({ certifiedOn: 'The certification date cannot be in the future' });

      // A combination coupon qualifies each process with the weld metal it deposited (QW-306): one
      // qualification per process, each with its own ranges, certified together.
      const c = coupon.coupon as Coupon;
      const perProcess = couponPerProcess(c, coupon.layers as Parameters<typeof couponPerProcess>[1]);
      let supersedes: Awaited<ReturnType<typeof repo.lockQualification>> = null;
      if (input.supersedesId) {
        supersedes = await repo.lockQualification(db, actor.organizationId, input.supersedesId);
        const problem = !supersedes
          ? 'No such qualification'
          : supersedes.welderId !== coupon.welderId ||
              supersedes.code !== coupon.code ||
              !perProcess.some((x) => x.process === supersedes!.process)
            ? 'Only a qualification of the same welder, code and process can be superseded'
            : supersedes.supersededById
              ? 'That qualification is already superseded'
              : null;
        if (problem) throw AppError.validation({ supersedesId: problem });
      }

      const certifiedByName = await repo.userName(db, actor.id);
      const ids: Array<{ id: string; process: string }> = [];
      for (const one of perProcess) {
        const ranges: QualifiedRanges = qualifiedRanges(one);
        const replaces = supersedes?.process === one.process ? supersedes : null;
        const qualificationId = await repo.insertQualification(db, {
          organizationId: actor.organizationId,
          welderId: coupon.welderId,
          couponId: coupon.id,
          code: coupon.code,
          process: one.process,
          transferMode: one.transferMode ?? null,
          progression: one.progression ?? null,
          ranges,
          certifiedOn: input.certifiedOn,
          certifiedBy: actor.id,
          certifiedByName,
          rulesVersion: RULES_VERSION,
          supersedesId: replaces?.id ?? null,
          at: now,
        });
        ids.push({ id: qualificationId, process: one.process });
        await recordAudit(db, actor, now, {
          action: 'qualification.certified',
          entityType: 'qualification',
          entityId: qualificationId,
          before: null,
          after: {
            couponId: coupon.id,
            welderId: coupon.welderId,
            code: coupon.code,
            process: one.process,
            certifiedOn: input.certifiedOn,
            certifiedBy: certifiedByName,
            rulesVersion: RULES_VERSION,
            ranges,
            supersedesId: replaces?.id ?? null,
          },
        });
        const moves = await refreshContinuityState(db, coupon.welderId, one.process, coupon.code);
        await recordLapseMoves(db, moves, deps.clock);
        if (replaces) {
          await repo.markSuperseded(db, replaces.id, qualificationId, now);
          await recordAudit(db, actor, now, {
            action: 'qualification.superseded',
            entityType: 'qualification',
            entityId: replaces.id,
            before: { supersededById: null },
            after: { supersededById: qualificationId },
          });
        }
      }
      // the answer is the qualification of the coupon's own process (the others are listed with the welder)
      const qualificationId = (ids.find((x) => x.process === coupon.process) ?? ids[0])!.id;
      return qualificationId;
    })
    .catch((err: unknown) => {
      // Two certifications of one coupon at the same moment: the unique index decides.
      if (isUniqueViolation(err, 'qualifications_coupon_process_key'))
        throw AppError.conflict('This coupon is already certified');
      throw err;
    });
  return getQualification(deps, actor, id);
}

export async function revokeQualification(
  deps: AppDeps,
  actor: Actor,
  id: string,
  input: RevokeInput,
): Promise<Qualification> {
  if (!isUuid(id)) throw AppError.notFound('qualification');
  await deps.dataSource.transaction(async (db) => {
    const q = await repo.lockQualification(db, actor.organizationId, id);
    if (!q) throw AppError.notFound('qualification');
    if (q.revokedOn) throw AppError.conflict(`This qualification was already revoked on ${q.revokedOn}`);
    if (input.revokedOn < q.certifiedOn)
      throw AppError.validation({
        revokedOn: `A qualification cannot be revoked before it was certified (${q.certifiedOn})`,
      });
    const now = deps.clock.now();
    await repo.markRevoked(db, id, {
      revokedOn: input.revokedOn,
      reason: input.reason,
      by: actor.id,
      at: now,
    });
    await recordLapseMoves(db, await refreshContinuityState(db, q.welderId, q.process, q.code), deps.clock);
    // Welds made on or after a back-dated revocation are checked again (and flagged for disposition).
    await recheckWelds(db, actor, now, [{ welderId: q.welderId, process: q.process, from: input.revokedOn }], 'qualification.revoked');
    await recordAudit(db, actor, now, {
      action: 'qualification.revoked',
      entityType: 'qualification',
      entityId: id,
      before: { revokedOn: null, revokedReason: null },
      after: { revokedOn: input.revokedOn, revokedReason: input.reason },
    });
  });
  return getQualification(deps, actor, id);
}

// ---- documents ----------------------------------------------------------------------------------------

function examinationData(c: CouponRecord): WpqDocumentData['examination'] {
  const ex = c.examination;
  const test: WpqDocumentData['examination']['test'] = ex.bend
    ? {
        method: 'bend',
        criteria: c.coupon.code,
        result: ex.bend.specimens.reduce<BendSpecimenData['result']>(
          (worst, s) =>
            s.result === 'reject' || worst === 'reject'
              ? 'reject'
              : s.result === 'replace-specimen'
                ? 'replace-specimen'
                : worst,
          'accept',
        ),
        specimens: ex.bend.specimens.map((s) => ({
          ...(s.label ? { label: s.label } : {}),
          kind: s.kind,
          result: s.result,
          discontinuities: s.discontinuities.map((d) => ({
            sizeText: d.sizeText,
            size: d.size,
            location: d.location,
            ...(d.type ? { type: d.type } : {}),
            fusionRelated: d.fusionRelated,
          })),
          reasons: s.reasons,
        })),
      }
    : undefined;
  const parts = examinationPartsData(c);
  const findings = visualFindingLines(c);
  return {
    visual: { result: c.visual },
    result: c.result,
    ...(test ? { test } : {}),
    ...(parts.length ? { parts } : {}),
    ...(findings.length ? { visualFindings: findings } : {}),
  };
}

export async function wpqPdf(
  deps: AppDeps,
  actor: Actor,
  id: string,
): Promise<{ pdf: Buffer; fileName: string }> {
  const q = await findRaw(deps, actor, id);
  const coupon = await getCoupon(deps, actor, q.couponId);
  const asOf = (await today(deps, actor));
  const status = qualificationStatus(q, asOf);
  const company = await repo.organizationName(deps.dataSource.manager, actor.organizationId);
  const verifyUrl = await currentVerifyUrl(deps, q.welder.id);
  const c = coupon.coupon;
  const data: WpqDocumentData = {
    company: { name: company },
    welder: { name: q.welder.name, stamp: q.welder.stamp },
    qualification: {
      id: q.id,
      number: q.number,
      code: q.code as Coupon['code'],
      process: q.process as Coupon['process'],
      ...(c.transferMode ? { transferMode: c.transferMode } : {}),
      wps: { number: coupon.procedure.number, revision: coupon.procedure.revision },
      certifiedOn: q.certifiedOn,
      certifiedBy: { name: q.certifiedBy.name, title: 'QA Manager' },
    },
    coupon: {
      testedOn: coupon.testedOn,
      shopName: coupon.shop.name,
      form: c.form,
      ...(coupon.pipe ? { nps: coupon.pipe.nps, schedule: coupon.pipe.schedule } : {}),
      ...(c.outsideDiameter ? { outsideDiameter: c.outsideDiameter } : {}),
      thickness: c.thickness,
      weld: c.weld,
      position: c.position,
      ...(c.depositedThickness ? { depositedThickness: c.depositedThickness } : {}),
      ...(c.layers ? { layers: c.layers } : {}),
      backing: c.backing,
      ...(c.fNumber ? { fNumber: c.fNumber } : {}),
      pNumbers: coupon.pNumbers,
      ...(c.progression ? { progression: c.progression } : {}),
      examiner: coupon.examiner,
      labReportNumber: coupon.labReportNumber,
    },
    examination: examinationData(coupon),
    ranges: q.ranges as unknown as QualifiedRanges,
    rulesVersion: q.rulesVersion,
    status: { state: status.state, lapsesOn: status.lapsesOn, asOf },
    ...(verifyUrl ? { verifyUrl } : {}),
  };
  return {
    pdf: await renderWpqPdf(data),
    fileName: `WPQ ${q.welder.stamp} ${q.code} ${q.process} ${q.certifiedOn}.pdf`,
  };
}

/** Positions, thickness and diameter in one line, as the verify page and lists show them. */
export function rangeSummary(ranges: Record<string, unknown>): string {
  const r = ranges as unknown as QualifiedRanges;
  const pos = (p: string[]) => (p.length ? p.join(', ') : 'none');
  return [
    `Groove ${pos(r.positions.groove)}; fillet ${pos(r.positions.fillet)}`,
    formatThicknessRange(r),
    formatDiameterRange(r),
    ...restrictionsOf(r),
  ].join(' · ');
}

/** What the qualification allows only in part, in words an inspector reads (issue 10 item 8). */
export function restrictionsOf(r: QualifiedRanges): string[] {
  return [
    ...(r.backing.length === 1 ? [r.backing[0] === 'with' ? 'with backing only' : 'without backing only'] : []),
    ...(r.progression?.length === 1 ? [`${r.progression[0]} progression only`] : []),
    ...(r.transferModes ? [`${r.transferModes.join(', ')} transfer only`] : []),
    ...(r.withoutFillerOnly ? ['without filler metal only'] : []),
  ];
}

/** The welder's qualifications that belong on a card or a verify page: not superseded, with today's status. */
export async function welderQualificationsToday(deps: AppDeps, actor: Actor, welderId: string) {
  const rows = await repo.listQualifications(deps.dataSource.manager, actor, { welderId, superseded: false });
  const asOf = (await today(deps, actor));
  return rows.map((r) => ({ row: r, status: qualificationStatus(r, asOf) }));
}

export async function walletCardPdf(
  deps: AppDeps,
  actor: Actor,
  welder: { id: string; name: string; stamp: string; homeShop: string },
): Promise<{ pdf: Buffer; fileName: string }> {
  const [left] = await deps.dataSource.manager.query<{ active: boolean }[]>(
    `SELECT active FROM welders WHERE id = $1`,
    [welder.id],
  );
  // A wallet card vouches for the welder today: none for someone who has left.
  if (left && !left.active)
    throw AppError.conflict(`${welder.name} is no longer with the company; no wallet card is issued`);
  const list = await welderQualificationsToday(deps, actor, welder.id);
  const company = await repo.organizationName(deps.dataSource.manager, actor.organizationId);
  const verifyUrl = await currentVerifyUrl(deps, welder.id);
  const qualifications: WalletCardQualification[] = list
    .filter((q) => q.status.state === 'current' || q.status.state === 'lapsing')
    .map(({ row, status }) => {
      const r = row.ranges as unknown as QualifiedRanges;
      return {
        code: row.code as Coupon['code'],
        process: row.process as Coupon['process'],
        positions: r.positions,
        thickness: formatThicknessRange(r),
        diameter: formatDiameterRange(r),
        fNumbers: r.fNumbers,
        lapsesOn: status.lapsesOn,
        state: status.state,
      };
    });
  // A card vouches for what the welder may weld today: none when nothing is current (issue 10 item 8).
  if (qualifications.length === 0)
    throw AppError.conflict(
      `${welder.name} holds no current qualification (every one is lapsed, revoked or superseded, or none is certified); no wallet card is issued`,
    );
  const pdf = await renderWalletCardPdf({
    company: { name: company },
    welder: { name: welder.name, stamp: welder.stamp, homeShop: welder.homeShop },
    issuedOn: (await today(deps, actor)),
    verifyUrl,
    qualifications,
  });
  return { pdf, fileName: `Card ${welder.stamp}.pdf` };
}
