import { describe, expect, it } from 'vitest';
import { actionLabel, describeChanges } from './audit-changes';

describe('describeChanges', () => {
  it('lists only the fields that changed, naming shops by code and name, hiding bookkeeping', () => {
    const before = { stamp: 'PV-07', homeShop: { id: 'a', code: 'PV', name: 'Bay' }, version: 3 };
    const after = { stamp: 'PV-07', homeShop: { id: 'b', code: 'ST', name: 'Hall' }, version: 4 };
    expect(describeChanges(before, after)).toEqual([{ field: 'homeShop', from: 'PV · Bay', to: 'ST · Hall' }]);
  });

  it('names shops by code and name when their ids are known', () => {
    const names = new Map([['id-pv', 'PV · Bay'], ['id-st', 'ST · Hall']]);
    expect(describeChanges({ homeShopId: 'id-pv' }, { homeShopId: 'id-st' }, names)).toEqual([{ field: 'homeShopId', from: 'PV · Bay', to: 'ST · Hall' }]);
  });

  it('treats a missing side as empty', () => {
    expect(describeChanges(null, { email: 'a@b.example' })).toEqual([{ field: 'email', from: '—', to: 'a@b.example' }]);
  });

  it('words an action', () => {
    expect(actionLabel('welder.moved')).toBe('Welder moved');
  });
});
