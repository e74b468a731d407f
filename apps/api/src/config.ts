// Configuration from the environment, validated once at boot. This is the only module that reads
// process.env; everything else receives a Config.
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import cron from 'node-cron';
import { z } from 'zod';
import { devSecrets } from './dev-secrets.js';

/** The repository root: relative DATA_DIR and WEB_DIST are resolved against it, whatever the cwd. */
export const repoRoot = fileURLToPath(new URL('../../../', import.meta.url));

/** The constant development secret of earlier versions: public, so refused as a production secret. */
const OLD_DEV_JWT_SECRET = 'beadroll-development-secret-not-for-production';

const bool = z
  .enum(['true', 'false', '1', '0', 'yes', 'no'])
  .transform((v) => v === 'true' || v === '1' || v === 'yes');
const port = z.coerce.number().int().min(1).max(65535);
const blankToUndefined = (v: unknown) => (v === '' ? undefined : v);

const envSchema = z
  .object({
    NODE_ENV: z.enum(['development', 'test', 'production']).default('development'),
    LOG_LEVEL: z.preprocess(
      blankToUndefined,
      z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).optional(),
    ),
    HOST: z.string().min(1).default('127.0.0.1'),
    PORT: port.default(8080),
    PGHOST: z.string().min(1).default('127.0.0.1'),
    PGPORT: port.default(55432),
    PGUSER: z.string().min(1).default('beadroll'),
    PGPASSWORD: z.string().default('beadroll'),
    PGDATABASE: z.string().min(1).default('beadroll'),
    SMTP_HOST: z.string().min(1).default('127.0.0.1'),
    SMTP_PORT: port.default(2525),
    SMTP_USER: z.preprocess(blankToUndefined, z.string().optional()),
    SMTP_PASSWORD: z.preprocess(blankToUndefined, z.string().optional()),
    SMTP_SECURE: bool.default(false),
    MAIL_FROM: z.string().min(3).default('Beadroll <no-reply@beadroll.example>'),
    S3_PORT: port.default(4569),
    S3_ENDPOINT: z.preprocess(blankToUndefined, z.url().optional()),
    S3_REGION: z.string().min(1).default('us-east-1'),
    S3_BUCKET: z.string().min(1).default('beadroll'),
    S3_ACCESS_KEY_ID: z.preprocess(blankToUndefined, z.string().min(1).optional()),
    S3_SECRET_ACCESS_KEY: z.preprocess(blankToUndefined, z.string().min(1).optional()),
    S3_FORCE_PATH_STYLE: bool.default(true),
    DATA_DIR: z.string().min(1).default('.data'),
    JWT_SECRET: z.preprocess(blankToUndefined, z.string().min(32, 'Use at least 32 characters').optional()),
    APP_URL: z.preprocess(blankToUndefined, z.url().optional()),
    WEB_DIST: z.string().min(1).default('apps/web/dist'),
    LOGIN_RATE_LIMIT: z.coerce.number().int().min(1).max(1000).default(10),
    LOGIN_ADDRESS_LIMIT: z.coerce.number().int().min(1).max(100000).default(20),
    /** Express 'trust proxy': how to find the client address behind a load balancer (e.g. loopback, 1). */
    TRUST_PROXY: z.preprocess(blankToUndefined, z.string().max(200).optional()),
    VERIFY_RATE_LIMIT: z.coerce.number().int().min(1).default(60),
    LAPSE_WATCH_ENABLED: bool.optional(),
    /** How often the daily schedule looks for companies whose run time has come (node-cron; seconds allowed). */
    LAPSE_WATCH_TICK: z
      .string()
      .default('* * * * *')
      .refine((v) => cron.validate(v), 'Not a cron expression (five fields, or six with seconds first)'),
    /** The hourly removal of files uploaded but never attached to a record (on outside tests). */
    UPLOAD_SWEEP_ENABLED: bool.optional(),
    /** Development only: show /api/dev/mail to anyone on this machine, signed in or not. */
    DEV_MAIL_OPEN: bool.default(false),
  })
  .superRefine((env, ctx) => {
    if (env.NODE_ENV !== 'production') return;
    // Production refuses to start on anything that only makes sense on a developer's machine.
    const need = (key: keyof typeof env, message: string) => ctx.addIssue({ code: 'custom', path: [key], message });
    if (!env.JWT_SECRET) need('JWT_SECRET', 'Required when NODE_ENV=production');
    else if (env.JWT_SECRET === OLD_DEV_JWT_SECRET) need('JWT_SECRET', 'This is the public development secret; generate your own');
    if (!env.APP_URL) need('APP_URL', 'Required when NODE_ENV=production: the https address people open');
    else if (!env.APP_URL.startsWith('https://')) need('APP_URL', 'Must start with https:// in production');
    if (env.SMTP_HOST === '127.0.0.1' && env.SMTP_PORT === 2525)
      need('SMTP_HOST', 'Set the mail relay (SMTP_HOST, SMTP_PORT) in production; the default is the local mail catcher');
    if (!env.S3_ENDPOINT) need('S3_ENDPOINT', 'Required when NODE_ENV=production: the object store of your bucket');
    if (!env.S3_ACCESS_KEY_ID || env.S3_ACCESS_KEY_ID === 'S3RVER')
      need('S3_ACCESS_KEY_ID', 'Required when NODE_ENV=production: the bucket’s access key');
    if (!env.S3_SECRET_ACCESS_KEY || env.S3_SECRET_ACCESS_KEY === 'S3RVER')
      need('S3_SECRET_ACCESS_KEY', 'Required when NODE_ENV=production: the bucket’s secret key');
    if (env.DEV_MAIL_OPEN) need('DEV_MAIL_OPEN', 'Not allowed in production');
  });

