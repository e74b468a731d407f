// The hourly sweep of files uploaded from forms that were never saved (uploads.service.ts →
// sweepPendingUploads). Any instance may run it: each batch takes its rows with SKIP LOCKED, so two
// instances never remove the same file twice, and a save in progress keeps its files.
import cron from 'node-cron';
import type { AppDeps } from '../lib/context.js';
import { sweepPendingUploads } from '../uploads/uploads.service.js';

export const UPLOAD_SWEEP_CRON = '23 * * * *';

export function startUploadSweep(deps: AppDeps): { stop(): Promise<void> } {
  let running: Promise<unknown> | null = null;
  const task = cron.schedule(UPLOAD_SWEEP_CRON, () => {
    if (running) return;
    running = sweepPendingUploads(deps)
      .then((n) => {
        if (n > 0) deps.logger.info({ removed: n }, 'removed files uploaded from forms that were never saved');
      })
      .catch((err: unknown) => deps.logger.error({ err }, 'upload sweep failed'))
      .finally(() => {
        running = null;
      });
  });
  return {
    async stop() {
      await task.stop();
      await running;
    },
  };
}
