import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  cfrMonthCountings,
  continuityProfileIds,
  isoRevalidationOptions,
  type CfrMonthCounting,
  type ContinuityEvidence,
  type ContinuityInput,
  type ContinuityProfileId,
  type EvidenceKind,
} from '../schemas/continuity.js';
import { codeIds, type CodeId } from '../schemas/common.js';
import { fieldsThrown } from '../test-support/fields-thrown.js';
import { type RulesInputError } from '../validation/rules-input-error.js';
import { addDays, daysBetween, minDate } from './calendar.js';
import { continuityStatus } from './continuity-status.js';
import { lapseRuleFor, lapsesOnFor } from './lapse-rules.js';
import { continuityProfiles, defaultContinuityProfile } from './profiles.js';

const use = (date: string) => ({ date, kind: 'use' as const });
const test = (date: string) => ({ date, kind: 'test' as const });
const tested = (date: string) => ({ date, kind: 'tested-weld' as const });
/** A use on the 5th of every month from `from` (YYYY-MM) to `to` (YYYY-MM), both included. */
function monthlyUse(from: string, to: string): ContinuityEvidence[] {
  const out: ContinuityEvidence[] = [];
  let [y, m] = from.split('-').map(Number) as [number, number];
  for (;;) {
    const ym = `${y}-${String(m).padStart(2, '0')}`;
    if (ym > to) return out;
    out.push(use(`${ym}-05`));
    m = m === 12 ? 1 : m + 1;
    if (m === 1) y++;
  }
}

describe('profiles: data', () => {
  it('every requirement has a check a passing test renews (a qualification always starts in force)', () => {
    for (const p of Object.values(continuityProfiles))
      for (const r of p.requirements)
        expect(
          r.checks.some((c) => c.renewedBy.includes('test')),
          p.id,
        ).toBe(true);
  });

  it('every check names its clause and a source kind', () => {
    for (const p of Object.values(continuityProfiles)) {
      expect(p.source).toMatch(/^(regulation|from memory): /);
      for (const c of p.requirements.flatMap((r) => r.checks)) {
        expect(c.source).toMatch(/^(regulation|from memory): /);
        expect(c.source).toContain(c.clause);
      }
    }
  });

  it('each code has a default profile that applies to it', () => {
    for (const code of codeIds)
      expect(continuityProfiles[defaultContinuityProfile[code]].codes).toContain(code);
  });
});

describe('profile asme-ix', () => {
  it('from memory: QW-322.1(a) — a tested weld is use of the process: lapses 6 calendar months after it', () => {
    const r = continuityStatus({
      code: 'asme-ix',
      profile: 'asme-ix',
      qualifiedOn: '2025-01-15',
      evidence: [tested('2025-03-10')],
      asOf: '2025-04-01',
    });
    expect(r).toMatchObject({
      lapsesOn: '2025-09-10',
      lastEvidence: '2025-03-10',
      lastTestedWeld: '2025-03-10',
    });
    expect(r.requirements).toEqual([
      expect.objectContaining({ clause: 'QW-322.1(a)', lapsesOn: '2025-09-10' }),
    ]);
  });

  it('from memory: QW-322.2(a) — a tested weld after the lapse revives nothing and is flagged', () => {
    const r = continuityStatus({
      code: 'asme-ix',
      profile: 'asme-ix',
      qualifiedOn: '2025-01-15',
      evidence: [tested('2025-07-15')],
      asOf: '2025-08-01',
    });
    expect(r).toMatchObject({
      state: 'lapsed',
      lapsesOn: '2025-07-15',
      ignored: ['2025-07-15'],
      lastTestedWeld: null,
    });
  });
});

describe('profile aws-d1.1', () => {
  it('from memory: AWS D1.1 4.2.3.1 (2015) — a tested weld keeps it: lapses the day after 6 months from it', () => {
    const r = continuityStatus({
      code: 'aws-d1.1',
      profile: 'aws-d1.1',
      qualifiedOn: '2025-01-15',
      evidence: [tested('2025-03-10')],
      asOf: '2025-04-01',
    });
    expect(r.lapsesOn).toBe('2025-09-11');
  });
});

