import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { continuityInputSchema, type ContinuityInput } from '../schemas/continuity.js';
import { RulesInputError } from '../validation/rules-input-error.js';
import { addDays } from './calendar.js';
import { continuityStatus } from './continuity-status.js';
import { lapseRules } from './lapse-rules.js';
import { fieldsThrown } from '../test-support/fields-thrown.js';

const use = (date: string) => ({ date, kind: 'use' as const });
const test = (date: string) => ({ date, kind: 'test' as const });
const status = (input: Partial<ContinuityInput> & Pick<ContinuityInput, 'code'>) =>
  continuityStatus({ qualifiedOn: '2025-01-15', evidence: [], asOf: '2025-02-01', ...input });

describe('asme-ix', () => {
  it('from memory: QW-322.1(a) — 6 months or more without the process: lapses on last use + 6 calendar months', () => {
    const r = status({ code: 'asme-ix', evidence: [use('2025-03-10')], asOf: '2025-04-01' });
    expect(r.lapsesOn).toBe('2025-09-10');
    expect(r.lastEvidence).toBe('2025-03-10');
    expect(r.state).toBe('current');
  });

  it('from memory: QW-322.1(a) — the day before lapsesOn is still in force, lapsesOn itself is lapsed', () => {
    const base = { code: 'asme-ix' as const, evidence: [use('2025-03-10')] };
    expect(status({ ...base, asOf: '2025-09-09' })).toMatchObject({ state: 'lapsing', daysLeft: 1 });
    expect(status({ ...base, asOf: '2025-09-10' })).toMatchObject({ state: 'lapsed', daysLeft: 0 });
    expect(status({ ...base, asOf: '2025-09-11' })).toMatchObject({ state: 'lapsed', daysLeft: -1 });
  });

  it('from memory: QW-322.1(a) — use on the day before lapse counts; use on lapsesOn does not', () => {
    const kept = status({ code: 'asme-ix', evidence: [use('2025-07-14')], asOf: '2025-08-01' });
    expect(kept.lapsesOn).toBe('2026-01-14');
    const late = status({ code: 'asme-ix', evidence: [use('2025-07-15')], asOf: '2025-08-01' });
    expect(late).toMatchObject({ state: 'lapsed', lapsesOn: '2025-07-15', ignored: ['2025-07-15'] });
  });

  it('from memory: QW-322.1(a) — month ends clamp: use on Aug 31 lapses Feb 28, or Feb 29 in a leap year', () => {
    expect(status({ code: 'asme-ix', qualifiedOn: '2025-08-31', asOf: '2025-09-01' }).lapsesOn).toBe(
      '2026-02-28',
    );
    expect(status({ code: 'asme-ix', qualifiedOn: '2023-08-31', asOf: '2023-09-01' }).lapsesOn).toBe(
      '2024-02-29',
    );
  });
});

describe('aws-d1.1', () => {
  it('from memory: AWS D1.1 4.2.3.1 (2015) — a period exceeding six months: lapses the day after last use + 6 months', () => {
    const r = status({ code: 'aws-d1.1', evidence: [use('2025-03-10')], asOf: '2025-09-10' });
    expect(r).toMatchObject({ lapsesOn: '2025-09-11', state: 'lapsing', daysLeft: 1 });
    expect(status({ code: 'aws-d1.1', evidence: [use('2025-03-10')], asOf: '2025-09-11' }).state).toBe(
      'lapsed',
    );
  });

  it('from memory: AWS D1.1 4.2.3.1 (2015) — month ends: Aug 31 + 6 months = Feb 28, so lapses Mar 1 (Feb 29 + 1 in a leap year)', () => {
    expect(status({ code: 'aws-d1.1', qualifiedOn: '2025-08-31', asOf: '2025-09-01' }).lapsesOn).toBe(
      '2026-03-01',
    );
    expect(status({ code: 'aws-d1.1', qualifiedOn: '2023-08-31', asOf: '2023-09-01' }).lapsesOn).toBe(
      '2024-03-01',
    );
    expect(status({ code: 'aws-d1.1', qualifiedOn: '2023-08-29', asOf: '2023-09-01' }).lapsesOn).toBe(
      '2024-03-01',
    );
  });
});

