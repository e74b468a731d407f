// The continuity log (foreman, monthly): the grid of a shop and month, its one-transaction save with the
// continuity state of every touched pair refreshed and each change audited; the review queue of use
// logged while lapsed; and a welder's continuity timeline per process.
import { recordLapseMoves } from '../lapse-watch/lapse-events.js';
import { addMonths, daysBetween, processes, type Process, type ReviewInput } from '@beadroll/rules';
import type { EntityManager } from 'typeorm';
import type { AppDeps } from '../lib/context.js';
import { AppError } from '../lib/errors.js';
import { isUuid, type Actor } from '../lib/scope.js';
import { recordAudit } from '../lib/audit.js';
import { getCompanySettings } from '../settings/settings.repository.js';
import { getWelder } from '../welders/welders.service.js';
import * as repo from './continuity.repository.js';
import { lockPairs, refreshContinuityPairs, storedStates, welderWalk } from './continuity-state.repository.js';
import type { GridSaveInput } from './continuity.schema.js';
import { companyToday } from '../settings/settings.repository.js';
import { recheckWelds } from '../welds/welds.service.js';

const firstDay = (month: string) => `${month}-01`;
/** Today in the company's own time zone (a foreman in Chicago at 19:00 is still in today's month). */
const today = (deps: AppDeps, actor: Actor) => companyToday(deps.dataSource.manager, actor, deps.clock);

function checkShopAccess(actor: Actor, shopId: string): void {
  if (actor.role === 'welder') throw AppError.forbidden();
  if (actor.role === 'foreman' && !actor.shopIds.includes(shopId))
    throw AppError.forbidden('You can log continuity only for the shops you are assigned to');
}

async function shopOf(deps: AppDeps, actor: Actor, shopId: string) {
  const [shop] = await deps.dataSource.manager.query<{ id: string; name: string; code: string }[]>(
    `SELECT id, name, code FROM shops WHERE organization_id = $1 AND id = $2`,
    [actor.organizationId, shopId],
  );
  if (!shop) throw AppError.notFound('shop');
  return shop;
}

/** A month is closed once it is more than `closedMonthAfter` months before the current month. */
function isClosed(month: string, todayIso: string, closedMonthAfter: number): boolean {
  return firstDay(month) < addMonths(`${todayIso.slice(0, 7)}-01`, -closedMonthAfter);
}

export async function getGrid(deps: AppDeps, actor: Actor, q: { shopId: string; month: string }) {
  checkShopAccess(actor, q.shopId);
  const shop = await shopOf(deps, actor, q.shopId);
  const db = deps.dataSource.manager;
  const settings = await getCompanySettings(db, actor.organizationId);
  const raw = await repo.gridRows(db, actor.organizationId, q.shopId, firstDay(q.month));
  const columns = new Set<string>();
  for (const r of raw) {
    r.qualifiedProcesses.forEach((p) => columns.add(p));
    r.entries.forEach((e) => columns.add(e.process));
  }
  const ordered = processes.filter((p) => columns.has(p));
  const todayIso = await today(deps, actor);
  return {
    shop,
    month: q.month,
    closed: isClosed(q.month, todayIso, settings.closedMonthAfter),
    today: todayIso,
    processes: ordered,
    rows: raw.map((r) => ({
      welder: r.welder,
      home: r.home,
      qualifiedProcesses: r.qualifiedProcesses,
      pairs: r.pairs,
      cells: Object.fromEntries(
        ordered.map((p) => {
          const e = r.entries.find((x) => x.process === p);
          return [
            p,
            e
              ? {
                  entryId: e.entryId,
                  usedOn: e.usedOn,
                  jobReference: e.jobReference,
                  note: e.note,
                  flaggedLapsed: e.flaggedLapsed,
                  version: e.version,
                  loggedBy: e.loggedBy,
                  updatedAt: e.updatedAt,
                }
              : null,
          ];
        }),
      ),
    })),
  };
}

export async function addableWelders(deps: AppDeps, actor: Actor, q: { shopId: string; q?: string | undefined }) {
  checkShopAccess(actor, q.shopId);
  await shopOf(deps, actor, q.shopId);
  return { items: await repo.addableWelders(deps.dataSource.manager, actor.organizationId, q.shopId, q.q) };
}