describe('profile 49cfr-192.229b', () => {
  it('regulation: 49 CFR 192.229(b) — counted from the day by default (conservative): qualified Jan 20, lapses Jul 20', () => {
    const r = continuityStatus({
      code: 'api-1104',
      profile: '49cfr-192.229b',
      qualifiedOn: '2025-01-20',
      evidence: [],
      asOf: '2025-02-01',
    });
    expect(r).toMatchObject({ lapsesOn: '2025-07-20', monthCounting: 'same-day' });
  });

  it('regulation: 49 CFR 192.229(b) — whole calendar months when chosen: January use counts through July 31', () => {
    const r = continuityStatus({
      code: 'api-1104',
      profile: '49cfr-192.229b',
      cfrMonthCounting: 'whole-months',
      qualifiedOn: '2025-01-20',
      evidence: [],
      asOf: '2025-02-01',
    });
    expect(r.lapsesOn).toBe('2025-08-01');
  });

  it('regulation: 49 CFR 192.229(b) — without a profile the code keeps its rule as before (whole months)', () => {
    const r = continuityStatus({
      code: 'api-1104',
      qualifiedOn: '2025-01-20',
      evidence: [],
      asOf: '2025-02-01',
    });
    expect(r).toMatchObject({
      lapsesOn: '2025-08-01',
      profile: '49cfr-192.229b',
      monthCounting: 'whole-months',
    });
  });

  it('regulation: 49 CFR 192.227(a), 192.229(b) — an ASME IX qualification may take the pipeline profile', () => {
    const r = continuityStatus({
      code: 'asme-ix',
      profile: '49cfr-192.229b',
      qualifiedOn: '2025-08-31',
      evidence: [],
      asOf: '2025-09-01',
    });
    expect(r.lapsesOn).toBe('2026-02-28');
  });
});

describe('profile 49cfr-192.229c', () => {
  it('regulation: 49 CFR 192.229(c)(1) — use alone is not enough: no tested weld since the test, lapses 7-1/2 months after it', () => {
    // The 6-month route ends on 2025-07-20; the twice-a-year route (the test year is not held to the
    // count) carries it to 2025-01-20 + 7 months + 15 days = 2025-09-04; use on 2025-09-05 comes too late.
    const r = continuityStatus({
      code: 'api-1104',
      profile: '49cfr-192.229c',
      qualifiedOn: '2025-01-20',
      evidence: monthlyUse('2025-02', '2025-09'),
      asOf: '2025-09-10',
    });
    expect(r).toMatchObject({ state: 'lapsed', lapsesOn: '2025-09-04', ignored: ['2025-09-05'] });
    expect(r.requirements.map((q) => [q.clause, q.lapsesOn])).toEqual([
      ['49 CFR 192.229(b)', '2026-02-05'],
      ['49 CFR 192.229(c)(1)', '2025-09-04'],
    ]);
  });

  it('regulation: 49 CFR 192.229(c)(1) — tested welds twice a year at most 7-1/2 months apart keep it in force', () => {
    const r = continuityStatus({
      code: 'api-1104',
      profile: '49cfr-192.229c',
      qualifiedOn: '2025-01-20',
      evidence: [...monthlyUse('2025-02', '2026-05'), tested('2025-06-15'), tested('2025-12-10')],
      asOf: '2026-06-01',
    });
    // 2025-12-10 + 7 months + 15 days = 2026-07-25, later than the 6-month route's 2026-06-10
    expect(r).toMatchObject({
      state: 'current',
      lapsesOn: '2026-07-25',
      daysLeft: 54,
      lastTestedWeld: '2025-12-10',
    });
    expect(r.requirements[1]).toMatchObject({ check: 'tested-weld-twice-a-year', lapsesOn: '2026-07-25' });
  });

  it('regulation: 49 CFR 192.229(c)(1) — a calendar year with one tested weld ends the twice-a-year route on January 1; the 6-month route carries on', () => {
    const r = continuityStatus({
      code: 'api-1104',
      profile: '49cfr-192.229c',
      qualifiedOn: '2025-01-20',
      evidence: [
        ...monthlyUse('2025-02', '2027-06'),
        tested('2025-06-01'),
        tested('2025-12-20'),
        tested('2026-07-15'),
        tested('2027-01-10'),
      ],
      asOf: '2027-06-30',
    });
    expect(r).toMatchObject({ state: 'lapsing', lapsesOn: '2027-07-10', daysLeft: 10 });
    expect(r.requirements[1]).toMatchObject({ check: 'tested-weld-6-months', lapsesOn: '2027-07-10' });
  });
});

