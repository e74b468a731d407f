// `Authorization: Bearer <API token>` in front of the session check. A request that presents a bearer
// token is judged by that token alone (never by a cookie riding along); one without goes to the session
// check unchanged. Read-only tokens may only read.
import type { RequestHandler } from 'express';
import type { AppDeps } from '../lib/context.js';
import { AppError } from '../lib/errors.js';
import { actorOfToken } from './api-tokens.service.js';

const READ_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

export function bearerToken(header: string | undefined): string | null {
  if (!header) return null;
  const m = /^Bearer\s+(\S+)\s*$/i.exec(header);
  return m ? m[1]! : null;
}

export function withApiTokens(deps: AppDeps, requireSession: RequestHandler): RequestHandler {
  return (req, res, next) => {
    const header = req.headers.authorization;
    if (header === undefined) return requireSession(req, res, next);
    const token = bearerToken(header);
    if (!token) return next(new AppError('unauthenticated', 'Send the API token as "Authorization: Bearer <token>"'));
    actorOfToken(deps, token).then((actor) => {
      if (!actor) return next(new AppError('unauthenticated', 'This API token is not valid or has been revoked'));
      if (actor.apiToken?.access === 'read' && !READ_METHODS.has(req.method))
        return next(AppError.forbidden('This API token may only read'));
      req.user = actor;
      next();
    }, next);
  };
}

/** For routes only a signed-in person may use (managing tokens, imports): refuses API tokens. */
export const refuseApiTokens: RequestHandler = (req, _res, next) => {
  if (req.user?.apiToken) return next(AppError.forbidden('An API token cannot do this; sign in instead'));
  next();
};

/** Mounted in front of areas that belong to people only (sign-ins and accounts): no bearer token at all. */
export const refuseBearer: RequestHandler = (req, _res, next) => {
  if (req.headers.authorization !== undefined)
    return next(AppError.forbidden('An API token cannot manage people or sign-ins; sign in instead'));
  next();
};
