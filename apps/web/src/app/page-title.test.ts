import { describe, expect, it } from 'vitest';
import { paths } from '@/config/paths';
import { pageTitle } from './page-title';

describe('pageTitle', () => {
  it('names every page of the app differently', () => {
    const titles = Object.values(paths).map((p) => p.title);
    expect(new Set(titles).size).toBe(titles.length);
    for (const t of titles) expect(t.trim()).not.toBe('');
  });

  it('names the page of a path, fixed paths before patterns', () => {
    expect(pageTitle('/welders')).toBe('Welders · Beadroll');
    expect(pageTitle('/welders/3f1c2b9e-0000-4000-8000-000000000000')).toBe('Welder file · Beadroll');
    expect(pageTitle('/coupons/new')).toBe('Record a coupon · Beadroll');
    expect(pageTitle('/coupons/3f1c2b9e-0000-4000-8000-000000000000')).toBe('Coupon · Beadroll');
    expect(pageTitle('/sign-in')).toBe('Sign in · Beadroll');
    expect(pageTitle('/')).toBe('Overview · Beadroll');
    expect(pageTitle('/no/such/page')).toBe('Page not found · Beadroll');
  });
});