export type Env = Record<string, string | undefined>;

export function loadConfig(env: Env = process.env) {
  const parsed = envSchema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`Beadroll configuration is invalid:\n${lines.join('\n')}`);
  }
  const e = parsed.data;
  const fromRoot = (p: string) => (path.isAbsolute(p) ? p : path.join(repoRoot, p));
  const dataDir = fromRoot(e.DATA_DIR);
  // Outside production, what is not given comes from the data folder's own random secrets — read (or
  // made) only when first needed, so merely loading a configuration writes nothing.
  let secrets: ReturnType<typeof devSecrets> | undefined;
  const dev = () => (secrets ??= devSecrets(dataDir));
  const s3AccessKeyId = e.S3_ACCESS_KEY_ID;
  const s3SecretAccessKey = e.S3_SECRET_ACCESS_KEY;
  const jwtSecret = e.JWT_SECRET;
  return {
    nodeEnv: e.NODE_ENV,
    isProduction: e.NODE_ENV === 'production',
    logLevel: e.LOG_LEVEL ?? (e.NODE_ENV === 'test' ? 'silent' : 'info'),
    host: e.HOST,
    port: e.PORT,
    db: { host: e.PGHOST, port: e.PGPORT, user: e.PGUSER, password: e.PGPASSWORD, database: e.PGDATABASE },
    smtp: {
      host: e.SMTP_HOST,
      port: e.SMTP_PORT,
      user: e.SMTP_USER,
      password: e.SMTP_PASSWORD,
      secure: e.SMTP_SECURE,
      from: e.MAIL_FROM,
    },
    s3: {
      endpoint: e.S3_ENDPOINT ?? `http://127.0.0.1:${e.S3_PORT}`,
      region: e.S3_REGION,
      bucket: e.S3_BUCKET,
      get accessKeyId(): string {
        return s3AccessKeyId ?? dev().s3AccessKeyId;
      },
      get secretAccessKey(): string {
        return s3SecretAccessKey ?? dev().s3SecretAccessKey;
      },
      forcePathStyle: e.S3_FORCE_PATH_STYLE,
    },
    dataDir,
    mailDir: path.join(dataDir, 'mail'),
    get jwtSecret(): string {
      return jwtSecret ?? dev().jwtSecret;
    },
    devMailOpen: e.DEV_MAIL_OPEN,
    appUrl: (e.APP_URL ?? `http://127.0.0.1:${e.PORT}`).replace(/\/+$/, ''),
    webDist: fromRoot(e.WEB_DIST),
    /** Refused passwords per account within 15 minutes before it is held back (with backoff). */
    loginRateLimit: e.LOGIN_RATE_LIMIT,
    /** Refused passwords per client address within 15 minutes, across all accounts. */
    loginAddressLimit: e.LOGIN_ADDRESS_LIMIT,
    trustProxy: e.TRUST_PROXY === undefined ? false : /^\d+$/.test(e.TRUST_PROXY) ? Number(e.TRUST_PROXY) : e.TRUST_PROXY === 'true' ? true : e.TRUST_PROXY,
    /** Public verify page look-ups per client address per minute. */
    verifyRateLimit: e.VERIFY_RATE_LIMIT,
    /** The daily lapse-watch schedule in this instance (off under test unless asked for). */
    lapseWatchEnabled: e.LAPSE_WATCH_ENABLED ?? e.NODE_ENV !== 'test',
    /** The schedule's tick: every minute unless told otherwise (the two-instance test ticks every second). */
    lapseWatchTick: e.LAPSE_WATCH_TICK,
    uploadSweepEnabled: e.UPLOAD_SWEEP_ENABLED ?? e.NODE_ENV !== 'test',
  };
}

export type Config = ReturnType<typeof loadConfig>;
