// /api/imports — spreadsheets in (QA manager, signed in; never an API token).
import { Router, type RequestHandler } from 'express';
import multer from 'multer';
import { importCheckInput, importUploadFields } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { actorOf, requireRole } from '../lib/auth.js';
import { AppError } from '../lib/errors.js';
import { pathParam } from '../lib/params.js';
import { refuseApiTokens } from '../api-tokens/bearer.js';
import { MAX_IMPORT_BYTES } from './spreadsheet.js';
import { streamingEngine } from '../lib/stream-to-store.js';
import * as imports from './imports.service.js';

export function importsRouter(deps: AppDeps, requireAuth: RequestHandler): Router {
  const router = Router();
  router.use(requireAuth, refuseApiTokens, requireRole('qa_manager'));

  // The file streams to the object store as it arrives (imports.service receiveImportFile), never held
  // whole in memory; multer parses the multipart body and enforces the size cap while the bytes flow.
  const engine = streamingEngine(
    deps,
    (req, file) => imports.receiveImportFile(deps, actorOf(req), file),
    (stored) => stored.objectKey,
  );
  const parse = multer({
    storage: engine,
    limits: { fileSize: MAX_IMPORT_BYTES, files: 1, fields: 5 },
    defParamCharset: 'utf8',
  }).single('file');
  const receive: RequestHandler = (req, res, next) => {
    parse(req, res, (err: unknown) => {
      if (!err) return next();
      if (err instanceof AppError) return next(err);
      if (err instanceof multer.MulterError && err.code === 'LIMIT_FILE_SIZE') return next(imports.importTooLarge());
      next(AppError.validation({ file: 'Send one .csv or .xlsx file in the field "file"' }, 'The upload is not valid'));
    });
  };

  router.get('/', async (req, res) => {
    res.json(await imports.listImports(deps, actorOf(req)));
  });

  router.post('/', receive, async (req, res) => {
    const stored = req.file as (Express.Multer.File & imports.StoredImportFile) | undefined;
    const fields = importUploadFields.safeParse(req.body ?? {});
    if (!fields.success) {
      // The file is already in the store: a refused request keeps nothing.
      if (stored) await deps.storage.delete(stored.objectKey);
      throw fields.error;
    }
    res.status(201).json(await imports.uploadImport(deps, actorOf(req), fields.data.kind, stored));
  });

  router.get('/:id', async (req, res) => {
    res.json(await imports.getImport(deps, actorOf(req), pathParam(req, 'id')));
  });

  router.post('/:id/check', async (req, res) => {
    res.json(await imports.checkImport(deps, actorOf(req), pathParam(req, 'id'), importCheckInput.parse(req.body)));
  });

  router.post('/:id/commit', async (req, res) => {
    const { view } = await imports.commitImport(deps, actorOf(req), pathParam(req, 'id'));
    res.status(202).json(view);
  });

  router.post('/:id/cancel', async (req, res) => {
    res.json(await imports.cancelImport(deps, actorOf(req), pathParam(req, 'id')));
  });

  return router;
}
