// The production weld log (issue 12): a weld is logged with the welder of each process and its joint, and
// each welder is checked on entry with the qualified-on service (within the qualification's ranges and in
// continuity on the date welded). A weld outside is saved flagged with the reasons and clauses, never
// refused, and waits in the QA manager's review queue for a disposition. Every pass is documented use of
// its process: the welder's continuity is refreshed in the same transaction.
import {
  pipeDimensions,
  RULES_VERSION,
  RulesInputError,
  type Weld,
  type WeldDispositionInput,
  type WeldInput,
  type WeldListQuery,
  type WeldReason,
} from '@beadroll/rules';
import type { EntityManager } from 'typeorm';
import type { AppDeps } from '../lib/context.js';
import { AppError } from '../lib/errors.js';
import { isUuid, type Actor } from '../lib/scope.js';
import { recordAudit } from '../lib/audit.js';
import { isUniqueViolation } from '../lib/db-errors.js';
import { companyToday } from '../settings/settings.repository.js';
import { recordLapseMoves } from '../lapse-watch/lapse-events.js';
import { insertWeldFlagNotices } from '../lapse-watch/lapse-watch.repository.js';
import { lockPairs, refreshContinuityPairs, type PairKey } from '../continuity/continuity-state.repository.js';
import { qualifiedOnInCompany } from '../qualified-on/qualified-on.service.js';
import * as repo from './welds.repository.js';
import { CSV_CONTENT_TYPE } from '../lib/csv.js';
import { jobSummaryCsv, renderJobSummaryPdf, renderWeldPdf } from '../documents/weld-pdf.js';

function checkShopAccess(actor: Actor, shopId: string): void {
  if (actor.role === 'welder') throw AppError.forbidden();
  if (actor.role === 'foreman' && !actor.shopIds.includes(shopId))
    throw AppError.forbidden('You can log welds only for the shops you are assigned to');
}

/** The joint as the check reads it: a pipe given as NPS + schedule gets its outside diameter from the tables. */
function resolveJoint(joint: WeldInput['joint']): WeldInput['joint'] {
  if (joint.form !== 'pipe' || joint.outsideDiameter || !joint.nps || !joint.schedule) return joint;
  try {
    return { ...joint, outsideDiameter: pipeDimensions(joint.nps, joint.schedule).outsideDiameter };
  } catch (err) {
    if (err instanceof RulesInputError)
      throw AppError.validation(
        Object.fromEntries(
          Object.entries(err.fields).map(([k, m]) => [k === 'schedule' ? 'joint.schedule' : 'joint.nps', m]),
        ),
      );
    throw err;
  }
}

/** An accepted radiographed or ultrasonically tested weld is a tested weld (49 CFR 192.229(c), 195.222(b)). */
const isTestedWeld = (e: WeldInput['examination']): boolean =>
  !!e && e.result === 'accepted' && (e.method === 'RT' || e.method === 'UT');

const jointForCheck = (j: WeldInput['joint']) => {
  const { nps: _n, schedule: _s, ...joint } = j;
  return joint;
};

/** The check of one welder and process on the date welded, in the caller's transaction. */
async function checkPass(
  db: EntityManager,
  organizationId: string,
  p: { welderId: string; process: string },
  weldedOn: string,
  joint: WeldInput['joint'],
): Promise<{ qualified: boolean; qualificationId: string | null; reasons: WeldReason[] }> {
  const answer = await qualifiedOnInCompany(db, organizationId, p.welderId, {
    date: weldedOn,
    process: p.process as WeldInput['passes'][number]['process'],
    joint: jointForCheck(joint),
  });
  return {
    qualified: answer.qualified,
    qualificationId: answer.qualificationId,
    reasons: answer.reasons.map((r) => ({ variable: r.variable, clause: r.clause, message: r.message })),
  };
}

async function checkReferences(db: EntityManager, actor: Actor, input: WeldInput, todayIso: string) {
  const fields: Record<string, string> = {};
  if (input.weldedOn > todayIso) fields.weldedOn = 'The date welded cannot be after today';
  const [shop] = await db.query<{ id: string }[]>(`SELECT id FROM shops WHERE organization_id = $1 AND id = $2`, [
    actor.organizationId,
    input.shopId,
  ]);
  if (!shop) fields.shopId = 'Choose a shop of your company';
  if (input.procedureId) {
    const [wps] = await db.query<{ id: string }[]>(
      `SELECT id FROM procedures WHERE organization_id = $1 AND id = $2`,
      [actor.organizationId, input.procedureId],
    );
    if (!wps) fields.procedureId = 'Choose a WPS of your company';
  }
  const welders = await repo.companyWelders(db, actor.organizationId, input.passes.map((p) => p.welderId));
  input.passes.forEach((p, i) => {
    if (!welders.has(p.welderId)) fields[`passes.${i}.welderId`] = 'Choose a welder of your company';
  });
  if (Object.keys(fields).length) throw AppError.validation(fields);
}

