// The link-mail outbox's safety net: every minute, the sender (auth/link-mail.ts) picks up what the
// after-response send could not deliver (relay down, instance stopped) once its backoff has passed.
// Several instances may run it: claims are leased rows, never one global lock.
import cron from 'node-cron';
import { sendDueLinkMails } from '../auth/link-mail.js';
import type { AppDeps } from '../lib/context.js';

export function startLinkMailSchedule(deps: Pick<AppDeps, 'config' | 'dataSource' | 'mailer' | 'logger' | 'clock'>): {
  stop(): Promise<void>;
} {
  let sending: Promise<unknown> | null = null;
  const task = cron.schedule('* * * * *', () => {
    if (sending) return;
    sending = sendDueLinkMails(deps)
      .catch((err: unknown) => deps.logger.error({ err }, 'link e-mail sender tick failed'))
      .finally(() => {
        sending = null;
      });
  });
  return {
    async stop() {
      await task.stop();
      await sending;
    },
  };
}
