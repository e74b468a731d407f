// One pino logger per process; silent under test unless LOG_LEVEL asks otherwise.
import { pino, type Logger } from 'pino';
import type { Config } from '../config.js';

export type { Logger };

export function createLogger(config: Pick<Config, 'logLevel' | 'nodeEnv'>): Logger {
  // Lines are written in the background (pino flushes what is left when the process exits): a write
  // call per request line was a tenth of a simple request's time under load.
  const destination = config.logLevel === 'silent' ? undefined : pino.destination({ dest: 1, sync: false });
  return pino({
    level: config.logLevel,
    base: { app: 'beadroll-api' },
    redact: {
      paths: ['req.headers.cookie', 'req.headers.authorization', 'res.headers["set-cookie"]'],
      remove: true,
    },
  }, destination);
}
