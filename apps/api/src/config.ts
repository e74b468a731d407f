// Configuration from the environment, validated once at boot. This is the only module that reads
// process.env; everything else receives a Config.
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { z } from 'zod';

/** The repository root: relative DATA_DIR and WEB_DIST are resolved against it, whatever the cwd. */
export const repoRoot = fileURLToPath(new URL('../../../', import.meta.url));

const DEV_JWT_SECRET = 'beadroll-development-secret-not-for-production';

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
    S3_ACCESS_KEY_ID: z.string().min(1).default('S3RVER'),
    S3_SECRET_ACCESS_KEY: z.string().min(1).default('S3RVER'),
    S3_FORCE_PATH_STYLE: bool.default(true),
    DATA_DIR: z.string().min(1).default('.data'),
    JWT_SECRET: z.preprocess(blankToUndefined, z.string().min(32, 'Use at least 32 characters').optional()),
    APP_URL: z.preprocess(blankToUndefined, z.url().optional()),
    WEB_DIST: z.string().min(1).default('apps/web/dist'),
    LOGIN_RATE_LIMIT: z.coerce.number().int().min(1).default(10),
    VERIFY_RATE_LIMIT: z.coerce.number().int().min(1).default(60),
    LAPSE_WATCH_ENABLED: bool.optional(),
  })
  .superRefine((env, ctx) => {
    if (env.NODE_ENV === 'production' && !env.JWT_SECRET)
      ctx.addIssue({ code: 'custom', path: ['JWT_SECRET'], message: 'Required when NODE_ENV=production' });
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
      accessKeyId: e.S3_ACCESS_KEY_ID,
      secretAccessKey: e.S3_SECRET_ACCESS_KEY,
      forcePathStyle: e.S3_FORCE_PATH_STYLE,
    },
    dataDir: fromRoot(e.DATA_DIR),
    mailDir: path.join(fromRoot(e.DATA_DIR), 'mail'),
    jwtSecret: e.JWT_SECRET ?? DEV_JWT_SECRET,
    appUrl: (e.APP_URL ?? `http://127.0.0.1:${e.PORT}`).replace(/\/+$/, ''),
    webDist: fromRoot(e.WEB_DIST),
    loginRateLimit: e.LOGIN_RATE_LIMIT,
    /** Public verify page look-ups per client address per minute. */
    verifyRateLimit: e.VERIFY_RATE_LIMIT,
    /** The daily lapse-watch schedule in this instance (off under test unless asked for). */
    lapseWatchEnabled: e.LAPSE_WATCH_ENABLED ?? e.NODE_ENV !== 'test',
  };
}

export type Config = ReturnType<typeof loadConfig>;
