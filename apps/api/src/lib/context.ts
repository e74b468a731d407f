// What every service receives: the app's dependencies, injected by createApp (and by tests).
import type { DataSource } from 'typeorm';
import type { Config } from '../config.js';
import type { Logger } from './logger.js';
import type { Mailer } from './mailer.js';
import type { Storage } from './storage.js';

export interface Clock {
  now(): Date;
}

export const systemClock: Clock = { now: () => new Date() };

export interface AppDeps {
  config: Config;
  dataSource: DataSource;
  mailer: Mailer;
  storage: Storage;
  logger: Logger;
  clock: Clock;
}