describe('profile 49cfr-192.229d', () => {
  it('regulation: 49 CFR 192.229(d)(1) — at least once each calendar year: no requalification in the next year lapses on January 1', () => {
    const r = continuityStatus({
      code: 'api-1104',
      profile: '49cfr-192.229d',
      qualifiedOn: '2024-11-15',
      evidence: monthlyUse('2024-12', '2025-12'),
      asOf: '2025-12-20',
    });
    // 15 calendar months would run to 2026-02-15; 2025 passed without a requalification.
    expect(r).toMatchObject({ lapsesOn: '2026-01-01', state: 'lapsing' });
    expect(r.requirements[1]).toMatchObject({ check: 'requalified', clause: '49 CFR 192.229(d)(1)' });
  });

  it('regulation: 49 CFR 192.229(d)(1) — within the preceding 15 calendar months: requalified 2025-06-10, lapses 2026-09-10', () => {
    const r = continuityStatus({
      code: 'api-1104',
      profile: '49cfr-192.229d',
      qualifiedOn: '2024-11-15',
      evidence: [...monthlyUse('2024-12', '2026-08'), test('2025-06-10')],
      asOf: '2026-08-20',
    });
    expect(r).toMatchObject({ lapsesOn: '2026-09-10', lastTest: '2025-06-10' });
  });

  it('regulation: 49 CFR 192.229(d)(2)(i) — production welds cut out and tested twice each year, ≤ 7-1/2 months apart', () => {
    const evidence = [
      ...monthlyUse('2024-12', '2027-03'),
      tested('2025-02-10'),
      tested('2025-08-20'),
      tested('2026-03-01'),
      tested('2026-09-15'),
    ];
    const r = continuityStatus({
      code: 'api-1104',
      profile: '49cfr-192.229d',
      qualifiedOn: '2024-11-15',
      evidence,
      asOf: '2027-03-31',
    });
    // 2026-09-15 + 7 months + 15 days
    expect(r).toMatchObject({ lapsesOn: '2027-04-30', state: 'lapsing', daysLeft: 30 });
    expect(r.requirements[1]).toMatchObject({
      check: 'production-weld-tested',
      clause: '49 CFR 192.229(d)(2)(i)',
    });
    // without the second weld of 2026 the interval rule ends it 7-1/2 months after 2026-03-01
    const short = continuityStatus({
      code: 'api-1104',
      profile: '49cfr-192.229d',
      qualifiedOn: '2024-11-15',
      evidence: evidence.filter((e) => e.date !== '2026-09-15'),
      asOf: '2026-11-01',
    });
    expect(short).toMatchObject({ lapsesOn: '2026-10-16', state: 'lapsed' });
  });
});

describe('profile 49cfr-195.222b', () => {
  it('regulation: 49 CFR 195.222(b)(2) — use without a tested weld lapses 6 calendar months after the test', () => {
    const r = continuityStatus({
      code: 'api-1104',
      profile: '49cfr-195.222b',
      qualifiedOn: '2025-01-20',
      evidence: monthlyUse('2025-02', '2025-07'),
      asOf: '2025-07-25',
    });
    expect(r).toMatchObject({ state: 'lapsed', lapsesOn: '2025-07-20' });
    expect(r.requirements[1]).toMatchObject({ clause: '49 CFR 195.222(b)(2)', lapsesOn: '2025-07-20' });
  });

  it('regulation: 49 CFR 195.222(b)(1), (2) — use and a tested weld within 6 calendar months; the earlier governs', () => {
    const r = continuityStatus({
      code: 'api-1104',
      profile: '49cfr-195.222b',
      qualifiedOn: '2025-01-20',
      evidence: [...monthlyUse('2025-02', '2025-11'), tested('2025-06-30')],
      asOf: '2025-12-01',
    });
    expect(r).toMatchObject({ lapsesOn: '2025-12-30', state: 'lapsing', daysLeft: 29 });
    expect(r.requirements.map((q) => q.lapsesOn)).toEqual(['2026-05-05', '2025-12-30']);
  });
});

