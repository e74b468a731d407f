// /api/reports — the audit report for a shop or the company and a period (QA manager): JSON, PDF, CSV.
import { Router, type RequestHandler } from 'express';
import { auditReportQuery } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { actorOf, requireRole } from '../lib/auth.js';
import { CSV_CONTENT_TYPE } from '../lib/csv.js';
import { encodeFileName } from '../uploads/uploads.router.js';
import { renderAuditReportPdf } from '../documents/audit-report-pdf.js';
import { auditReport } from './audit-report.service.js';
import { auditReportCsv } from './audit-report-csv.js';

export function reportsRouter(deps: AppDeps, requireAuth: RequestHandler): Router {
  const router = Router();
  router.use(requireAuth, requireRole('qa_manager'));
  const fileName = (q: { from: string; to: string }, ext: string) => `Audit report ${q.from} to ${q.to}.${ext}`;

  router.get('/audit', async (req, res) => {
    res.json(await auditReport(deps, actorOf(req), auditReportQuery.parse(req.query)));
  });

  router.get('/audit.pdf', async (req, res) => {
    const q = auditReportQuery.parse(req.query);
    const pdf = await renderAuditReportPdf(await auditReport(deps, actorOf(req), q));
    res.setHeader('Content-Type', 'application/pdf');
    res.setHeader('Content-Disposition', `attachment; filename*=UTF-8''${encodeFileName(fileName(q, 'pdf'))}`);
    res.end(pdf);
  });

  router.get('/audit.csv', async (req, res) => {
    const q = auditReportQuery.parse(req.query);
    const csv = auditReportCsv(await auditReport(deps, actorOf(req), q));
    res.setHeader('Content-Type', CSV_CONTENT_TYPE);
    res.setHeader('Content-Disposition', `attachment; filename*=UTF-8''${encodeFileName(fileName(q, 'csv'))}`);
    res.end(csv);
  });

  return router;
}