describe('api-1104 (49 CFR 192.229(b))', () => {
  it('regulation: 49 CFR 192.229(b) — use in January counts through July 31: lapses August 1', () => {
    for (const day of ['2025-01-01', '2025-01-15', '2025-01-31'])
      expect(status({ code: 'api-1104', qualifiedOn: day, asOf: '2025-02-01' }).lapsesOn).toBe('2025-08-01');
    expect(status({ code: 'api-1104', qualifiedOn: '2025-01-20', asOf: '2025-07-31' })).toMatchObject({
      state: 'lapsing',
      daysLeft: 1,
    });
    expect(status({ code: 'api-1104', qualifiedOn: '2025-01-20', asOf: '2025-08-01' }).state).toBe('lapsed');
  });

  it('regulation: 49 CFR 192.229(b) — year end: use in December counts through June 30', () => {
    expect(status({ code: 'api-1104', qualifiedOn: '2025-12-31', asOf: '2026-01-01' }).lapsesOn).toBe(
      '2026-07-01',
    );
  });

  it('regulation: 49 CFR 192.229(b) — the counting can be set to same-day six months', () => {
    const r = status({
      code: 'api-1104',
      qualifiedOn: '2025-01-20',
      asOf: '2025-02-01',
      cfrMonthCounting: 'same-day',
    });
    expect(r.lapsesOn).toBe('2025-07-20');
  });
});

describe('iso-9606-1', () => {
  it('from memory: ISO 9606-1 9.2 — confirmation every six months', () => {
    const r = status({
      code: 'iso-9606-1',
      qualifiedOn: '2024-01-10',
      evidence: [use('2024-06-01')],
      asOf: '2024-07-01',
    });
    expect(r.lapsesOn).toBe('2024-12-01');
  });

  it('from memory: ISO 9606-1 9.3 a (Beadroll default) — retest every 3 years even when confirmed', () => {
    const monthly = Array.from({ length: 40 }, (_, i) =>
      use(`20${24 + Math.floor(i / 12)}-${String((i % 12) + 1).padStart(2, '0')}-05`),
    );
    const r = status({
      code: 'iso-9606-1',
      qualifiedOn: '2024-01-10',
      evidence: monthly,
      asOf: '2026-12-01',
    });
    expect(r.lapsesOn).toBe('2027-01-10');
    const after = status({
      code: 'iso-9606-1',
      qualifiedOn: '2024-01-10',
      evidence: monthly,
      asOf: '2027-04-01',
    });
    expect(after.state).toBe('lapsed');
    // the first entry predates the test; those after the revalidation date cannot count either
    expect(after.ignored).toEqual(['2024-01-05', '2027-02-05', '2027-03-05']);
  });

  it('from memory: ISO 9606-1 9.3 b — every 2 years; 9.3 c — no revalidation date while confirmed', () => {
    const evidence = [use('2024-12-01'), use('2025-05-01'), use('2025-10-01'), use('2026-03-01')];
    const b = status({
      code: 'iso-9606-1',
      qualifiedOn: '2024-07-01',
      evidence,
      asOf: '2026-05-02',
      isoRevalidation: '9.3b',
    });
    expect(b.lapsesOn).toBe('2026-07-01');
    const c = status({
      code: 'iso-9606-1',
      qualifiedOn: '2024-07-01',
      evidence,
      asOf: '2026-05-02',
      isoRevalidation: '9.3c',
    });
    expect(c.lapsesOn).toBe('2026-09-01');
  });

  it('from memory: ISO 9606-1 9.3 — a retest while valid restarts the revalidation period; leap day clamps', () => {
    const r = status({
      code: 'iso-9606-1',
      qualifiedOn: '2021-02-28',
      evidence: [use('2021-08-01'), test('2022-01-15'), use('2022-06-01'), use('2022-11-01')],
      asOf: '2022-12-01',
    });
    expect(r).toMatchObject({ lastTest: '2022-01-15', lapsesOn: '2023-05-01' });
    expect(
      status({ code: 'iso-9606-1', qualifiedOn: '2024-02-29', asOf: '2024-03-01', isoRevalidation: '9.3a' })
        .lapsesOn,
    ).toBe('2024-08-29');
  });
});