describe('profiles iso-9606-1-9.3a/b/c', () => {
  it('from memory: ISO 9606-1 9.2, 9.3 a) — a tested weld confirms validity; the retest date stands', () => {
    const r = continuityStatus({
      code: 'iso-9606-1',
      profile: 'iso-9606-1-9.3a',
      qualifiedOn: '2024-01-10',
      evidence: [tested('2026-10-01')],
      asOf: '2026-06-01',
    });
    // the tested weld is after asOf: not yet known; confirmation ran out on 2024-07-10
    expect(r.lapsesOn).toBe('2024-07-10');
    const kept = continuityStatus({
      code: 'iso-9606-1',
      profile: 'iso-9606-1-9.3a',
      qualifiedOn: '2024-01-10',
      evidence: [
        tested('2024-06-01'),
        tested('2024-11-20'),
        tested('2025-05-01'),
        tested('2025-10-15'),
        tested('2026-04-01'),
        tested('2026-09-20'),
      ],
      asOf: '2026-10-01',
    });
    expect(kept).toMatchObject({ lapsesOn: '2027-01-10', state: 'current' });
    expect(kept.requirements[1]).toMatchObject({ clause: 'ISO 9606-1 9.3 a)', lapsesOn: '2027-01-10' });
  });

  it('from memory: ISO 9606-1 9.3 b) — two tested welds in the last 6 months of the 2 years extend it by 2 years', () => {
    const base = {
      code: 'iso-9606-1' as const,
      profile: 'iso-9606-1-9.3b' as const,
      qualifiedOn: '2023-03-01',
      asOf: '2025-02-20',
    };
    const uses = monthlyUse('2023-04', '2025-02');
    const r = continuityStatus({ ...base, evidence: [...uses, tested('2024-10-10'), tested('2025-01-20')] });
    expect(r.requirements[1]).toMatchObject({ check: 'revalidation', lapsesOn: '2027-03-01' });
    expect(r.lapsesOn).toBe('2025-08-05');
    // one of them before the last 6 months (which start 2024-09-01): no extension
    const early = continuityStatus({
      ...base,
      evidence: [...uses, tested('2024-08-10'), tested('2025-01-20')],
    });
    expect(early.lapsesOn).toBe('2025-03-01');
  });

  it('from memory: ISO 9606-1 9.3 c) — no revalidation date while confirmed', () => {
    const r = continuityStatus({
      code: 'iso-9606-1',
      profile: 'iso-9606-1-9.3c',
      qualifiedOn: '2020-03-01',
      evidence: monthlyUse('2020-04', '2026-05'),
      asOf: '2026-05-20',
    });
    expect(r.lapsesOn).toBe('2026-11-05');
  });
});

describe('profile input', () => {
  it('refuses a profile of another code, naming the code in the trade’s words', () => {
    const call = () =>
      continuityStatus({
        code: 'aws-d1.1',
        profile: '49cfr-192.229c',
        qualifiedOn: '2025-01-20',
        evidence: [],
        asOf: '2025-02-01',
      });
    expect(fieldsThrown(call)).toEqual(['profile']);
    let message = '';
    try {
      call();
    } catch (e) {
      message = (e as RulesInputError).fields.profile ?? '';
    }
    expect(message).toMatch(/AWS D1\.1/);
    expect(message).toMatch(/49 CFR 192\.229\(c\)/);
    expect(message).not.toMatch(/aws-d1\.1|49cfr/);
  });

  it('refuses an ISO revalidation option that contradicts the profile', () => {
    const fields = fieldsThrown(() =>
      continuityStatus({
        code: 'iso-9606-1',
        profile: 'iso-9606-1-9.3b',
        isoRevalidation: '9.3a',
        qualifiedOn: '2025-01-20',
        evidence: [],
        asOf: '2025-02-01',
      }),
    );
    expect(fields).toEqual(['isoRevalidation']);
  });

  it('refuses an unknown profile and an unknown evidence kind', () => {
    const bad = {
      code: 'api-1104',
      profile: '192.229c',
      qualifiedOn: '2025-01-20',
      evidence: [{ date: '2025-02-01', kind: 'weld' }],
      asOf: '2025-02-01',
    };
    expect(fieldsThrown(() => continuityStatus(bad as unknown as ContinuityInput)).sort()).toEqual([
      'evidence.0.kind',
      'profile',
    ]);
  });
});

