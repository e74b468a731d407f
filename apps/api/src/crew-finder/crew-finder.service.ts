// The foreman's question: who may weld this joint from today through the last day of the range, and who
// nearly may. A welder is on the crew when a qualification of theirs (not superseded) has the joint within
// its ranges (jointWithin, every position the joint is welded in) and stays in force through the last day
// by the maintained continuity state (lapses_on after it, no revocation by then) — exactly when
// qualified-on answers yes both today and on that day. Sorted by who stays qualified longest; one page
// of each list is returned (limit/offset, nearLimit/nearOffset) with the exact totals. A near miss
// is a welder kept off by one reason: a lapse inside the range, one variable out of range (with its
// clause), a lapse already passed (a renewal test brings it back), or a revocation.
import {
  addDays,
  codeNames,
  CREW_PAGE_DEFAULT,
  lapseRules,
  RULES_VERSION,
  type CodeId,
  type CrewFinderAnswer,
  type CrewFinderInput,
  type JointReason,
  type NearMiss,
  type QualifiedRanges,
} from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { AppError } from '../lib/errors.js';
import type { Actor } from '../lib/scope.js';
import { companyToday } from '../settings/settings.repository.js';
import { describeJoint, jointAgainst, QUALIFIED_ON_NOTICE, revocationClause } from '../qualified-on/qualified-on.service.js';
import * as repo from './crew-finder.repository.js';

/** The furthest a range may reach: a year ahead. */
const MAX_DAYS_AHEAD = 366;

// Ranges by their key (the hash of their content: an entry can never be stale), so a warm finder reads
// only keys from the database. Bounded; cleared whole when full (the keys of a company are few).
const rangesCache = new Map<string, QualifiedRanges>();
const RANGES_CACHE_MAX = 50_000;

async function rangesByKey(deps: AppDeps, organizationId: string, process: string): Promise<Map<string, QualifiedRanges>> {
  const db = deps.dataSource.manager;
  const keys = await repo.distinctRangeKeys(db, organizationId, process);
  const missing = keys.filter((k) => !rangesCache.has(k));
  if (rangesCache.size + missing.length > RANGES_CACHE_MAX) rangesCache.clear();
  for (const r of await repo.rangesOf(db, organizationId, process, missing)) rangesCache.set(r.key, r.ranges);
  return new Map(keys.flatMap((k) => (rangesCache.has(k) ? [[k, rangesCache.get(k) as QualifiedRanges] as const] : [])));
}

async function shopsOf(deps: AppDeps, actor: Actor, shopId: string | undefined): Promise<string[] | null> {
  if (shopId) {
    const [shop] = await deps.dataSource.manager.query<{ id: string }[]>(
      `SELECT id FROM shops WHERE organization_id = $1 AND id = $2`,
      [actor.organizationId, shopId],
    );
    if (!shop || (actor.role !== 'qa_manager' && !actor.shopIds.includes(shopId))) throw AppError.notFound('shop');
    return [shopId];
  }
  return actor.role === 'qa_manager' ? null : actor.shopIds;
}

export async function findCrew(deps: AppDeps, actor: Actor, input: CrewFinderInput): Promise<CrewFinderAnswer> {
  const today = await companyToday(deps.dataSource.manager, actor, deps.clock);
  const through = input.through ?? today;
  if (through < today) throw AppError.validation({ through: `The range ends before today (${today})` });
  if (through > addDays(today, MAX_DAYS_AHEAD))
    throw AppError.validation({ through: 'The range reaches at most a year ahead' });
  const shopIds = await shopsOf(deps, actor, input.shopId);

  // Each distinct set of ranges judged once: fits, or misses by exactly one variable (with its reason).
  const fitting: string[] = [];
  const oneOff = new Map<string, JointReason>();
  for (const [key, ranges] of await rangesByKey(deps, actor.organizationId, input.process)) {
    if (input.code && ranges.code !== input.code) continue;
    const { within, reasons } = jointAgainst(ranges, input);
    if (within) fitting.push(key);
    else if (new Set(reasons.map((r) => r.variable)).size === 1 && reasons[0]) oneOff.set(key, reasons[0]);
  }
  const page = {
    limit: input.limit ?? CREW_PAGE_DEFAULT,
    offset: input.offset ?? 0,
    nearLimit: input.nearLimit ?? CREW_PAGE_DEFAULT,
    nearOffset: input.nearOffset ?? 0,
  };
  const rows = await repo.crewRows(deps.dataSource.manager, {
    organizationId: actor.organizationId,
    process: input.process,
    code: input.code ?? null,
    shopIds,
    today,
    through,
    fitting,
    oneOff: [...oneOff.keys()],
    crewLimit: page.limit,
    crewOffset: page.offset,
    nearLimit: page.nearLimit,
    nearOffset: page.nearOffset,
  });
  const qualificationOf = (r: repo.CrewRow) => ({
    ...r.qualification,
    codeName: codeNames[r.qualification.code as CodeId] ?? r.qualification.code,
  });
  return {
    asked: {
      process: input.process,
      code: input.code ?? null,
      shopId: input.shopId ?? null,
      from: today,
      through,
      joint: input.joint,
      positions: input.positions,
      description: describeJoint(input),
    },
    crew: {
      total: rows.crewTotal,
      offset: page.offset,
      limit: page.limit,
      items: rows.crew.map((r) => ({
        welder: r.welder,
        qualification: qualificationOf(r),
        lapsesOn: r.lapsesOn,
        lastEvidence: r.lastEvidence,
      })),
    },
    nearMisses: {
      total: rows.nearTotal,
      offset: page.nearOffset,
      limit: page.nearLimit,
      items: rows.near.map((r) => nearMiss(r, qualificationOf(r), oneOff, input.process, today, through)),
    },
    rulesVersion: RULES_VERSION,
    notice: QUALIFIED_ON_NOTICE,
  };
}

function nearMiss(
  r: repo.CrewRow,
  qualification: NearMiss['qualification'],
  oneOff: Map<string, JointReason>,
  process: string,
  today: string,
  through: string,
): NearMiss {
  const base = { welder: r.welder, qualification, lapsesOn: r.lapsesOn };
  const rule = lapseRules[r.qualification.code as CodeId];
  switch (r.klass) {
    case repo.CLASS.outOfRange:
      return { ...base, kind: 'out-of-range', reason: oneOff.get(r.key) as JointReason };
    case repo.CLASS.lapsesInRange:
      return {
        ...base,
        kind: 'lapses-in-range',
        reason: {
          variable: 'lapsed',
          clause: rule?.clause ?? r.qualification.code,
          message: `Lapses on ${r.lapsesOn}, before ${through} is over, unless ${process} use is logged first (last logged ${r.lastEvidence}).`,
        },
      };
    case repo.CLASS.lapsed:
      return {
        ...base,
        kind: 'lapsed',
        reason: {
          variable: 'lapsed',
          clause: rule?.clause ?? r.qualification.code,
          message: `Lapsed on ${r.lapsesOn} (last counted use ${r.lastEvidence}); a renewal test brings it back, logged use does not.`,
        },
      };
    default:
      return {
        ...base,
        kind: 'revoked',
        reason: {
          variable: 'revoked',
          clause: revocationClause(r.qualification.code),
          message: `Revoked ${r.revokedOn && r.revokedOn > today ? 'from' : 'on'} ${r.revokedOn}${r.revokedReason ? `: ${r.revokedReason}` : ''}.`,
        },
      };
  }
}
