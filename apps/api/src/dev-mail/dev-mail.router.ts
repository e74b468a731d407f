// /api/dev/mail — the development mail catcher's inbox. app.ts mounts it only outside production, and
// even then (issue 11, finding 5) it answers only requests made on this machine — not through a proxy —
// and shows a signed-in person only the mail sent to their own company's people and welders (the
// catcher holds password-reset links). DEV_MAIL_OPEN=true shows everything to anyone on this machine,
// for working on the sign-in screens while signed out.
import { Router, type Request, type RequestHandler } from 'express';
import type { AppDeps } from '../lib/context.js';
import { AppError } from '../lib/errors.js';
import { pathParam } from '../lib/params.js';
import { actorOf } from '../lib/auth.js';
import * as devMail from './dev-mail.service.js';

const LOOPBACK = /^(127\.\d{1,3}\.\d{1,3}\.\d{1,3}|::1|::ffff:127\.\d{1,3}\.\d{1,3}\.\d{1,3})$/;

/** The request was made on this machine, directly (a proxy on this machine forwards others' requests). */
export function fromThisMachine(req: Request): boolean {
  if (req.headers['x-forwarded-for'] !== undefined || req.headers.forwarded !== undefined) return false;
  return LOOPBACK.test(req.socket.remoteAddress ?? '');
}

async function companyAddresses(deps: AppDeps, organizationId: string): Promise<Set<string>> {
  const rows: { email: string }[] = await deps.dataSource.query(
    `SELECT email FROM users WHERE organization_id = $1
     UNION SELECT lower(email) FROM welders WHERE organization_id = $1 AND email <> ''`,
    [organizationId],
  );
  return new Set(rows.map((r) => r.email));
}

export function devMailRouter(deps: AppDeps, requireAuth: RequestHandler): Router {
  const router = Router();
  router.use((req, _res, next) => {
    if (!fromThisMachine(req)) return next(AppError.notFound('page'));
    next();
  });
  const mayRead = async (req: Request): Promise<devMail.MailFilter> => {
    if (deps.config.devMailOpen) return devMail.everyMail;
    const actor = actorOf(req);
    if (actor.apiToken) throw AppError.forbidden('An API token cannot read the development mail');
    const own = await companyAddresses(deps, actor.organizationId);
    return (recipients) => recipients.length > 0 && recipients.every((r) => own.has(r));
  };
  if (!deps.config.devMailOpen) router.use(requireAuth);
  router.get('/', async (req, res) => {
    res.json(await devMail.listMail(deps.config.mailDir, await mayRead(req)));
  });
  router.get('/:id', async (req, res) => {
    res.json(await devMail.getMail(deps.config.mailDir, pathParam(req, 'id'), await mayRead(req)));
  });
  return router;
}
