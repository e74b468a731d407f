// /api/qualifications (reads scoped like welders; revoke by the QA manager; the WPQ record PDF) and the
// welder's wallet card at /api/welders/:id/card.pdf.
import { Router, type RequestHandler, type Response } from 'express';
import { qualificationListQuery, revokeInput } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { pathParam } from '../lib/params.js';
import { actorOf, requireRole } from '../lib/auth.js';
import { encodeFileName } from '../uploads/uploads.router.js';
import { getWelder } from '../welders/welders.service.js';
import * as qualifications from './qualifications.service.js';

function sendPdf(res: Response, { pdf, fileName }: { pdf: Buffer; fileName: string }) {
  res.setHeader('Content-Type', 'application/pdf');
  res.setHeader('Content-Length', String(pdf.byteLength));
  res.setHeader('Content-Disposition', `attachment; filename*=UTF-8''${encodeFileName(fileName)}`);
  res.end(pdf);
}

export function qualificationsRouter(deps: AppDeps, requireAuth: RequestHandler): Router {
  const router = Router();
  router.use(requireAuth);

  router.get('/', async (req, res) => {
    res.json(
      await qualifications.listQualifications(deps, actorOf(req), qualificationListQuery.parse(req.query)),
    );
  });

  router.get('/:id', async (req, res) => {
    res.json(await qualifications.getQualification(deps, actorOf(req), pathParam(req, 'id')));
  });

  router.get('/:id/wpq.pdf', async (req, res) => {
    sendPdf(res, await qualifications.wpqPdf(deps, actorOf(req), pathParam(req, 'id')));
  });

  router.post('/:id/revoke', requireRole('qa_manager'), async (req, res) => {
    res.json(
      await qualifications.revokeQualification(
        deps,
        actorOf(req),
        pathParam(req, 'id'),
        revokeInput.parse(req.body),
      ),
    );
  });

  return router;
}

/** Mounted at /api/welders: GET /:id/card.pdf, for whoever may see the welder. */
export function welderCardRouter(deps: AppDeps, requireAuth: RequestHandler): Router {
  const router = Router();
  router.get('/:id/card.pdf', requireAuth, async (req, res) => {
    const actor = actorOf(req);
    const welder = await getWelder(deps, actor, pathParam(req, 'id'));
    sendPdf(
      res,
      await qualifications.walletCardPdf(deps, actor, {
        id: welder.id,
        name: welder.name,
        stamp: welder.stamp,
        homeShop: welder.homeShop.name,
      }),
    );
  });
  return router;
}
