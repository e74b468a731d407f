// createApp(deps): the whole HTTP application, without listening — main.ts serves it, tests drive it
// with supertest. Every dependency (database, mail, object store, clock, logger) comes in from outside.
import { randomUUID } from 'node:crypto';
import express, { Router, type Express } from 'express';
import helmet from 'helmet';
import cookieParser from 'cookie-parser';
import compression from 'compression';
import { pinoHttp } from 'pino-http';
import type { AppDeps } from './lib/context.js';
import { apiNotFound, errorHandler } from './lib/errors.js';
import { createAuthenticator } from './lib/auth.js';
import { refuseUnsafeText } from './lib/input-guard.js';
import { refuseCrossSite } from './lib/csrf.js';
import { mountWeb } from './lib/web.js';
import { loadSessionActor } from './auth/auth.repository.js';
import { healthRouter } from './health/health.router.js';
import { authRouter } from './auth/auth.router.js';
import { shopsRouter } from './shops/shops.router.js';
import { peopleRouter } from './people/people.router.js';
import { weldersRouter } from './welders/welders.router.js';
import { auditRouter } from './audit/audit.router.js';
import { devMailRouter } from './dev-mail/dev-mail.router.js';
import { uploadsRouter } from './uploads/uploads.router.js';
import { proceduresRouter } from './procedures/procedures.router.js';
import { couponsRouter } from './coupons/coupons.router.js';
import { qualificationsRouter, welderCardRouter } from './qualifications/qualifications.router.js';
import { verifyRouter, verifyTokenRouter } from './verify/verify.router.js';
import { weldsRouter } from './welds/welds.router.js';
import { continuityRouter, gridSaveBodyParser, welderTimelineRouter } from './continuity/continuity.router.js';
import { settingsRouter } from './settings/settings.router.js';
import { lapseWatchRouter } from './lapse-watch/lapse-watch.router.js';
import { overviewRouter } from './overview/overview.router.js';
import { refuseBearer, withApiTokens } from './api-tokens/bearer.js';
import { apiTokensRouter } from './api-tokens/api-tokens.router.js';
import { openApiRouter } from './openapi/openapi.router.js';
import { importsRouter } from './imports/imports.router.js';
import { paperRecordsRouter } from './imports/paper-records.router.js';
import { reportsRouter } from './reports/reports.router.js';
import { welderQualifiedOnRouter } from './qualified-on/qualified-on.router.js';
import { crewFinderRouter } from './crew-finder/crew-finder.router.js';

export interface CreateAppOptions extends AppDeps {
  /** Folder of the built web app to serve with SPA fallback; omitted in API-only tests. */
  webDist?: string;
}

const JSON_LIMIT = '100kb';

export function createApp(opts: CreateAppOptions): Express {
  const { webDist, ...deps } = opts;
  const { config, logger, dataSource } = deps;
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', config.trustProxy);

  app.use(
    pinoHttp({
      logger,
      genReqId(req, res) {
        const incoming = req.headers['x-request-id'];
        const id = typeof incoming === 'string' && /^[\w.-]{1,64}$/.test(incoming) ? incoming : randomUUID();
        res.setHeader('X-Request-Id', id);
        return id;
      },
      customLogLevel: (_req, res, err) =>
        err || res.statusCode >= 500 ? 'error' : res.statusCode >= 400 ? 'warn' : 'info',
      serializers: {
        req: (req: { id: unknown; method: string; url: string }) => ({
          id: req.id,
          method: req.method,
          url: req.url,
        }),
        res: (res: { statusCode: number }) => ({ statusCode: res.statusCode }),
      },
    }),
  );
  // On plain http (loopback) an upgrade-to-https policy and HSTS would only break the page.
  const https = config.appUrl.startsWith('https://');
  app.use(
    helmet({
      strictTransportSecurity: https,
      contentSecurityPolicy: { directives: { upgradeInsecureRequests: https ? [] : null } },
    }),
  );
  app.use(cookieParser());
  // JSON answers and the HTML shell, compressed per response; the web assets are compressed at build time.
  app.use(compression());

  const session = createAuthenticator(config, (sessionId) =>
    loadSessionActor(dataSource.manager, sessionId, deps.clock.now()),
  );
  // API tokens (Authorization: Bearer) are checked in front of the session cookie on every route.
  const auth = { ...session, requireAuth: withApiTokens(deps, session.requireAuth) };

  const api = Router();
  api.use((_req, res, next) => {
    res.setHeader('Cache-Control', 'no-store');
    next();
  });
  api.use(refuseCrossSite(config));
  // A big shop's month save (up to the schema's 2,000 cells) needs more than the app-wide limit.
  api.put('/continuity/grid', gridSaveBodyParser);
  api.use(express.json({ limit: JSON_LIMIT }));
  api.use(refuseUnsafeText);
  api.use(auth.initialize);
  api.use(healthRouter(deps));
  api.use(authRouter(deps, auth.requireAuth));
  api.use('/shops', shopsRouter(deps, auth.requireAuth));
  api.use(['/people', '/api-tokens'], refuseBearer);
  api.use('/people', peopleRouter(deps, auth.requireAuth));
  api.use('/welders', welderCardRouter(deps, auth.requireAuth));
  api.use('/welders', verifyTokenRouter(deps, auth.requireAuth));
  api.use('/welders', welderTimelineRouter(deps, auth.requireAuth));
  api.use('/welders', welderQualifiedOnRouter(deps, auth.requireAuth));
  api.use('/welders', weldersRouter(deps, auth.requireAuth));
  api.use('/continuity', continuityRouter(deps, auth.requireAuth));
  api.use('/uploads', uploadsRouter(deps, auth.requireAuth));
  api.use('/procedures', proceduresRouter(deps, auth.requireAuth));
  api.use('/coupons', couponsRouter(deps, auth.requireAuth));
  api.use('/qualifications', qualificationsRouter(deps, auth.requireAuth));
  api.use('/verify', verifyRouter(deps));
  api.use('/audit', auditRouter(deps, auth.requireAuth));
  api.use('/settings', settingsRouter(deps, auth.requireAuth));
  api.use('/lapse-watch', lapseWatchRouter(deps, auth.requireAuth));
  api.use('/overview', overviewRouter(deps, auth.requireAuth));
  api.use('/api-tokens', apiTokensRouter(deps, auth.requireAuth));
  api.use('/imports', importsRouter(deps, auth.requireAuth));
  api.use('/crew-finder', crewFinderRouter(deps, auth.requireAuth));
  api.use('/paper-records', paperRecordsRouter(deps, auth.requireAuth));
  api.use('/reports', reportsRouter(deps, auth.requireAuth));
  api.use('/welds', weldsRouter(deps, auth.requireAuth));
  api.use(openApiRouter());
  if (!config.isProduction) api.use('/dev/mail', devMailRouter(deps, auth.requireAuth));
  api.use(apiNotFound);
  app.use('/api', api);

  if (webDist) mountWeb(app, webDist);
  app.use((_req, res) => {
    res.status(404).type('text/plain').send('Not found');
  });
  app.use(errorHandler(logger));
  return app;
}
