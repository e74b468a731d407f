// The real API app for a test file: real database pool, real SMTP mailer, real object-store client.
import type { Express } from 'express';
import request from 'supertest';
import type { ZodType } from 'zod';
import { errorBodySchema } from '@beadroll/rules';
import type { DataSource } from 'typeorm';
import { createApp } from '../../apps/api/src/app.js';
import { loadConfig, type Config } from '../../apps/api/src/config.js';
import { createDataSource, type DataSourceOptions } from '../../apps/api/src/db/data-source.js';
import type { AppDeps, Clock } from '../../apps/api/src/lib/context.js';
import { createLogger } from '../../apps/api/src/lib/logger.js';
import { createMailer, type Mailer } from '../../apps/api/src/lib/mailer.js';
import { createStorage } from '../../apps/api/src/lib/storage.js';

export interface TestApi {
  app: Express;
  ds: DataSource;
  config: Config;
  deps: AppDeps;
  close(): Promise<void>;
}

/** A clock the test can move forward; starts at real time. */
export function movableClock(): Clock & { advance(ms: number): void } {
  let offset = 0;
  return { now: () => new Date(Date.now() + offset), advance: (ms) => void (offset += ms) };
}

export function testConfig(overrides: Partial<Config> = {}): Config {
  // Every test signs in from 127.0.0.1: the per-address sign-in limit would count all files together.
  return { ...loadConfig({ ...process.env, NODE_ENV: 'test' }), loginAddressLimit: 100_000, ...overrides };
}

export async function startTestApi(
  opts: {
    config?: Partial<Config>;
    clock?: Clock;
    mailer?: Mailer;
    dataSource?: DataSource;
    dataSourceOptions?: DataSourceOptions;
    webDist?: string;
  } = {},
): Promise<TestApi> {
  const config = testConfig(opts.config);
  const ds = opts.dataSource ?? createDataSource(config.db, { poolSize: 4, ...opts.dataSourceOptions });
  if (!ds.isInitialized) await ds.initialize();
  const mailer = opts.mailer ?? createMailer(config.smtp);
  const storage = createStorage(config.s3);
  const deps: AppDeps = {
    config,
    dataSource: ds,
    mailer,
    storage,
    logger: createLogger(config),
    clock: opts.clock ?? { now: () => new Date() },
  };
  const app = createApp({ ...deps, ...(opts.webDist ? { webDist: opts.webDist } : {}) });
  return {
    app,
    ds,
    config,
    deps,
    async close() {
      mailer.close();
      storage.close();
      if (ds.isInitialized) await ds.destroy();
    },
  };
}

/** A supertest agent holding the session cookie of the given sign-in. */
export async function signIn(app: Express, email: string, password: string) {
  const agent = request.agent(app);
  const res = await agent.post('/api/auth/login').send({ email, password });
  if (res.status !== 200)
    throw new Error(`sign-in of ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
  return agent;
}

/** The error of an error response, checked against the contract's error body. */
export function errorOf(res: { body: unknown }) {
  return errorBodySchema.parse(res.body).error;
}

/** A response body parsed with the contract's schema. */
export function bodyOf<T>(schema: ZodType<T>, res: { body: unknown }): T {
  return schema.parse(res.body);
}
