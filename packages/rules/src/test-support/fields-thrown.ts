// Test helper: the field paths named by the RulesInputError a call throws (fails the test if it does not).
import { expect } from 'vitest';
import { RulesInputError } from '../validation/rules-input-error.js';

export function fieldsThrown(fn: () => unknown): string[] {
  try {
    fn();
  } catch (e) {
    expect(e).toBeInstanceOf(RulesInputError);
    return Object.keys((e as RulesInputError).fields);
  }
  throw new Error('expected a RulesInputError');
}