function checkCells(input: GridSaveInput, todayIso: string): void {
  const fields: Record<string, string> = {};
  if (input.month > todayIso.slice(0, 7)) fields.month = 'The month cannot be in the future';
  const seen = new Set<string>();
  input.cells.forEach((c, i) => {
    if (c.usedOn.slice(0, 7) !== input.month) fields[`cells.${i}.usedOn`] = `The date must be within ${input.month}`;
    else if (c.usedOn > todayIso) fields[`cells.${i}.usedOn`] = 'The date cannot be after today';
    const key = `${c.welderId}:${c.process}`;
    if (seen.has(key)) fields[`cells.${i}.process`] = 'This cell appears twice in the save';
    seen.add(key);
  });
  input.remove.forEach((c, i) => {
    if (seen.has(`${c.welderId}:${c.process}`)) fields[`remove.${i}.process`] = 'This cell is both saved and removed';
  });
  if (Object.keys(fields).length) throw AppError.validation(fields);
}

export async function saveGrid(deps: AppDeps, actor: Actor, input: GridSaveInput) {
  checkShopAccess(actor, input.shopId);
  await shopOf(deps, actor, input.shopId);
  const todayIso = await today(deps, actor);
  checkCells(input, todayIso);
  const month = firstDay(input.month);
  await deps.dataSource.transaction(async (db) => {
    const settings = await getCompanySettings(db, actor.organizationId);
    if (actor.role !== 'qa_manager' && isClosed(input.month, todayIso, settings.closedMonthAfter))
      throw AppError.forbidden(
        `${input.month} is closed (older than ${settings.closedMonthAfter} months); ask the QA manager to change it`,
      );
    const welders = await repo.weldersWithProcesses(db, actor.organizationId, [
      ...new Set([...input.cells, ...input.remove].map((c) => c.welderId)),
    ]);
    const fields: Record<string, string> = {};
    input.cells.forEach((c, i) => {
      const held = welders.get(c.welderId);
      if (!held) fields[`cells.${i}.welderId`] = 'Choose a welder of your company';
      else if (!held.has(c.process)) fields[`cells.${i}.process`] = `The welder holds no ${c.process} qualification`;
    });
    input.remove.forEach((c, i) => {
      if (!welders.has(c.welderId)) fields[`remove.${i}.welderId`] = 'Choose a welder of your company';
    });
    if (Object.keys(fields).length) throw AppError.validation(fields);

    const keys = [...input.cells, ...input.remove].map((c) => ({ welderId: c.welderId, process: c.process }));
    // Lock the pairs first (fixed order), so concurrent saves of overlapping cells serialize, not deadlock.
    await lockPairs(db, keys);
    const before = new Map(
      (await repo.lockMonthEntries(db, actor.organizationId, input.shopId, month)).map((e) => [
        `${e.welderId}:${e.process}`,
        e,
      ]),
    );
    await checkVersions(db, actor, input, before);
    const now = deps.clock.now();
    const scope = { organizationId: actor.organizationId, shopId: input.shopId, month };
    const written = await repo.upsertCells(db, { ...scope, loggedBy: actor.id, at: now }, input.cells);
    const removed = await repo.removeCells(db, scope, input.remove);
    await recordLapseMoves(db, await refreshContinuityPairs(db, keys), deps.clock);
    // A removed or re-dated entry may have been what kept a welder in continuity for later welds.
    const moved = [
      ...removed,
      ...written.flatMap((w) => {
        const old = before.get(`${w.welderId}:${w.process}`);
        return old && old.usedOn !== w.usedOn ? [old] : [];
      }),
    ];
    await recheckWelds(
      db,
      actor,
      now,
      moved.map((r) => ({ welderId: r.welderId, process: r.process, from: r.usedOn })),
      'continuity-entry.removed',
    );
    const view = ({ id: _id, welderId: _w, version: _v, ...rest }: repo.EntrySnapshot) => rest;
    // Every change of the save audited, in one statement.
    await repo.insertEntryAudits(db, actor, now, [
      ...written.map((w) => {
        const old = before.get(`${w.welderId}:${w.process}`);
        return {
          action: w.inserted ? 'continuity-entry.created' : 'continuity-entry.updated',
          entityId: w.id,
          before: w.inserted || !old ? null : { ...view(old), shopId: input.shopId, welderId: w.welderId },
          after: { ...view(w), shopId: input.shopId, welderId: w.welderId },
        };
      }),
      ...removed.map((r) => ({
        action: 'continuity-entry.removed',
        entityId: r.id,
        before: { ...view(r), shopId: input.shopId, welderId: r.welderId },
        after: null,
      })),
    ]);
  });
  return getGrid(deps, actor, { shopId: input.shopId, month: input.month });
}