const weldNumberTaken = (input: WeldInput) =>
  AppError.validation({ weldNumber: `Weld ${input.weldNumber} is already logged on job ${input.jobReference}` });

export async function createWeld(deps: AppDeps, actor: Actor, input: WeldInput): Promise<Weld> {
  checkShopAccess(actor, input.shopId);
  const joint = resolveJoint(input.joint);
  const todayIso = await companyToday(deps.dataSource.manager, actor, deps.clock);
  const id = await deps.dataSource
    .transaction(async (db) => {
      await checkReferences(db, actor, input, todayIso);
      const keys: PairKey[] = input.passes.map((p) => ({ welderId: p.welderId, process: p.process }));
      // The welders' continuity is read and refreshed under their locks (fixed order), like every writer.
      await lockPairs(db, keys);
      const tested = isTestedWeld(input.examination);
      const passes: repo.PassCheck[] = [];
      for (const p of input.passes)
        passes.push({ ...p, tested, ...(await checkPass(db, actor.organizationId, p, input.weldedOn, joint)) });
      const flagged = passes.some((p) => !p.qualified);
      const now = deps.clock.now();
      const weldId = await repo.insertWeld(db, {
        organizationId: actor.organizationId,
        shopId: input.shopId,
        jobReference: input.jobReference,
        weldNumber: input.weldNumber,
        weldedOn: input.weldedOn,
        procedureId: input.procedureId ?? null,
        joint,
        examination: input.examination ?? null,
        note: input.note,
        flagged,
        rulesVersion: RULES_VERSION,
        loggedBy: actor.id,
        at: now,
      });
      await repo.insertPasses(db, { id: weldId, organizationId: actor.organizationId, weldedOn: input.weldedOn }, passes);
      // Each pass is documented use of its process (a weld made while lapsed is ignored by the walk).
      await recordLapseMoves(db, await refreshContinuityPairs(db, keys), deps.clock);
      await recordAudit(db, actor, now, {
        action: 'weld.created',
        entityType: 'weld',
        entityId: weldId,
        before: null,
        after: {
          shopId: input.shopId,
          jobReference: input.jobReference,
          weldNumber: input.weldNumber,
          weldedOn: input.weldedOn,
          procedureId: input.procedureId ?? null,
          joint,
          examination: input.examination ?? null,
          passes: passes.map((p) => ({ welderId: p.welderId, process: p.process, layer: p.layer, qualified: p.qualified, reasons: p.reasons })),
          flagged,
          rulesVersion: RULES_VERSION,
        },
      });
      return weldId;
    })
    .catch((err: unknown) => {
      if (isUniqueViolation(err, 'welds_job_number_key')) throw weldNumberTaken(input);
      throw err;
    });
  return getWeld(deps, actor, id);
}

export async function listWelds(deps: AppDeps, actor: Actor, q: WeldListQuery) {
  if (actor.role === 'welder') throw AppError.forbidden();
  return repo.listWelds(deps.dataSource.manager, actor, q);
}

/** Welders who may be named on a weld of the shop, with what the form checks live. */
export async function weldWelders(deps: AppDeps, actor: Actor, q: { shopId: string; q?: string | undefined }) {
  checkShopAccess(actor, q.shopId);
  return { items: await repo.weldWelders(deps.dataSource.manager, actor.organizationId, q.q) };
}

export async function getWeld(deps: AppDeps, actor: Actor, id: string): Promise<Weld> {
  if (actor.role === 'welder') throw AppError.forbidden();
  const weld = isUuid(id) ? await repo.findWeld(deps.dataSource.manager, actor, id) : null;
  if (!weld) throw AppError.notFound('weld');
  return weld;
}

/**
 * The weld with the proof behind each welder's check: the qualified-on answer of each pass, read now (the
 * weld is in the caller's scope, so its welders' proof is read without the welder scope: a foreman's weld
 * may be made by a welder of another home shop).
 */
export async function getWeldWithProof(deps: AppDeps, actor: Actor, id: string) {
  const weld = await getWeld(deps, actor, id);
  const joint = jointForCheck(weld.joint);
  const proof = [];
  for (const p of weld.passes)
    proof.push({
      passId: p.id,
      answer: await qualifiedOnInCompany(deps.dataSource.manager, actor.organizationId, p.welder.id, {
        date: weld.weldedOn,
        process: p.process as WeldInput['passes'][number]['process'],
        joint,
      }),
    });
  return { ...weld, proof };
}

