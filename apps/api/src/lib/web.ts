// Serves the built web app (apps/web/dist) from the API's origin, with the SPA fallback: every GET that
// is not an API route and not a file gets index.html, so deep links like /welders/123 load the app.
import { existsSync } from 'node:fs';
import path from 'node:path';
import express, { type Express } from 'express';

export function mountWeb(app: Express, dir: string): void {
  const index = path.join(dir, 'index.html');
  app.use(
    express.static(dir, {
      index: false,
      setHeaders(res, file) {
        // Vite puts content-hashed files under assets/: safe to cache for good.
        if (file.includes(`${path.sep}assets${path.sep}`))
          res.setHeader('Cache-Control', 'public, max-age=31536000, immutable');
      },
    }),
  );
  app.use((req, res, next) => {
    if (
      (req.method !== 'GET' && req.method !== 'HEAD') ||
      req.path === '/api' ||
      req.path.startsWith('/api/')
    )
      return next();
    if (!existsSync(index)) return next();
    res.setHeader('Cache-Control', 'no-cache');
    res.sendFile(index, (err) => {
      if (err) next(err);
    });
  });
}
