// The routes an Express 5 app really serves, read from its router stack (so a route nobody documented
// still shows up): [{ method, path }] with Express `:param` paths, under the given mount prefix.
import type { Express } from 'express';

interface Layer {
  route?: { path: string | string[]; methods: Record<string, boolean> };
  handle?: { stack?: Layer[] };
  rawPath?: string | string[];
}

export interface ServedRoute {
  method: string;
  path: string;
}

function walk(stack: Layer[], prefix: string, out: ServedRoute[]) {
  for (const layer of stack) {
    if (layer.route) {
      const paths = Array.isArray(layer.route.path) ? layer.route.path : [layer.route.path];
      for (const p of paths)
        for (const [method, on] of Object.entries(layer.route.methods))
          if (on && method !== '_all') out.push({ method, path: `${prefix}${p === '/' ? '' : p}` || '/' });
    } else if (layer.handle?.stack) {
      const raw = layer.rawPath;
      const mounts = raw === undefined ? [''] : Array.isArray(raw) ? raw : [raw];
      for (const m of mounts) walk(layer.handle.stack, `${prefix}${m === '/' ? '' : m}`, out);
    }
  }
}

export function servedRoutes(app: Express, under = ''): ServedRoute[] {
  const out: ServedRoute[] = [];
  const stack = (app as unknown as { router: { stack: Layer[] } }).router.stack;
  walk(stack, '', out);
  const unique = new Map(out.map((r) => [`${r.method} ${r.path}`, r]));
  return [...unique.values()]
    .filter((r) => r.path.startsWith(under))
    .map((r) => ({ method: r.method, path: r.path.slice(under.length) || '/' }));
}
