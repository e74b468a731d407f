// The Welders table's state lives in the URL (so a view can be bookmarked and shared). These two
// functions translate between the search params and the list query the API takes; defaults stay out
// of the URL so the plain /welders address is the default view.
import { welderListQuery, type welderSortKeys } from '@beadroll/rules';
import type { z } from 'zod';

export type WelderFilters = z.output<typeof welderListQuery>;
export type WelderSortKey = (typeof welderSortKeys)[number];

const defaults = welderListQuery.parse({});

/** Reads each param on its own, so one bad value (a hand-edited URL) falls back to its default only. */
export function readWelderSearch(params: URLSearchParams): WelderFilters {
  const shape = welderListQuery.shape;
  const pick = <K extends keyof WelderFilters>(key: K): WelderFilters[K] => {
    const raw = params.get(key);
    if (raw === null || raw === '') return defaults[key];
    const parsed = shape[key].safeParse(raw);
    return (parsed.success ? parsed.data : defaults[key]) as WelderFilters[K];
  };
  const q = pick('q');
  return {
    q: q === '' ? undefined : q,
    shopId: pick('shopId'),
    state: pick('state'),
    status: pick('status'),
    sort: pick('sort'),
    dir: pick('dir'),
    page: pick('page'),
    pageSize: pick('pageSize'),
  };
}

export function writeWelderSearch(filters: Partial<WelderFilters>): URLSearchParams {
  const params = new URLSearchParams();
  const merged = { ...defaults, ...filters };
  for (const key of ['q', 'shopId', 'state', 'status', 'sort', 'dir', 'page', 'pageSize'] as const) {
    const value = merged[key];
    if (value === undefined || value === '' || value === defaults[key]) continue;
    params.set(key, String(value));
  }
  return params;
}

export const defaultWelderFilters: WelderFilters = defaults;
