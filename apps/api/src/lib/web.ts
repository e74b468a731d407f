// Serves the built web app (apps/web/dist) from the API's origin, with the SPA fallback: every GET that
// is not an API route and not a file gets index.html, so deep links like /welders/123 load the app.
// The build writes a brotli (.br) and a gzip (.gz) copy of every asset once; they are sent as they are,
// so no request spends CPU compressing JavaScript. Content-hashed files under assets/ never change and
// are cached for good; the HTML shell names the current hashes, so a browser revalidates it every time.
import { existsSync } from 'node:fs';
import path from 'node:path';
import type { Express } from 'express';
import expressStaticGzip from 'express-static-gzip';

export const IMMUTABLE = 'public, max-age=31536000, immutable';
export const SHELL = 'no-cache';

export function mountWeb(app: Express, dir: string): void {
  const index = path.join(dir, 'index.html');
  const assets = `${path.sep}assets${path.sep}`;
  app.use(
    expressStaticGzip(dir, {
      enableBrotli: true,
      orderPreference: ['br', 'gzip'],
      index: false,
      serveStatic: {
        index: false,
        setHeaders(res, file) {
          if (file.includes(assets)) res.setHeader('Cache-Control', IMMUTABLE);
          else if (/\.html(\.(br|gz))?$/.test(file)) res.setHeader('Cache-Control', SHELL);
          else res.setHeader('Cache-Control', 'public, max-age=3600');
        },
      },
    }),
  );
  app.use((req, res, next) => {
    if (
      (req.method !== 'GET' && req.method !== 'HEAD') ||
      req.path === '/api' ||
      req.path.startsWith('/api/') ||
      // A file of an older build that is gone: a 404, not the HTML shell in place of a script.
      req.path.startsWith('/assets/')
    )
      return next();
    if (!existsSync(index)) return next();
    res.setHeader('Cache-Control', SHELL);
    res.sendFile(index, (err) => {
      if (err) next(err);
    });
  });
}
