// GET /api/health: 200 while PostgreSQL answers, 503 while it does not. The process stays up either way
// and recovers by itself: the pool opens new connections once the database is back.
import { Router } from 'express';
import type { AppDeps } from '../lib/context.js';

const TIMEOUT_MS = 2000;

async function databaseAnswers(deps: AppDeps): Promise<boolean> {
  let timer: NodeJS.Timeout | undefined;
  try {
    const timeout = new Promise<never>((_, reject) => {
      timer = setTimeout(() => reject(new Error('health check timed out')), TIMEOUT_MS);
    });
    await Promise.race([deps.dataSource.query('SELECT 1'), timeout]);
    return true;
  } catch (err) {
    deps.logger.warn({ err }, 'health: database unreachable');
    return false;
  } finally {
    clearTimeout(timer);
  }
}

export function healthRouter(deps: AppDeps): Router {
  const router = Router();
  router.get('/health', async (_req, res) => {
    if (await databaseAnswers(deps)) res.json({ status: 'ok', db: 'ok' });
    else res.status(503).json({ status: 'degraded', db: 'down' });
  });
  return router;
}
