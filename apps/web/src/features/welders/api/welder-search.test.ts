import { describe, expect, it } from 'vitest';
import { defaultWelderFilters, readWelderSearch, writeWelderSearch } from './welder-search';

const shopId = '7b0c7f3e-2b7a-4d37-9b8e-2a4f1e0c9d11';

describe('Welders table state in the URL', () => {
  it('reads the defaults from a bare /welders and writes nothing back', () => {
    const filters = readWelderSearch(new URLSearchParams());
    expect(filters).toEqual(defaultWelderFilters);
    expect(filters).toMatchObject({ sort: 'stamp', dir: 'asc', page: 1, pageSize: 25, status: 'active' });
    expect(writeWelderSearch(filters).toString()).toBe('');
  });

  it('round-trips a bookmarked view', () => {
    const params = writeWelderSearch({ q: 'okon', shopId, sort: 'name', dir: 'desc', page: 2 });
    expect(params.toString()).toBe(`q=okon&shopId=${shopId}&sort=name&dir=desc&page=2`);
    expect(readWelderSearch(params)).toEqual({ ...defaultWelderFilters, q: 'okon', shopId, sort: 'name', dir: 'desc', page: 2 });
  });

  it('falls back per parameter when a hand-edited URL has a bad value', () => {
    const filters = readWelderSearch(new URLSearchParams('sort=colour&dir=up&page=-3&pageSize=5000&shopId=PV&q=ST-1'));
    expect(filters).toEqual({ ...defaultWelderFilters, q: 'ST-1' });
  });
});