/**
 * Every saved or removed cell must carry the version it was edited from (null: it was empty). A cell
 * someone else changed since is refused as a whole save (409), each stale cell named with its welder,
 * process and whose change it is, so the screen can show the winning value and let the user reapply.
 */
async function checkVersions(
  db: EntityManager,
  actor: Actor,
  input: GridSaveInput,
  before: Map<string, repo.EntrySnapshot>,
): Promise<void> {
  const stale: { path: string; welderId: string; process: string; current: repo.EntrySnapshot | undefined }[] = [];
  input.cells.forEach((c, i) => {
    const current = before.get(`${c.welderId}:${c.process}`);
    if ((current?.version ?? null) !== (c.version ?? null))
      stale.push({ path: `cells.${i}.version`, welderId: c.welderId, process: c.process, current });
  });
  input.remove.forEach((c, i) => {
    const current = before.get(`${c.welderId}:${c.process}`);
    // Removing a cell that is already gone changes nothing: not a conflict.
    if (current && current.version !== (c.version ?? null))
      stale.push({ path: `remove.${i}.version`, welderId: c.welderId, process: c.process, current });
  });
  if (stale.length === 0) return;
  const stamps = new Map(
    (
      await db.query<{ id: string; stamp: string }[]>(
        `SELECT id, stamp FROM welders WHERE organization_id = $1 AND id = ANY($2::uuid[])`,
        [actor.organizationId, [...new Set(stale.map((s) => s.welderId))]],
      )
    ).map((w) => [w.id, w.stamp]),
  );
  const writers = await repo.lastWriters(
    db,
    stale.flatMap((s) => (s.current ? [s.current.id] : [])),
  );
  const fields: Record<string, string> = {};
  for (const s of stale) {
    const who = `${stamps.get(s.welderId) ?? 'The welder'} ${s.process}`;
    const w = s.current ? writers.get(s.current.id) : undefined;
    fields[s.path] = s.current
      ? `${who} was changed by ${w?.name ?? 'someone else'} at ${w?.updatedAt ?? 'an earlier moment'}: now job ${s.current.jobReference} on ${s.current.usedOn}`
      : `${who} was removed by someone else since you opened the month`;
  }
  const names = stale.map((s) => `${stamps.get(s.welderId) ?? 'a welder'} ${s.process}`);
  throw new AppError(
    'conflict',
    `Someone else changed ${names.slice(0, 3).join(', ')}${names.length > 3 ? ` and ${names.length - 3} more` : ''} since you opened the month; nothing was saved. Review their change and reapply yours.`,
    409,
    fields,
  );
}

export async function reviewQueue(deps: AppDeps, actor: Actor) {
  return { items: await repo.pendingReview(deps.dataSource.manager, actor.organizationId) };
}

export async function reviewEntry(deps: AppDeps, actor: Actor, id: string, input: ReviewInput) {
  if (!isUuid(id)) throw AppError.notFound('entry');
  return deps.dataSource.transaction(async (db) => {
    const now = deps.clock.now();
    const row = await repo.markReviewed(db, actor.organizationId, id, { ...input, by: actor.id, at: now });
    if (!row) throw AppError.notFound('entry');
    if (!row.flaggedLapsed) throw AppError.conflict('Only use logged while lapsed waits for review');
    await recordAudit(db, actor, now, {
      action: 'continuity-entry.reviewed',
      entityType: 'continuity-entry',
      entityId: id,
      before: { reviewStatus: 'pending' },
      after: { reviewStatus: 'reviewed', reviewDecision: input.decision, reviewNote: input.note },
    });
    return { id, reviewStatus: 'reviewed' as const, reviewDecision: input.decision, reviewNote: input.note };
  });
}

/** The pair's revocation date: the latest revocation when every qualification in force of it is revoked. */
function pairRevokedOn(
  quals: { process: string; code: string; revokedOn: string | null; superseded: boolean }[],
  process: string,
  code: string,
): string | null {
  const inForce = quals.filter((q) => q.process === process && q.code === code && !q.superseded);
  if (inForce.length === 0 || inForce.some((q) => !q.revokedOn)) return null;
  return inForce.map((q) => q.revokedOn as string).sort().at(-1) ?? null;
}

