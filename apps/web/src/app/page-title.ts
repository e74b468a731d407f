// The browser tab names the page (issue 10, item 15): "Welders · Beadroll", from the titles in
// config/paths.ts, set by the router on every navigation.
import { matchPath } from 'react-router-dom';
import { paths } from '@/config/paths';

// Fixed paths before patterns, so /coupons/new is "Record a coupon", not the coupon /coupons/:id.
const ranked = Object.values(paths).sort(
  (a, b) => (a.path.includes(':') ? 1 : 0) - (b.path.includes(':') ? 1 : 0),
);

export function pageTitle(pathname: string): string {
  const route = ranked.find((p) => matchPath(p.path, pathname));
  return `${route ? route.title : 'Page not found'} · Beadroll`;
}
