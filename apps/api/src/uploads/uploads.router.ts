// /api/uploads: multipart upload (QA manager), metadata and download (scoped by what it is attached to).
import { Router, type RequestHandler } from 'express';
import multer from 'multer';
import type { AppDeps } from '../lib/context.js';
import { AppError } from '../lib/errors.js';
import { pathParam } from '../lib/params.js';
import { actorOf, requireRole } from '../lib/auth.js';
import { streamingEngine } from '../lib/stream-to-store.js';
import * as uploads from './uploads.service.js';

/** RFC 5987 encoding of a file name for Content-Disposition's filename*. */
export const encodeFileName = (name: string): string =>
  encodeURIComponent(name).replace(/['()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`);

export function uploadsRouter(deps: AppDeps, requireAuth: RequestHandler): Router {
  const router = Router();
  router.use(requireAuth);

  // Files stream to the object store as they arrive (uploads.service storeFile), never held whole in
  // memory; multer parses the multipart body and enforces the size cap while the bytes flow.
  const engine = streamingEngine(
    deps,
    (req, file) => uploads.storeFile(deps, actorOf(req), file),
    (stored) => stored.storageKey,
  );
  const parse = multer({
    storage: engine,
    limits: { fileSize: uploads.MAX_UPLOAD_BYTES, files: 1, fields: 5 },
    defParamCharset: 'utf8',
  }).single('file');
  const receive: RequestHandler = (req, res, next) => {
    parse(req, res, (err: unknown) => {
      if (!err) return next();
      if (err instanceof AppError) return next(err);
      if (err instanceof multer.MulterError) {
        if (err.code === 'LIMIT_FILE_SIZE')
          return next(
            new AppError('payload_too_large', 'The file is larger than 15 MB; attach a smaller one'),
          );
        return next(
          AppError.validation({ file: 'Send one file in the field "file"' }, 'The upload is not valid'),
        );
      }
      // Anything else from the multipart parser (a broken boundary, a truncated part, a bad header) is a
      // malformed request, never our fault.
      next(AppError.validation({ file: 'The upload arrived incomplete or malformed; send it again' }, 'The upload is not valid'));
    });
  };

  router.post('/', requireRole('qa_manager'), receive, async (req, res) => {
    const body = req.body as { kind?: unknown } | undefined;
    const stored = req.file as (Express.Multer.File & uploads.StoredFile) | undefined;
    res.status(201).json(await uploads.createUpload(deps, actorOf(req), stored, body?.kind));
  });

  router.get('/:id', async (req, res) => {
    res.json(await uploads.getUpload(deps, actorOf(req), pathParam(req, 'id')));
  });

  router.get('/:id/content', async (req, res) => {
    const { upload, body } = await uploads.uploadContent(deps, actorOf(req), pathParam(req, 'id'));
    // Every accepted type is an image or a PDF, which a browser may show inline when asked to.
    const disposition = req.query.inline === '1' ? 'inline' : 'attachment';
    res.setHeader('Content-Type', upload.contentType);
    res.setHeader('Content-Length', String(body.byteLength));
    res.setHeader(
      'Content-Disposition',
      `${disposition}; filename*=UTF-8''${encodeFileName(upload.fileName)}`,
    );
    res.end(body);
  });

  return router;
}
