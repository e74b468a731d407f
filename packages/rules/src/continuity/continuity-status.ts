// Continuity of one qualification (one welder, one process) as of a given day, under a periodic
// requalification profile (TRADE.md §6, continuity/profiles.ts). Evidence in date order keeps the
// qualification in force while it comes before lapsesOn; once lapsed, documented use and tested welds do
// not revive it (those dates go to `ignored`, for review) and only a passing test renews it (from memory:
// QW-322.2(a)). Revocation wins from its date on (from memory: QW-322.1(b)). Without a profile the code's
// own rule applies exactly as before profiles existed (lapse-rules.ts; the API's SQL reproduces it).
import { type z } from 'zod';
import {
  CONSERVATIVE_CFR_MONTH_COUNTING,
  continuityInputSchema,
  DEFAULT_CFR_MONTH_COUNTING,
  MAX_EVIDENCE,
  type CfrMonthCounting,
  type ContinuityEvidence,
  type ContinuityInput,
  type ContinuityProfileId,
  type EvidenceKind,
} from '../schemas/continuity.js';
import { parseInput } from '../validation/parse-input.js';
import { RulesInputError } from '../validation/rules-input-error.js';
import {
  addDays,
  addMonths,
  daysBetween,
  firstOfMonthAfter,
  firstOfYear,
  isIsoDate,
  minDate,
  yearOf,
  type IsoDate,
} from './calendar.js';
import {
  continuityProfiles,
  profileOfCode,
  type ContinuityCheck,
  type ContinuityPeriod,
  type ContinuityProfile,
} from './profiles.js';
import { codeNames, profileNames } from '../names/display-names.js';

export type ContinuityState = 'current' | 'lapsing' | 'lapsed' | 'revoked';

/** One requirement of the profile as of asOf: the check that keeps it longest, and until when. */
export type ContinuityRequirementStatus = {
  check: string;
  clause: string;
  source: string;
  text: string;
  /** First day this requirement is no longer met (lapsesOn is the earliest of these, and revocation). */
  lapsesOn: IsoDate;
};

export type ContinuityStatus = {
  state: ContinuityState;
  /** The latest evidence that counted (the qualification date when none did). */
  lastEvidence: IsoDate;
  /** The latest passing test that counted (the qualification test, or a renewal). */
  lastTest: IsoDate;
  /** The latest tested weld that counted, or null. */
  lastTestedWeld: IsoDate | null;
  /** First day on which the welder may no longer weld with the process. */
  lapsesOn: IsoDate;
  /** From asOf to lapsesOn (0 or less once lapsed). */
  daysLeft: number;
  /** Evidence dates that could not count: before the qualification, use after a lapse, on or after revocation. */
  ignored: IsoDate[];
  /** Renewal tests that brought the qualification back after a lapse. */
  renewedOn: IsoDate[];
  /** The profile applied (the code's own rule when none was given). */
  profile: ContinuityProfileId;
  /** How the CFR's calendar months were counted. */
  monthCounting: CfrMonthCounting;
  requirements: ContinuityRequirementStatus[];
  clause: string;
  source: string;
};

export const DEFAULT_WARN_DAYS = 30;

// A test sorts before other evidence of the same day (it may renew a lapsed qualification that day).
const byDateTestFirst = (a: ContinuityEvidence, b: ContinuityEvidence): number =>
  a.date < b.date
    ? -1
    : a.date > b.date
      ? 1
      : a.kind === b.kind
        ? 0
        : a.kind === 'test'
          ? -1
          : b.kind === 'test'
            ? 1
            : 0;

// Logs usually arrive in date order; checking is cheaper than sorting again.
function inOrder(list: ContinuityEvidence[]): boolean {
  for (let i = 1; i < list.length; i++)
    if (byDateTestFirst(list[i - 1] as ContinuityEvidence, list[i] as ContinuityEvidence) > 0) return false;
  return true;
}

const headSchema = continuityInputSchema.omit({ evidence: true });

// The evidence list is the bulk of the input (hundreds of dates for a long-serving welder). It is checked
// here by hand on the way in; anything this check does not accept goes through the full schema, which
// either reports the bad fields or (were this check ever stricter than the schema) parses it.
function evidenceIfValid(raw: unknown): ContinuityEvidence[] | null {
  if (!Array.isArray(raw) || raw.length > MAX_EVIDENCE) return null;
  for (const e of raw as unknown[]) {
    if (typeof e !== 'object' || e === null) return null;
    const { date, kind } = e as { date?: unknown; kind?: unknown };
    if (
      typeof date !== 'string' ||
      !isIsoDate(date) ||
      (kind !== 'use' && kind !== 'test' && kind !== 'tested-weld')
    )
      return null;
  }
  return raw as ContinuityEvidence[];
}

function parseContinuityInput(input: ContinuityInput): z.output<typeof continuityInputSchema> {
  const head = headSchema.safeParse(input);
  const evidence = evidenceIfValid((input as { evidence?: unknown } | null)?.evidence);
  if (head.success && evidence) return { ...head.data, evidence };
  return parseInput(continuityInputSchema, input);
}

