// Periodic requalification profiles (TRADE.md §6): what keeps a qualification in force, chosen per
// qualification, the code giving the default. A profile is a list of requirements that must all hold;
// each requirement holds while any one of its checks holds. A check is renewed by certain kinds of
// evidence and lasts a period from the latest of them, optionally only while each calendar year has
// enough of them. lapsesOn = the earliest, over the requirements, of the latest date any of its checks
// keeps it until. Kept as data so the README, the screens and (later) the API's SQL read the same rules.
import { type CodeId } from '../schemas/common.js';
import { type ContinuityProfileId, type EvidenceKind, type IsoRevalidation } from '../schemas/continuity.js';

export type ContinuityPeriod = {
  months: number;
  /** Days added after the months (AWS "exceeding six months": 1; "7-1/2 months": 15). */
  days: number;
  /** The CFR's "calendar months": counted as the chosen CfrMonthCounting says. */
  calendarMonths: boolean;
};

export type ContinuityCheck = {
  /** Stable name of the check, e.g. 'use', 'tested-weld-6-months'. */
  id: string;
  clause: string;
  /** 'from memory: …' or 'regulation: …', as the tests name it. */
  source: string;
  /** What the check asks, in our words. */
  text: string;
  /** The evidence that renews the check (the qualification test is evidence of kind 'test'). */
  renewedBy: readonly EvidenceKind[];
  period: ContinuityPeriod;
  /** "At least n times each calendar year": a calendar year that ends with fewer stops the check on
   *  January 1 of the next year, until the next test. Counted from the first full calendar year after
   *  the latest test (the qualification or a renewal): the year of a test holds a test and is not held
   *  to the count (Beadroll default; the period still runs from the latest evidence in it). */
  perCalendarYear?: number;
  /** ISO 9606-1 9.3 b: two tested welds in the last `withinLastMonths` months of the period extend it
   *  by `extendByMonths`, from its end. */
  extendedBy?: { count: number; withinLastMonths: number; extendByMonths: number };
};

export type ContinuityRequirement = { checks: readonly ContinuityCheck[] };

export type ContinuityProfile = {
  id: ContinuityProfileId;
  /** (The trade's name of the profile, for screens: profileNames in names/display-names.ts.) */
  /** Codes whose qualifications may use the profile. */
  codes: readonly CodeId[];
  clause: string;
  source: string;
  wording: string;
  requirements: readonly ContinuityRequirement[];
};

const SIX_MONTHS: ContinuityPeriod = { months: 6, days: 0, calendarMonths: false };
const SIX_CALENDAR_MONTHS: ContinuityPeriod = { months: 6, days: 0, calendarMonths: true };
// "7-1/2 months" (not "calendar months" in the CFR): 7 calendar months and 15 days. Half of the shortest
// month is 14 days, so on the 15th day past 7 months the interval exceeds 7-1/2 months in every reading
// (Beadroll default, conservative).
const SEVEN_AND_A_HALF_MONTHS: ContinuityPeriod = { months: 7, days: 15, calendarMonths: false };

const ANY: readonly EvidenceKind[] = ['use', 'test', 'tested-weld'];
const TESTED: readonly EvidenceKind[] = ['test', 'tested-weld'];

const cfrUse = (clause: string): ContinuityCheck => ({
  id: 'use',
  clause,
  source: `regulation: ${clause}`,
  text: 'Welded with the process (a use, a tested weld or a test) within the preceding 6 calendar months.',
  renewedBy: ANY,
  period: SIX_CALENDAR_MONTHS,
});

const cfrTestedWithinSix = (clause: string): ContinuityCheck => ({
  id: 'tested-weld-6-months',
  clause,
  source: `regulation: ${clause}`,
  text: 'One weld tested and found acceptable under API 1104 (a tested weld, or the qualification test) within the preceding 6 calendar months.',
  renewedBy: TESTED,
  period: SIX_CALENDAR_MONTHS,
});

const isoConfirmation: ContinuityCheck = {
  id: 'confirmation',
  clause: 'ISO 9606-1 9.2',
  source: 'from memory: ISO 9606-1 9.2',
  text: 'Validity confirmed every six months: welding with the process (a use, a tested weld or a test) within the preceding six months.',
  renewedBy: ANY,
  period: SIX_MONTHS,
};

