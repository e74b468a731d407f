import { addDays, addMonths, formatISO, min, parseISO, startOfMonth } from 'date-fns';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { addDays as addDaysHere } from './calendar.js';
import { continuityStatus } from './continuity-status.js';
import { lapseRuleFor, lapseRules, lapsesOnFor, type LapseRule } from './lapse-rules.js';

const iso = (d: Date): string => formatISO(d, { representation: 'date' });

// The rule data read the way the API's SQL reads it, computed with date-fns instead of our own helpers.
function fromData(rule: LapseRule, last: string, lastTest: string): string {
  const start = rule.fromMonthStart ? startOfMonth(parseISO(last)) : parseISO(last);
  const fromUse = addDays(addMonths(start, rule.months), rule.days);
  if (rule.revalidationMonths === null) return iso(fromUse);
  return iso(min([fromUse, addMonths(parseISO(lastTest), rule.revalidationMonths)]));
}

const arbDate = fc.integer({ min: 0, max: 12 * 366 }).map((n) => addDaysHere('2020-01-01', n));
const rules: LapseRule[] = [
  ...Object.values(lapseRules),
  lapseRuleFor('api-1104', { cfrMonthCounting: 'same-day' }),
  lapseRuleFor('iso-9606-1', { isoRevalidation: '9.3b' }),
  lapseRuleFor('iso-9606-1', { isoRevalidation: '9.3c' }),
];

describe('lapse rules as data', () => {
  it('date-fns 4.4.0 (npm): months, days and month-start of each rule give the same lapsesOn as the function', () => {
    for (const rule of rules)
      fc.assert(
        fc.property(arbDate, fc.integer({ min: 0, max: 2000 }), (last, back) => {
          const lastTest = addDaysHere(last, -back);
          expect(lapsesOnFor(rule, last, lastTest)).toBe(fromData(rule, last, lastTest));
        }),
      );
  });

  it('continuityStatus uses the same rule: a qualification with no later evidence lapses on lapsesOnFor(qualifiedOn)', () => {
    fc.assert(
      fc.property(fc.constantFrom(...Object.values(lapseRules)), arbDate, (rule, qualifiedOn) => {
        expect(
          continuityStatus({ code: rule.code, qualifiedOn, evidence: [], asOf: qualifiedOn }).lapsesOn,
        ).toBe(lapsesOnFor(rule, qualifiedOn));
      }),
    );
  });

  it('each rule names its clause, its source kind and a PostgreSQL expression', () => {
    expect(lapseRules['asme-ix'].source).toBe('from memory: QW-322.1(a)');
    expect(lapseRules['api-1104'].source).toBe('regulation: 49 CFR 192.229(b)');
    for (const rule of rules) {
      expect(rule.sql).toMatch(/:last::date/);
      expect(rule.clause.length).toBeGreaterThan(3);
    }
    expect(lapseRules['iso-9606-1'].sql).toMatch(/:lastTest::date \+ interval '3 years'/);
  });
});