// ---- the walk -----------------------------------------------------------------------------------------

const KIND_BIT: Record<EvidenceKind, number> = { use: 1, test: 2, 'tested-weld': 4 };
const TEST = KIND_BIT.test;
const TESTED_WELD = KIND_BIT['tested-weld'];

// The running state of one check: the latest evidence that renews it, its count in the calendar year
// being counted, and (ISO 9606-1 9.3 b) the end of the revalidation period with its tested welds.
type CheckState = {
  check: ContinuityCheck;
  renews: number;
  /** Evidence the check looks at: what renews it, tests (they restart the yearly count), tested welds (9.3 b). */
  listens: number;
  anchor: IsoDate | null;
  year: number;
  count: number;
  /** The yearly count fell short: the check stopped on this January 1 (until the next test). */
  endedOn: IsoDate | null;
  periodEnd: IsoDate | null;
  windowStart: IsoDate | null;
  windowCount: number;
};

function newCheckState(check: ContinuityCheck): CheckState {
  let renews = 0;
  for (const k of check.renewedBy) renews |= KIND_BIT[k];
  const listens =
    renews | (check.perCalendarYear || check.extendedBy ? TEST : 0) | (check.extendedBy ? TESTED_WELD : 0);
  return {
    check,
    renews,
    listens,
    anchor: null,
    year: 0,
    count: 0,
    endedOn: null,
    periodEnd: null,
    windowStart: null,
    windowCount: 0,
  };
}

function periodEnd(period: ContinuityPeriod, from: IsoDate, counting: CfrMonthCounting): IsoDate {
  const base =
    period.calendarMonths && counting === 'whole-months'
      ? firstOfMonthAfter(from, period.months + 1)
      : addMonths(from, period.months);
  return period.days === 0 ? base : addDays(base, period.days);
}

// Counted evidence of this kind on this date (dates arrive in order). Every change only moves the
// check's end later, so lapsesOn never moves earlier as evidence counts — the walk relies on it.
function update(cs: CheckState, bit: number, date: IsoDate): void {
  if ((cs.listens & bit) === 0) return;
  const renews = (cs.renews & bit) !== 0;
  const { perCalendarYear, extendedBy } = cs.check;
  if (renews) cs.anchor = date;
  if (perCalendarYear !== undefined) {
    const y = yearOf(date);
    if (bit === TEST) {
      // A test is a fresh start: the yearly count restarts, and the year of the test (which holds a
      // test) is not held to the count.
      cs.endedOn = null;
      cs.count = y === cs.year ? Math.max(cs.count, perCalendarYear) : perCalendarYear;
      cs.year = y;
    } else if (renews && cs.endedOn === null) {
      if (y === cs.year) cs.count++;
      else if (y === cs.year + 1 && cs.count >= perCalendarYear) {
        cs.year = y;
        cs.count = 1;
      } else cs.endedOn = firstOfYear(cs.count >= perCalendarYear ? cs.year + 2 : cs.year + 1);
    }
  }
  if (extendedBy !== undefined) {
    if (bit === TEST) {
      const end = addMonths(date, cs.check.period.months);
      if (cs.periodEnd === null || end > cs.periodEnd) {
        cs.periodEnd = end;
        cs.windowStart = addMonths(end, -extendedBy.withinLastMonths);
        cs.windowCount = 0;
      }
    } else if (
      bit === TESTED_WELD &&
      cs.periodEnd !== null &&
      date >= (cs.windowStart as IsoDate) &&
      date < cs.periodEnd &&
      ++cs.windowCount >= extendedBy.count
    ) {
      cs.periodEnd = addMonths(cs.periodEnd, extendedBy.extendByMonths);
      cs.windowStart = addMonths(cs.periodEnd, -extendedBy.withinLastMonths);
      cs.windowCount = 0;
    }
  }
}

/** The first day the check no longer holds, or null while nothing has renewed it. */
function checkEnd(cs: CheckState, counting: CfrMonthCounting): IsoDate | null {
  if (cs.anchor === null) return null;
  let end = cs.periodEnd ?? periodEnd(cs.check.period, cs.anchor, counting);
  const n = cs.check.perCalendarYear;
  if (n !== undefined)
    end = minDate(end, cs.endedOn ?? firstOfYear(cs.count >= n ? cs.year + 2 : cs.year + 1));
  return end;
}

type Requirement = CheckState[];

function requirementEnd(req: Requirement, counting: CfrMonthCounting): { end: IsoDate; by: CheckState } {
  let best: { end: IsoDate; by: CheckState } | null = null;
  for (const cs of req) {
    const end = checkEnd(cs, counting);
    if (end !== null && (best === null || end > best.end)) best = { end, by: cs };
  }
  // Every requirement has a check renewed by a test (profiles.test.ts), and the walk starts with one.
  return best as { end: IsoDate; by: CheckState };
}