// ---- properties -------------------------------------------------------------------------------------

const arbDate = fc.integer({ min: 0, max: 4 * 366 }).map((n) => addDays('2024-01-01', n));
const arbKind = fc.constantFrom<EvidenceKind>('use', 'use', 'tested-weld', 'tested-weld', 'test');
const arbEvidence = fc.record({ date: arbDate, kind: arbKind });
const arbProfile = fc.constantFrom(...continuityProfileIds);
const arbCounting = fc.constantFrom(...cfrMonthCountings);
const codeOf = (p: ContinuityProfileId): CodeId => continuityProfiles[p].codes[0] as CodeId;
const withProfile = (
  profile: ContinuityProfileId,
  evidence: ContinuityEvidence[],
  asOf: string,
  counting?: CfrMonthCounting,
) =>
  continuityStatus({
    code: codeOf(profile),
    profile,
    qualifiedOn: '2024-01-01',
    evidence,
    asOf,
    ...(counting ? { cfrMonthCounting: counting } : {}),
  });

describe('profile properties', () => {
  it('property: more evidence never makes lapsesOn earlier, under every profile and counting', () => {
    fc.assert(
      fc.property(
        arbProfile,
        arbCounting,
        fc.array(arbEvidence, { maxLength: 30 }),
        fc.array(arbEvidence, { minLength: 1, maxLength: 8 }),
        arbDate,
        (profile, counting, evidence, more, asOf) => {
          const before = withProfile(profile, evidence, asOf, counting);
          const after = withProfile(profile, [...evidence, ...more], asOf, counting);
          expect(after.lapsesOn >= before.lapsesOn).toBe(true);
        },
      ),
      { numRuns: 400 },
    );
  });

  it('property: the conservative counting (from the day) never lapses later than whole calendar months', () => {
    fc.assert(
      fc.property(
        arbProfile,
        fc.array(arbEvidence, { maxLength: 40 }),
        arbDate,
        (profile, evidence, asOf) => {
          const conservative = withProfile(profile, evidence, asOf);
          const lenient = withProfile(profile, evidence, asOf, 'whole-months');
          expect(conservative.monthCounting).toBe('same-day');
          expect(conservative.lapsesOn <= lenient.lapsesOn).toBe(true);
        },
      ),
      { numRuns: 400 },
    );
  });

  it('property: the answer does not depend on the order of the evidence', () => {
    fc.assert(
      fc.property(
        arbProfile,
        fc.array(arbEvidence, { maxLength: 30 }),
        arbDate,
        (profile, evidence, asOf) => {
          expect(withProfile(profile, [...evidence].reverse(), asOf)).toEqual(
            withProfile(profile, evidence, asOf),
          );
        },
      ),
    );
  });

  it('property: 49 CFR 192.229(c), (d) and 195.222(b) never lapse later than 192.229(b) alone (they add requirements)', () => {
    fc.assert(
      fc.property(
        fc.constantFrom<ContinuityProfileId>('49cfr-192.229c', '49cfr-192.229d', '49cfr-195.222b'),
        arbCounting,
        fc.array(arbEvidence, { maxLength: 40 }),
        arbDate,
        (profile, counting, evidence, asOf) => {
          const b = withProfile('49cfr-192.229b', evidence, asOf, counting);
          expect(withProfile(profile, evidence, asOf, counting).lapsesOn <= b.lapsesOn).toBe(true);
        },
      ),
      { numRuns: 300 },
    );
  });

  it('property: where only use is asked for, a tested weld counts exactly as a use', () => {
    fc.assert(
      fc.property(
        fc.constantFrom<ContinuityProfileId>(
          'asme-ix',
          'aws-d1.1',
          '49cfr-192.229b',
          'iso-9606-1-9.3a',
          'iso-9606-1-9.3c',
        ),
        fc.array(arbEvidence, { maxLength: 30 }),
        arbDate,
        (profile, evidence, asOf) => {
          const asUse = evidence.map((e) => (e.kind === 'tested-weld' ? use(e.date) : e));
          const { lastTestedWeld: _a, ...withTested } = withProfile(profile, evidence, asOf);
          const { lastTestedWeld: _b, ...withUse } = withProfile(profile, asUse, asOf);
          expect(withTested).toEqual(withUse);
        },
      ),
    );
  });
});