describe('lapse, renewal and use after lapse', () => {
  it('from memory: QW-322.2(a) — a passing test after a lapse renews; use logged during the lapse is ignored', () => {
    const r = status({
      code: 'asme-ix',
      qualifiedOn: '2024-01-10',
      evidence: [
        use('2024-03-01'),
        use('2024-10-01'),
        use('2024-11-15'),
        test('2025-01-20'),
        use('2025-03-01'),
      ],
      asOf: '2025-04-01',
    });
    expect(r).toMatchObject({
      state: 'current',
      lastEvidence: '2025-03-01',
      lastTest: '2025-01-20',
      lapsesOn: '2025-09-01',
      ignored: ['2024-10-01', '2024-11-15'],
      renewedOn: ['2025-01-20'],
    });
  });

  it('from memory: QW-322.2(a) — use logged after a lapse, without a test, leaves it lapsed and is flagged', () => {
    const r = status({
      code: 'asme-ix',
      qualifiedOn: '2024-01-10',
      evidence: [use('2024-08-01'), use('2024-09-01')],
      asOf: '2024-10-01',
    });
    expect(r).toMatchObject({
      state: 'lapsed',
      lapsesOn: '2024-07-10',
      lastEvidence: '2024-01-10',
      ignored: ['2024-08-01', '2024-09-01'],
    });
    expect(r.daysLeft).toBeLessThan(0);
  });

  it('a test and a use on the same day after a lapse: the test renews and the use counts', () => {
    const r = status({
      code: 'asme-ix',
      qualifiedOn: '2024-01-10',
      evidence: [use('2024-09-01'), test('2024-09-01')],
      asOf: '2024-10-01',
    });
    expect(r).toMatchObject({
      state: 'current',
      ignored: [],
      renewedOn: ['2024-09-01'],
      lapsesOn: '2025-03-01',
    });
  });

  it('evidence in any order gives the same answer; evidence after asOf plays no part', () => {
    const evidence = [use('2025-05-01'), use('2025-03-01'), use('2025-04-01'), use('2025-12-01')];
    const r = status({ code: 'asme-ix', evidence, asOf: '2025-06-01' });
    expect(r).toMatchObject({ lastEvidence: '2025-05-01', lapsesOn: '2025-11-01', ignored: [] });
  });

  it('evidence dated before the qualification cannot count', () => {
    expect(status({ code: 'asme-ix', evidence: [use('2024-12-01')] }).ignored).toEqual(['2024-12-01']);
  });
});

describe('revocation', () => {
  it('from memory: QW-322.1(b) — revocation wins from its date on; later use and tests do not count', () => {
    const r = status({
      code: 'asme-ix',
      qualifiedOn: '2025-01-15',
      evidence: [use('2025-02-01'), use('2025-03-01'), test('2025-03-10')],
      revokedOn: '2025-03-01',
      asOf: '2025-04-01',
    });
    expect(r).toMatchObject({
      state: 'revoked',
      lapsesOn: '2025-03-01',
      lastEvidence: '2025-02-01',
      ignored: ['2025-03-01', '2025-03-10'],
    });
  });

  it('from memory: QW-322.1(b) — before the revocation date the qualification is in force, and lapses on it', () => {
    const r = status({ code: 'asme-ix', revokedOn: '2025-03-01', asOf: '2025-02-20' });
    expect(r).toMatchObject({ state: 'lapsing', lapsesOn: '2025-03-01', daysLeft: 9 });
  });
});

describe('warning lead time', () => {
  it('lapsing within warnDays (default 30), current before', () => {
    const base = { code: 'asme-ix' as const, qualifiedOn: '2025-01-15' };
    expect(status({ ...base, asOf: '2025-06-14' })).toMatchObject({ state: 'current', daysLeft: 31 });
    expect(status({ ...base, asOf: '2025-06-15' })).toMatchObject({ state: 'lapsing', daysLeft: 30 });
    expect(status({ ...base, asOf: '2025-05-01', warnDays: 75 }).state).toBe('lapsing');
    expect(status({ ...base, asOf: '2025-07-14', warnDays: 0 }).state).toBe('current');
  });
});