// The walk's hot path: the same as the earliest requirementEnd(...).end, without building objects.
function lapseOf(reqs: Requirement[], counting: CfrMonthCounting): IsoDate {
  let lapse: IsoDate | null = null;
  for (const req of reqs) {
    let best: IsoDate | null = null;
    for (const cs of req) {
      const end = checkEnd(cs, counting);
      if (end !== null && (best === null || end > best)) best = end;
    }
    if (best !== null && (lapse === null || best < lapse)) lapse = best;
  }
  return lapse as IsoDate;
}

function resolveProfile(p: z.output<typeof continuityInputSchema>): {
  profile: ContinuityProfile;
  counting: CfrMonthCounting;
} {
  if (p.profile === undefined)
    return {
      profile: continuityProfiles[profileOfCode(p.code, p.isoRevalidation)],
      counting: p.cfrMonthCounting ?? DEFAULT_CFR_MONTH_COUNTING,
    };
  const profile = continuityProfiles[p.profile];
  if (!profile.codes.includes(p.code))
    throw RulesInputError.field(
      'profile',
      `${profileNames[p.profile]} does not apply to ${codeNames[p.code]} qualifications (it applies to ${profile.codes.map((c) => codeNames[c]).join(' and ')})`,
    );
  if (p.isoRevalidation !== undefined && profileOfCode(p.code, p.isoRevalidation) !== p.profile)
    throw RulesInputError.field(
      'isoRevalidation',
      `The revalidation option contradicts the profile ${profileNames[p.profile]}; give one or the other`,
    );
  return { profile, counting: p.cfrMonthCounting ?? CONSERVATIVE_CFR_MONTH_COUNTING };
}

export function continuityStatus(input: ContinuityInput): ContinuityStatus {
  const p = parseContinuityInput(input);
  if (p.asOf < p.qualifiedOn)
    throw RulesInputError.field('asOf', 'The date asked about is before the qualification test');
  if (p.revokedOn !== undefined && p.revokedOn < p.qualifiedOn)
    throw RulesInputError.field('revokedOn', 'A revocation cannot come before the qualification test');
  const { profile, counting } = resolveProfile(p);
  const warnDays = p.warnDays ?? DEFAULT_WARN_DAYS;
  const stopAt = p.revokedOn !== undefined && p.revokedOn <= p.asOf ? p.revokedOn : undefined;

  // In date order, a test before other evidence of the same day; evidence after asOf is not known on
  // that day and plays no part.
  const evidence = inOrder(p.evidence) ? p.evidence : [...p.evidence].sort(byDateTestFirst);

  const reqs: Requirement[] = profile.requirements.map((r) => r.checks.map(newCheckState));
  const all: CheckState[] = reqs.flat();
  const count = (bit: number, date: IsoDate) => {
    for (let i = 0; i < all.length; i++) update(all[i] as CheckState, bit, date);
  };
  // The qualification test is the first evidence.
  count(TEST, p.qualifiedOn);

  let last = p.qualifiedOn;
  let lastTest = p.qualifiedOn;
  let lastTestedWeld: IsoDate | null = null;
  // lapsesOn only moves later as evidence counts, so it is recomputed only when a date reaches the value
  // computed so far: monthly evidence then costs one date calculation per window, not one per entry.
  let lapsesOn = lapseOf(reqs, counting);
  let stale = false;
  const ignored: IsoDate[] = [];
  const renewedOn: IsoDate[] = [];
  for (const e of evidence) {
    if (e.date > p.asOf) break;
    if (e.date < p.qualifiedOn || (stopAt !== undefined && e.date >= stopAt)) {
      ignored.push(e.date);
      continue;
    }
    if (stale && e.date >= lapsesOn) {
      lapsesOn = lapseOf(reqs, counting);
      stale = false;
    }
    const inForce = e.date < lapsesOn;
    const bit = KIND_BIT[e.kind];
    if (!inForce && bit !== TEST) {
      ignored.push(e.date);
      continue;
    }
    if (!inForce) renewedOn.push(e.date);
    last = e.date;
    if (bit === TEST) lastTest = e.date;
    else if (bit === TESTED_WELD) lastTestedWeld = e.date;
    count(bit, e.date);
    if (inForce) stale = true;
    else lapsesOn = lapseOf(reqs, counting);
  }
  if (stale) lapsesOn = lapseOf(reqs, counting);

  const requirements: ContinuityRequirementStatus[] = reqs.map((req) => {
    const { end, by } = requirementEnd(req, counting);
    const c = by.check;
    return { check: c.id, clause: c.clause, source: c.source, text: c.text, lapsesOn: end };
  });
  if (p.revokedOn !== undefined) lapsesOn = minDate(lapsesOn, p.revokedOn);
  const daysLeft = daysBetween(p.asOf, lapsesOn);
  const state: ContinuityState =
    stopAt !== undefined
      ? 'revoked'
      : daysLeft <= 0
        ? 'lapsed'
        : daysLeft <= warnDays
          ? 'lapsing'
          : 'current';
  return {
    state,
    lastEvidence: last,
    lastTest,
    lastTestedWeld,
    lapsesOn,
    daysLeft,
    ignored,
    renewedOn,
    profile: profile.id,
    monthCounting: counting,
    requirements,
    clause: profile.clause,
    source: profile.source,
  };
}
