// Sessions: a signed JWT (jsonwebtoken) in an httpOnly, SameSite=Lax cookie naming a row of the sessions
// table (`sid`), read back by a passport-jwt strategy that loads the session and its caller in one
// indexed query on every request — so signing out, a password reset, a deactivation or a role change
// ends the session at once, on every instance. `requireRole` is the one place roles are checked.
import { createSecretKey, type KeyObject } from 'node:crypto';
import type { RequestHandler, Request, Response } from 'express';
import jwt from 'jsonwebtoken';
import passport from 'passport';
import { Strategy as JwtStrategy } from 'passport-jwt';
import type { Role } from '@beadroll/rules';
import type { Config } from '../config.js';
import { AppError } from './errors.js';
import { isUuid, type Actor } from './scope.js';

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    // passport's req.user is our Actor.
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type
    interface User extends Actor {}
  }
}

export const SESSION_COOKIE = 'beadroll_session';
export const SESSION_HOURS = 12;
const ISSUER = 'beadroll';

interface SessionClaims {
  sub: string;
  org: string;
  sid: string;
}

export function signSession(
  config: Pick<Config, 'jwtSecret'>,
  actor: { id: string; organizationId: string },
  sessionId: string,
): string {
  return jwt.sign({ org: actor.organizationId, sid: sessionId }, sessionKey(config.jwtSecret), {
    subject: actor.id,
    issuer: ISSUER,
    algorithm: 'HS256',
    expiresIn: `${SESSION_HOURS}h`,
  });
}

const sessionToken = (req: Request): string | null => {
  const cookies = req.cookies as Record<string, string | undefined> | undefined;
  return cookies?.[SESSION_COOKIE] ?? null;
};

/** The session id of the request's cookie when its signature holds (expired or not), else null. */
export function sessionIdOf(config: Pick<Config, 'jwtSecret'>, req: Request): string | null {
  const token = sessionToken(req);
  if (!token) return null;
  try {
    const claims = jwt.verify(token, config.jwtSecret, {
      issuer: ISSUER,
      algorithms: ['HS256'],
      ignoreExpiration: true,
    }) as Partial<SessionClaims>;
    return typeof claims.sid === 'string' ? claims.sid : null;
  } catch {
    return null;
  }
}

export function setSessionCookie(res: Response, config: Pick<Config, 'appUrl'>, token: string): void {
  res.cookie(SESSION_COOKIE, token, {
    httpOnly: true,
    sameSite: 'lax',
    secure: config.appUrl.startsWith('https://'),
    path: '/',
    maxAge: SESSION_HOURS * 3600 * 1000,
  });
}

export function clearSessionCookie(res: Response, config: Pick<Config, 'appUrl'>): void {
  res.clearCookie(SESSION_COOKIE, {
    httpOnly: true,
    sameSite: 'lax',
    secure: config.appUrl.startsWith('https://'),
    path: '/',
  });
}

// jsonwebtoken turns a string secret into a key on every verify, first trying (and failing) to read it as
// a public key: about a tenth of a simple request's CPU. The key object is made once per secret.
const keys = new Map<string, KeyObject>();
function sessionKey(secret: string): KeyObject {
  let key = keys.get(secret);
  if (!key) {
    key = createSecretKey(Buffer.from(secret, 'utf8'));
    keys.set(secret, key);
  }
  return key;
}

/** A passport instance of our own per app, so that two apps in one process (tests) never share state. */
export function createAuthenticator(
  config: Pick<Config, 'jwtSecret'>,
  /** The caller of an open session, or null when the session has ended or its account cannot sign in. */
  loadActor: (sessionId: string) => Promise<Actor | null>,
) {
  const authenticator = new passport.Passport();
  authenticator.use(
    'jwt',
    new JwtStrategy(
      {
        jwtFromRequest: sessionToken,
        // passport-jwt hands the key to jsonwebtoken as it is; its types only know strings and buffers.
        secretOrKey: sessionKey(config.jwtSecret) as unknown as string,
        issuer: ISSUER,
        algorithms: ['HS256'],
      },
      (claims: SessionClaims, done: (err: unknown, user?: Actor | false) => void) => {
        if (typeof claims.sid !== 'string' || !isUuid(claims.sid)) return done(null, false);
        loadActor(claims.sid).then(
          (actor) =>
            done(null, actor && actor.id === claims.sub && actor.organizationId === claims.org ? actor : false),
          (err: unknown) => done(err),
        );
      },
    ),
  );

  const requireAuth: RequestHandler = (req, res, next) => {
    const handler = authenticator.authenticate(
      'jwt',
      { session: false },
      (err: unknown, user: Actor | false) => {
        if (err) return next(err);
        if (!user) return next(new AppError('unauthenticated', 'Sign in to continue'));
        req.user = user;
        next();
      },
    ) as RequestHandler;
    handler(req, res, next);
  };
  return { initialize: authenticator.initialize() as RequestHandler, requireAuth };
}

export function requireRole(...roles: Role[]): RequestHandler {
  return (req, _res, next) => {
    if (!req.user) return next(new AppError('unauthenticated', 'Sign in to continue'));
    if (!roles.includes(req.user.role)) return next(AppError.forbidden());
    next();
  };
}

/** The caller of an authenticated route. */
export function actorOf(req: Request): Actor {
  if (!req.user) throw new AppError('unauthenticated', 'Sign in to continue');
  return req.user;
}
