// /api/welds: the production weld log (foreman of the weld's shop, QA manager) and the QA manager's
// dispositions of flagged welds.
import { Router, type RequestHandler, type Response } from 'express';
import { encodeFileName } from '../uploads/uploads.router.js';
import { weldDispositionInput, weldInput, weldListQuery, weldWelderQuery, jobSummaryQuery } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { pathParam } from '../lib/params.js';
import { actorOf, requireRole } from '../lib/auth.js';
import * as welds from './welds.service.js';

function sendFile(res: Response, f: { body: Buffer; fileName: string; type: string }) {
  res.setHeader('Content-Type', f.type);
  res.setHeader('Content-Length', String(f.body.byteLength));
  res.setHeader('Content-Disposition', `attachment; filename*=UTF-8''${encodeFileName(f.fileName)}`);
  res.end(f.body);
}

export function weldsRouter(deps: AppDeps, requireAuth: RequestHandler): Router {
  const router = Router();
  router.use(requireAuth, requireRole('qa_manager', 'foreman'));

  router.get('/', async (req, res) => {
    res.json(await welds.listWelds(deps, actorOf(req), weldListQuery.parse(req.query)));
  });

  router.post('/', async (req, res) => {
    res.status(201).json(await welds.createWeld(deps, actorOf(req), weldInput.parse(req.body)));
  });

  router.get('/welders', async (req, res) => {
    res.json(await welds.weldWelders(deps, actorOf(req), weldWelderQuery.parse(req.query)));
  });

  router.get('/job-summary.csv', async (req, res) => {
    sendFile(res, await welds.jobSummary(deps, actorOf(req), jobSummaryQuery.parse(req.query), 'csv'));
  });

  router.get('/job-summary.pdf', async (req, res) => {
    sendFile(res, await welds.jobSummary(deps, actorOf(req), jobSummaryQuery.parse(req.query), 'pdf'));
  });

  router.get('/:id/pdf', async (req, res) => {
    const { pdf, fileName } = await welds.weldPdf(deps, actorOf(req), pathParam(req, 'id'));
    sendFile(res, { body: pdf, fileName, type: 'application/pdf' });
  });

  router.get('/:id', async (req, res) => {
    res.json(await welds.getWeldWithProof(deps, actorOf(req), pathParam(req, 'id')));
  });

  router.post('/:id/disposition', requireRole('qa_manager'), async (req, res) => {
    res.json(
      await welds.disposeWeld(deps, actorOf(req), pathParam(req, 'id'), weldDispositionInput.parse(req.body ?? {})),
    );
  });

  return router;
}
