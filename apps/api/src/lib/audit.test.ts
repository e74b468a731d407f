import { describe, expect, it } from 'vitest';
import { diff } from './audit.js';

describe('diff', () => {
  it('keeps only the fields that changed, on both sides', () => {
    const d = diff({ name: 'A', active: true, shopIds: ['x'] }, { name: 'B', active: true, shopIds: ['x'] });
    expect(d).toEqual({ before: { name: 'A' }, after: { name: 'B' }, changed: ['name'] });
  });

  it('compares arrays by value and reports nothing for an unchanged record', () => {
    expect(diff({ shopIds: ['a', 'b'] }, { shopIds: ['a', 'b'] }).changed).toEqual([]);
    expect(diff({ shopIds: ['a'] }, { shopIds: ['b'] }).after).toEqual({ shopIds: ['b'] });
  });
});