const isoWording =
  'Validity is confirmed every six months by the welding coordinator or examiner; the qualification is revalidated by retest every 3 years (9.3 a), every 2 years with production welds tested (9.3 b), or stays valid while confirmed under a verified quality system (9.3 c).';

function iso(id: ContinuityProfileId, revalidation: ContinuityCheck | null): ContinuityProfile {
  return {
    id,
    codes: ['iso-9606-1'],
    clause: 'ISO 9606-1 9.2, 9.3',
    source: 'from memory: ISO 9606-1 9.2, 9.3',
    wording: isoWording,
    requirements: revalidation
      ? [{ checks: [isoConfirmation] }, { checks: [revalidation] }]
      : [{ checks: [isoConfirmation] }],
  };
}

export const continuityProfiles: Record<ContinuityProfileId, ContinuityProfile> = {
  'asme-ix': {
    id: 'asme-ix',
    codes: ['asme-ix'],
    clause: 'QW-322.1(a)',
    source: 'from memory: QW-322.1(a)',
    wording:
      'Qualifications for a process expire when the welder has not welded with that process for 6 months or more.',
    requirements: [
      {
        checks: [
          {
            id: 'use',
            clause: 'QW-322.1(a)',
            source: 'from memory: QW-322.1(a)',
            text: 'Welded with the process (a use, a tested weld or a test) in the last 6 months: lapses on the day 6 calendar months after.',
            renewedBy: ANY,
            period: SIX_MONTHS,
          },
        ],
      },
    ],
  },
  'aws-d1.1': {
    id: 'aws-d1.1',
    codes: ['aws-d1.1'],
    clause: 'AWS D1.1 4.2.3.1 (2015; 6.2.3.1 area in 2020)',
    source: 'from memory: AWS D1.1 4.2.3.1 (2015), 6.2.3.1 area (2020)',
    wording:
      'Remains in effect unless the welder is not engaged in the process for a period exceeding six months.',
    requirements: [
      {
        checks: [
          {
            id: 'use',
            clause: 'AWS D1.1 4.2.3.1 (2015; 6.2.3.1 area in 2020)',
            source: 'from memory: AWS D1.1 4.2.3.1 (2015; 6.2.3.1 area in 2020)',
            text: 'Not a period exceeding six months without the process: lapses on the day after the date 6 calendar months after the last use.',
            renewedBy: ANY,
            period: { months: 6, days: 1, calendarMonths: false },
          },
        ],
      },
    ],
  },
  '49cfr-192.229b': {
    id: '49cfr-192.229b',
    codes: ['api-1104', 'asme-ix'],
    clause: '49 CFR 192.229(b)',
    source: 'regulation: 49 CFR 192.229(b)',
    wording:
      'No welder may weld with a process unless, within the preceding 6 calendar months, the welder was engaged in welding with that process (API 1104 itself has no continuity rule).',
    requirements: [{ checks: [cfrUse('49 CFR 192.229(b)')] }],
  },
  '49cfr-192.229c': {
    id: '49cfr-192.229c',
    codes: ['api-1104', 'asme-ix'],
    clause: '49 CFR 192.229(b), (c)(1)',
    source: 'regulation: 49 CFR 192.229(b), (c)(1)',
    wording:
      'As 192.229(b), and on pipe operated at a hoop stress of 20 % of SMYS or more, one weld tested and found acceptable under API 1104 within the preceding 6 calendar months — or welds tested and found acceptable at least twice each calendar year at intervals not exceeding 7-1/2 months.',
    requirements: [
      { checks: [cfrUse('49 CFR 192.229(b)')] },
      {
        checks: [
          cfrTestedWithinSix('49 CFR 192.229(c)(1)'),
          {
            id: 'tested-weld-twice-a-year',
            clause: '49 CFR 192.229(c)(1)',
            source: 'regulation: 49 CFR 192.229(c)(1)',
            text: 'Alternatively, welds tested and found acceptable at least twice each calendar year, at intervals not exceeding 7-1/2 months.',
            renewedBy: TESTED,
            period: SEVEN_AND_A_HALF_MONTHS,
            perCalendarYear: 2,
          },
        ],
      },
    ],
  },
  '49cfr-192.229d': {
    id: '49cfr-192.229d',
    codes: ['api-1104', 'asme-ix'],
    clause: '49 CFR 192.229(b), (d)',
    source: 'regulation: 49 CFR 192.229(b), (d)',
    wording:
      'A welder qualified under Appendix C (192.227(b)) may not weld unless requalified within the preceding 15 calendar months and at least once each calendar year, or had a production weld cut out, tested and found acceptable within the preceding 7-1/2 months and at least twice each calendar year; and 192.229(b) applies.',
    requirements: [
      { checks: [cfrUse('49 CFR 192.229(b)')] },
      {
        checks: [
          {
            id: 'requalified',
            clause: '49 CFR 192.229(d)(1)',
            source: 'regulation: 49 CFR 192.229(d)(1)',
            text: 'Requalified (a passing test) within the preceding 15 calendar months, and at least once each calendar year.',
            renewedBy: ['test'],
            period: { months: 15, days: 0, calendarMonths: true },
            perCalendarYear: 1,
          },
          {
            id: 'production-weld-tested',
            clause: '49 CFR 192.229(d)(2)(i)',
            source: 'regulation: 49 CFR 192.229(d)(2)(i)',
            text: 'Or a production weld cut out, tested and found acceptable within the preceding 7-1/2 months, and at least twice each calendar year.',
            renewedBy: ['tested-weld'],
            period: SEVEN_AND_A_HALF_MONTHS,
            perCalendarYear: 2,
          },
        ],
      },
    ],
  },
  '49cfr-195.222b': {
    id: '49cfr-195.222b',
    codes: ['api-1104', 'asme-ix'],
    clause: '49 CFR 195.222(b)',
    source: 'regulation: 49 CFR 195.222(b)',
    wording:
      'No welder may weld with a process unless, within the preceding 6 calendar months, the welder has engaged in welding with that process and had one weld tested and found acceptable under API 1104.',
    requirements: [
      { checks: [cfrUse('49 CFR 195.222(b)(1)')] },
      { checks: [cfrTestedWithinSix('49 CFR 195.222(b)(2)')] },
    ],
  },
  'iso-9606-1-9.3a': iso('iso-9606-1-9.3a', {
    id: 'retest',
    clause: 'ISO 9606-1 9.3 a)',
    source: 'from memory: ISO 9606-1 9.3 a)',
    text: 'A new qualification test every 3 years.',
    renewedBy: ['test'],
    period: { months: 36, days: 0, calendarMonths: false },
  }),
  'iso-9606-1-9.3b': iso('iso-9606-1-9.3b', {
    id: 'revalidation',
    clause: 'ISO 9606-1 9.3 b)',
    source: 'from memory: ISO 9606-1 9.3 b)',
    text: 'Revalidated every 2 years: two production welds tested and found acceptable in the last 6 months of the period extend it by 2 years; otherwise a new test.',
    renewedBy: ['test'],
    period: { months: 24, days: 0, calendarMonths: false },
    extendedBy: { count: 2, withinLastMonths: 6, extendByMonths: 24 },
  }),
  // 9.3 c: valid while confirmed every six months under a verified quality system (the company's quality
  // manual, not this function, says whether it has one): no revalidation check.
  'iso-9606-1-9.3c': iso('iso-9606-1-9.3c', null),
};

const isoProfile: Record<IsoRevalidation, ContinuityProfileId> = {
  '9.3a': 'iso-9606-1-9.3a',
  '9.3b': 'iso-9606-1-9.3b',
  '9.3c': 'iso-9606-1-9.3c',
};

/** The profile a qualification of each code takes unless the QA manager chooses another. */
export const defaultContinuityProfile: Record<CodeId, ContinuityProfileId> = {
  'asme-ix': 'asme-ix',
  'aws-d1.1': 'aws-d1.1',
  'api-1104': '49cfr-192.229b',
  'iso-9606-1': 'iso-9606-1-9.3a',
};

/** The profile that reproduces a code's own lapse rule (continuityStatus without `profile`). */
export function profileOfCode(code: CodeId, isoRevalidation?: IsoRevalidation): ContinuityProfileId {
  return code === 'iso-9606-1' && isoRevalidation
    ? isoProfile[isoRevalidation]
    : defaultContinuityProfile[code];
}
