// Continuity of one qualification (one welder, one process) as of a given day, per code (TRADE.md §6).
// Evidence in date order keeps the qualification in force while it comes before lapsesOn; once lapsed,
// documented use does not revive it (those dates go to `ignored`, for review) and only a passing test
// renews it (from memory: QW-322.2(a)). Revocation wins from its date on (from memory: QW-322.1(b)).
import { type z } from 'zod';
import {
  continuityInputSchema,
  MAX_EVIDENCE,
  type ContinuityEvidence,
  type ContinuityInput,
} from '../schemas/continuity.js';
import { parseInput } from '../validation/parse-input.js';
import { RulesInputError } from '../validation/rules-input-error.js';
import { daysBetween, isIsoDate, minDate, type IsoDate } from './calendar.js';
import { lapseRuleFor, lapsesOnFor } from './lapse-rules.js';

export type ContinuityState = 'current' | 'lapsing' | 'lapsed' | 'revoked';
export type ContinuityStatus = {
  state: ContinuityState;
  /** The latest evidence that counted (the qualification date when none did). */
  lastEvidence: IsoDate;
  /** The latest passing test that counted (the qualification test, or a renewal). */
  lastTest: IsoDate;
  /** First day on which the welder may no longer weld with the process. */
  lapsesOn: IsoDate;
  /** From asOf to lapsesOn (0 or less once lapsed). */
  daysLeft: number;
  /** Evidence dates that could not count: before the qualification, use after a lapse, on or after revocation. */
  ignored: IsoDate[];
  /** Renewal tests that brought the qualification back after a lapse. */
  renewedOn: IsoDate[];
  clause: string;
  source: string;
};

export const DEFAULT_WARN_DAYS = 30;

const byDateTestFirst = (a: ContinuityEvidence, b: ContinuityEvidence): number =>
  a.date < b.date ? -1 : a.date > b.date ? 1 : a.kind === b.kind ? 0 : a.kind === 'test' ? -1 : 1;

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
    if (typeof date !== 'string' || !isIsoDate(date) || (kind !== 'use' && kind !== 'test')) return null;
  }
  return raw as ContinuityEvidence[];
}

function parseContinuityInput(input: ContinuityInput): z.output<typeof continuityInputSchema> {
  const head = headSchema.safeParse(input);
  const evidence = evidenceIfValid((input as { evidence?: unknown } | null)?.evidence);
  if (head.success && evidence) return { ...head.data, evidence };
  return parseInput(continuityInputSchema, input);
}

export function continuityStatus(input: ContinuityInput): ContinuityStatus {
  const p = parseContinuityInput(input);
  if (p.asOf < p.qualifiedOn)
    throw RulesInputError.field('asOf', 'The date asked about is before the qualification test');
  if (p.revokedOn !== undefined && p.revokedOn < p.qualifiedOn)
    throw RulesInputError.field('revokedOn', 'A revocation cannot come before the qualification test');
  const rule = lapseRuleFor(p.code, p);
  const warnDays = p.warnDays ?? DEFAULT_WARN_DAYS;
  const stopAt = p.revokedOn !== undefined && p.revokedOn <= p.asOf ? p.revokedOn : undefined;

  // In date order, a test before a use on the same day; evidence after asOf is not known on that day and
  // plays no part.
  const evidence = inOrder(p.evidence) ? p.evidence : [...p.evidence].sort(byDateTestFirst);

  let last = p.qualifiedOn;
  let lastTest = p.qualifiedOn;
  // lapsesOn only moves later as evidence counts, so it is recomputed only when a date reaches the value
  // computed so far: monthly evidence then costs one date calculation per window, not one per entry.
  let lapsesOn = lapsesOnFor(rule, last, lastTest);
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
      lapsesOn = lapsesOnFor(rule, last, lastTest);
      stale = false;
    }
    const inForce = e.date < lapsesOn;
    if (!inForce && e.kind === 'use') {
      ignored.push(e.date);
      continue;
    }
    if (!inForce) renewedOn.push(e.date);
    last = e.date;
    if (e.kind === 'test') lastTest = e.date;
    if (inForce) stale = true;
    else lapsesOn = lapsesOnFor(rule, last, lastTest);
  }
  if (stale) lapsesOn = lapsesOnFor(rule, last, lastTest);

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
    lapsesOn,
    daysLeft,
    ignored,
    renewedOn,
    clause: rule.clause,
    source: rule.source,
  };
}
