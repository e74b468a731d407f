// Forged requests (issue 11, finding 2). SameSite=Lax keeps the session cookie off most cross-site
// requests, but not all (a top-level form POST from a sibling site, older browsers); and routes with no
// body or a multipart body cannot lean on the JSON content type. So every state-changing request is
// checked for where it came from:
// - `Origin` present: it must be this app's own origin (APP_URL, or the Host the request was sent to);
// - no `Origin`: a browser's `Sec-Fetch-Site`, when sent, must say same-origin (or none: typed by the
//   user); a request with neither header comes from a program, not a page, and carries no ambient
//   authority a page could borrow;
// - `Authorization` present (an API token): exempt. A page on another site cannot attach that header
//   without a CORS preflight, which this API never grants, and such a request is judged by its token
//   alone, never by a cookie riding along (api-tokens/bearer.ts).
// Refused requests answer 403 before any route runs.
import type { Request, RequestHandler } from 'express';
import type { Config } from '../config.js';
import { AppError } from './errors.js';

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

function ownOrigin(req: Request): string | null {
  const host = req.get('host');
  return host ? `${req.protocol}://${host}` : null;
}

export function crossSiteReason(req: Request, appOrigin: string): string | null {
  if (SAFE_METHODS.has(req.method)) return null;
  if (req.headers.authorization !== undefined) return null;
  const origin = req.get('origin');
  if (origin !== undefined) {
    if (origin === appOrigin || origin === ownOrigin(req)) return null;
    return `origin ${origin}`;
  }
  const site = req.get('sec-fetch-site');
  if (site !== undefined && site !== 'same-origin' && site !== 'none') return `sec-fetch-site ${site}`;
  return null;
}

export function refuseCrossSite(config: Pick<Config, 'appUrl'>): RequestHandler {
  const appOrigin = new URL(config.appUrl).origin;
  return (req, _res, next) => {
    const reason = crossSiteReason(req, appOrigin);
    if (reason === null) return next();
    req.log.warn({ reason }, 'refused a cross-site request');
    next(AppError.forbidden('This request came from another site and was refused'));
  };
}