export async function disposeWeld(deps: AppDeps, actor: Actor, id: string, input: WeldDispositionInput) {
  if (!isUuid(id)) throw AppError.notFound('weld');
  await deps.dataSource.transaction(async (db) => {
    const row = await repo.lockWeld(db, actor.organizationId, id);
    if (!row) throw AppError.notFound('weld');
    if (!row.flagged) throw AppError.conflict('Only a flagged weld takes a disposition');
    if (row.reviewStatus !== 'pending') throw AppError.conflict('This weld already has a disposition');
    const now = deps.clock.now();
    await repo.setDisposition(db, id, { ...input, by: actor.id, at: now });
    await recordAudit(db, actor, now, {
      action: 'weld.dispositioned',
      entityType: 'weld',
      entityId: id,
      before: { reviewStatus: 'pending', disposition: null },
      after: { reviewStatus: 'dispositioned', disposition: input.decision, reason: input.reason },
    });
  });
  return getWeld(deps, actor, id);
}

/**
 * Re-checks the passes of the given welders and processes from a date on (a back-dated revocation, a
 * deleted continuity entry), in the caller's transaction, after their continuity was refreshed. Welds that
 * become flagged wait for a disposition again; each changed weld is audited. Returns the welds newly flagged.
 */
export async function recheckWelds(
  db: EntityManager,
  actor: Actor,
  at: Date,
  keys: { welderId: string; process: string; from: string }[],
  cause: string,
): Promise<string[]> {
  const passes = await repo.passesToRecheck(db, actor.organizationId, keys);
  const changed = new Set<string>();
  for (const p of passes) {
    const check = await checkPass(db, actor.organizationId, p, p.weldedOn, p.joint as WeldInput['joint']);
    if (
      check.qualified !== p.qualified ||
      check.qualificationId !== p.qualificationId ||
      JSON.stringify(check.reasons) !== JSON.stringify(p.reasons)
    ) {
      await repo.updatePassCheck(db, p.passId, check);
      changed.add(p.weldId);
    }
  }
  const flips = await repo.reflagWelds(db, [...changed], { at, rulesVersion: RULES_VERSION });
  for (const f of flips)
    await recordAudit(db, actor, at, {
      action: f.flagged ? 'weld.flagged-on-recheck' : 'weld.cleared-on-recheck',
      entityType: 'weld',
      entityId: f.id,
      before: { flagged: !f.flagged },
      after: { flagged: f.flagged, cause },
    });
  const flagged = flips.filter((f) => f.flagged).map((f) => f.id);
  // Raised in the lapse-watch digest too, committed with the re-check (issue 12, "Re-checking").
  await insertWeldFlagNotices(db, actor.organizationId, flagged, at, cause);
  return flagged;
}

async function companyName(deps: AppDeps, actor: Actor): Promise<string> {
  const [row] = await deps.dataSource.manager.query<{ name: string }[]>(`SELECT name FROM organizations WHERE id = $1`, [
    actor.organizationId,
  ]);
  return row?.name ?? '';
}

/** The weld page as a PDF: the weld, each welder's check and the proof of it. */
export async function weldPdf(deps: AppDeps, actor: Actor, id: string): Promise<{ pdf: Buffer; fileName: string }> {
  const weld = await getWeldWithProof(deps, actor, id);
  const pdf = await renderWeldPdf({
    company: { name: await companyName(deps, actor) },
    weld,
    proof: new Map(weld.proof.map((p) => [p.passId, p.answer])),
    printedOn: await companyToday(deps.dataSource.manager, actor, deps.clock),
  });
  return { pdf, fileName: `weld-${weld.jobReference}-${weld.weldNumber}.pdf` };
}

/** Every weld of a job (in the caller's scope) with its welders and check, as CSV or PDF. */
export async function jobSummary(
  deps: AppDeps,
  actor: Actor,
  q: { job: string },
  format: 'csv' | 'pdf',
): Promise<{ body: Buffer; fileName: string; type: string }> {
  if (actor.role === 'welder') throw AppError.forbidden();
  const welds: Weld[] = [];
  for (let page = 1; ; page++) {
    const p = await repo.listWelds(deps.dataSource.manager, actor, { job: q.job, page });
    welds.push(...p.items);
    if (welds.length >= p.total || p.items.length === 0) break;
  }
  if (welds.length === 0) throw AppError.notFound('job');
  const data = {
    company: { name: await companyName(deps, actor) },
    job: q.job,
    welds,
    printedOn: await companyToday(deps.dataSource.manager, actor, deps.clock),
    rulesVersion: RULES_VERSION,
  };
  const safe = q.job.replace(/[^A-Za-z0-9._-]+/g, '_');
  return format === 'csv'
    ? { body: Buffer.from(jobSummaryCsv(data), 'utf8'), fileName: `job-${safe}-welds.csv`, type: CSV_CONTENT_TYPE }
    : { body: await renderJobSummaryPdf(data), fileName: `job-${safe}-welds.pdf`, type: 'application/pdf' };
}