describe('input validation', () => {
  it.each([
    [{ code: 'asme-ix', qualifiedOn: '2025-02-30', evidence: [], asOf: '2025-03-01' }, 'qualifiedOn'],
    [
      {
        code: 'asme-ix',
        qualifiedOn: '2025-02-01',
        evidence: [{ date: '2025-13-01', kind: 'use' }],
        asOf: '2025-03-01',
      },
      'evidence.0.date',
    ],
    [
      {
        code: 'asme-ix',
        qualifiedOn: '2025-02-01',
        evidence: [{ date: '2025-03-01', kind: 'weld' }],
        asOf: '2025-03-01',
      },
      'evidence.0.kind',
    ],
    [{ code: 'asme-ix', qualifiedOn: '2025-02-01', evidence: [], asOf: '2025-01-01' }, 'asOf'],
    [
      {
        code: 'asme-ix',
        qualifiedOn: '2025-02-01',
        evidence: [],
        asOf: '2025-03-01',
        revokedOn: '2025-01-01',
      },
      'revokedOn',
    ],
    [{ code: 'aws', qualifiedOn: '2025-02-01', evidence: [], asOf: '2025-03-01' }, 'code'],
    [{ code: 'asme-ix', qualifiedOn: '2025-02-01', evidence: 'none', asOf: '2025-03-01' }, 'evidence'],
  ])('throws a RulesInputError naming the field (%#)', (input, field) => {
    expect(fieldsThrown(() => continuityStatus(input as unknown as ContinuityInput))).toContain(field);
  });
});

// ---- properties -------------------------------------------------------------------------------------

const arbDate = fc.integer({ min: 0, max: 3 * 366 }).map((n) => addDays('2024-01-01', n));
const arbEvidence = fc.record({
  date: arbDate,
  kind: fc.constantFrom<'use' | 'test'>('use', 'use', 'use', 'test'),
});
const arbCode = fc.constantFrom(...(Object.keys(lapseRules) as Array<keyof typeof lapseRules>));

describe('properties', () => {
  it('property: more evidence never makes lapsesOn earlier', () => {
    fc.assert(
      fc.property(
        arbCode,
        fc.array(arbEvidence, { maxLength: 30 }),
        fc.array(arbEvidence, { minLength: 1, maxLength: 10 }),
        arbDate,
        (code, evidence, more, asOf) => {
          const input = {
            code,
            qualifiedOn: '2024-01-01',
            evidence,
            asOf: asOf < '2024-01-01' ? '2024-01-01' : asOf,
          };
          const before = continuityStatus(input);
          const after = continuityStatus({ ...input, evidence: [...evidence, ...more] });
          expect(after.lapsesOn >= before.lapsesOn).toBe(true);
        },
      ),
    );
  });

  it('property: the answer does not depend on the order of the evidence', () => {
    fc.assert(
      fc.property(arbCode, fc.array(arbEvidence, { maxLength: 30 }), arbDate, (code, evidence, asOf) => {
        const input = { code, qualifiedOn: '2024-01-01', evidence, asOf };
        expect(continuityStatus({ ...input, evidence: [...evidence].reverse() })).toEqual(
          continuityStatus(input),
        );
      }),
    );
  });

  it('property: the hand check of evidence never accepts what the schema rejects', () => {
    const arbLoose = fc.record({
      date: fc.oneof(
        arbDate,
        fc.string({ maxLength: 12 }),
        fc.constantFrom('2025-02-29', '2024-02-29', '1899-12-31', '2025-1-01'),
      ),
      kind: fc.oneof(fc.constantFrom('use', 'test'), fc.string({ maxLength: 5 })),
    });
    fc.assert(
      fc.property(fc.array(arbLoose, { maxLength: 5 }), (evidence) => {
        const input = { code: 'asme-ix', qualifiedOn: '2024-01-01', evidence, asOf: '2027-01-01' };
        const schemaOk = continuityInputSchema.safeParse(input).success;
        let ok = true;
        try {
          continuityStatus(input as ContinuityInput);
        } catch (e) {
          expect(e).toBeInstanceOf(RulesInputError);
          ok = false;
        }
        expect(ok).toBe(schemaOk);
      }),
    );
  });
});
