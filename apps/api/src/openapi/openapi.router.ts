// /api/openapi.json — public, like any API description (it holds no data).
import { Router } from 'express';
import { openApiDocument } from './openapi.js';

export function openApiRouter(): Router {
  const router = Router();
  router.get('/openapi.json', (_req, res) => {
    res.json(openApiDocument());
  });
  return router;
}