// ---- the behaviour without a profile is the code's lapse rule, as the API's SQL computes it ---------

// The walk of TRADE.md §6 written plainly on lapseRuleFor / lapsesOnFor — the rule data whose `sql` the
// API's set-based statement uses — with no shortcut: each evidence is judged against the lapse date of
// the evidence before it.
function walkOnLapseRules(input: {
  code: CodeId;
  qualifiedOn: string;
  evidence: ContinuityEvidence[];
  asOf: string;
  revokedOn?: string;
  isoRevalidation?: (typeof isoRevalidationOptions)[number];
  cfrMonthCounting?: CfrMonthCounting;
}) {
  const rule = lapseRuleFor(input.code, input);
  const sorted = [...input.evidence].sort((a, b) =>
    a.date !== b.date
      ? a.date < b.date
        ? -1
        : 1
      : (a.kind === 'test' ? 0 : 1) - (b.kind === 'test' ? 0 : 1),
  );
  const stopAt = input.revokedOn !== undefined && input.revokedOn <= input.asOf ? input.revokedOn : undefined;
  let last = input.qualifiedOn;
  let lastTest = input.qualifiedOn;
  const ignored: string[] = [];
  const renewedOn: string[] = [];
  for (const e of sorted) {
    if (e.date > input.asOf) break;
    if (e.date < input.qualifiedOn || (stopAt !== undefined && e.date >= stopAt)) {
      ignored.push(e.date);
      continue;
    }
    const inForce = e.date < lapsesOnFor(rule, last, lastTest);
    if (!inForce && e.kind !== 'test') {
      ignored.push(e.date);
      continue;
    }
    if (!inForce) renewedOn.push(e.date);
    last = e.date;
    if (e.kind === 'test') lastTest = e.date;
  }
  let lapsesOn = lapsesOnFor(rule, last, lastTest);
  if (input.revokedOn !== undefined) lapsesOn = minDate(lapsesOn, input.revokedOn);
  return {
    lastEvidence: last,
    lastTest,
    lapsesOn,
    ignored,
    renewedOn,
    daysLeft: daysBetween(input.asOf, lapsesOn),
    clause: rule.clause,
    source: rule.source,
  };
}

describe('without a profile: unchanged', () => {
  it('property: continuityStatus without a profile equals the walk on each code’s lapse rule (the rule the API’s SQL uses)', () => {
    const arbOldEvidence = fc.record({
      date: arbDate,
      kind: fc.constantFrom<'use' | 'test'>('use', 'use', 'use', 'test'),
    });
    fc.assert(
      fc.property(
        fc.constantFrom(...codeIds),
        fc.array(arbOldEvidence, { maxLength: 40 }),
        arbDate,
        fc.option(arbDate, { nil: undefined }),
        fc.option(fc.constantFrom(...isoRevalidationOptions), { nil: undefined }),
        fc.option(arbCounting, { nil: undefined }),
        (code, evidence, asOf, revokedOn, isoRevalidation, cfrMonthCounting) => {
          const input = {
            code,
            qualifiedOn: '2024-01-01',
            evidence,
            asOf,
            ...(revokedOn ? { revokedOn } : {}),
            ...(isoRevalidation ? { isoRevalidation } : {}),
            ...(cfrMonthCounting ? { cfrMonthCounting } : {}),
          };
          const r = continuityStatus(input);
          expect({
            lastEvidence: r.lastEvidence,
            lastTest: r.lastTest,
            lapsesOn: r.lapsesOn,
            ignored: r.ignored,
            renewedOn: r.renewedOn,
            daysLeft: r.daysLeft,
            clause: r.clause,
            source: r.source,
          }).toEqual(walkOnLapseRules(input));
        },
      ),
      { numRuns: 500 },
    );
  });
});
