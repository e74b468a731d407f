// One pino logger per process; silent under test unless LOG_LEVEL asks otherwise.
import { pino, type Logger } from 'pino';
import type { Config } from '../config.js';

export type { Logger };

export function createLogger(config: Pick<Config, 'logLevel' | 'nodeEnv'>): Logger {
  return pino({
    level: config.logLevel,
    base: { app: 'beadroll-api' },
    redact: {
      paths: ['req.headers.cookie', 'req.headers.authorization', 'res.headers["set-cookie"]'],
      remove: true,
    },
  });
}