type EventKind = 'test' | 'use' | 'lapse' | 'renewal' | 'flag' | 'revocation';

/** A welder's continuity per (process, code): tests, logged use, lapses, renewals, flags, revocations. */
export async function welderTimeline(deps: AppDeps, actor: Actor, welderId: string) {
  const welder = await getWelder(deps, actor, welderId);
  const db = deps.dataSource.manager;
  const asOf = await today(deps, actor);
  const settings = await getCompanySettings(db, actor.organizationId);
  const warnDays = Math.max(...settings.warnDays);
  const [walk, states, history] = await Promise.all([
    welderWalk(db, welder.id),
    storedStates(db, { organizationId: actor.organizationId, welderId: welder.id }),
    repo.welderHistory(db, welder.id),
  ]);
  const entries = new Map(history.entries.map((e) => [e.id, e]));
  const welds = new Map(history.welds.map((w) => [w.id, w]));
  return {
    processes: states.map((s) => {
      const events: { date: string; kind: EventKind; detail: string }[] = [];
      for (const r of walk.filter((x) => x.process === s.process && x.code === s.code)) {
        if (r.lapsedOn && r.lapsedOn <= asOf)
          events.push({ date: r.lapsedOn, kind: 'lapse', detail: 'Lapsed: no counted use or test within the window' });
        if (r.kind === 'test') {
          events.push({
            date: r.date,
            kind: 'test',
            detail: r.counted ? 'Passing test coupon' : 'Passing test before the qualification date (not counted)',
          });
          if (r.renewal)
            events.push({ date: r.date, kind: 'renewal', detail: 'Renewed by a passing test after the lapse' });
          continue;
        }
        const e = r.entryId ? entries.get(r.entryId) : undefined;
        const weld = r.entryId && !e ? welds.get(r.entryId) : undefined;
        const where = e
          ? `${e.shop}, job ${e.jobReference}${e.note ? ` (${e.note})` : ''}`
          : weld
            ? `${weld.shop}, job ${weld.jobReference}, weld ${weld.weldNumber} (production weld)`
            : '';
        events.push({
          date: r.date,
          kind: 'use',
          detail: r.entryId
            ? `Used ${s.process}: ${where}`
            : `Passing test coupon under another code or not yet certified: use of ${s.process}, not a test of this qualification`,
        });
        if (!r.counted) {
          const revokedOn = pairRevokedOn(history.qualifications, s.process, s.code);
          events.push({
            date: r.date,
            kind: 'flag',
            detail:
              r.date < s.qualifiedOn
                ? 'Logged before the qualification date: not evidence'
                : revokedOn && r.date >= revokedOn
                  ? `Logged on or after the revocation of ${revokedOn}: not evidence${e?.reviewStatus === 'reviewed' ? ' (reviewed)' : r.entryId ? ', waiting for the QA manager' : ''}`
                  : `Logged while lapsed: not evidence${e?.reviewStatus === 'reviewed' ? ' (reviewed)' : r.entryId ? ', waiting for the QA manager' : ''}`,
          });
        }
      }
      if (s.lapsesOn <= asOf && !events.some((x) => x.kind === 'lapse' && x.date === s.lapsesOn))
        events.push({ date: s.lapsesOn, kind: 'lapse', detail: 'Lapsed: no counted use or test within the window' });
      const quals = history.qualifications.filter((q) => q.process === s.process && q.code === s.code && !q.superseded);
      for (const q of quals)
        if (q.revokedOn) events.push({ date: q.revokedOn, kind: 'revocation', detail: `Revoked: ${q.revokedReason ?? ''}` });
      events.sort((a, b) => (a.date < b.date ? -1 : a.date > b.date ? 1 : 0));
      const allRevoked = quals.length > 0 && quals.every((q) => q.revokedOn && q.revokedOn <= asOf);
      const daysLeft = daysBetween(asOf, s.lapsesOn);
      const state = allRevoked ? 'revoked' : daysLeft <= 0 ? 'lapsed' : daysLeft <= warnDays ? 'lapsing' : 'current';
      return { process: s.process as Process, code: s.code, events, state, lapsesOn: s.lapsesOn };
    }),
  };
}
