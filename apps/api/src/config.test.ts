import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { readdirSync, statSync } from 'node:fs';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { loadConfig, repoRoot } from './config.js';
import { DEV_SECRETS_FILE } from './dev-secrets.js';

const production = {
  NODE_ENV: 'production',
  JWT_SECRET: 'p'.repeat(40),
  APP_URL: 'https://beadroll.example.com',
  SMTP_HOST: 'smtp.example.com',
  SMTP_PORT: '587',
  S3_ENDPOINT: 'https://s3.example.com',
  S3_ACCESS_KEY_ID: 'AKIAEXAMPLE',
  S3_SECRET_ACCESS_KEY: 's'.repeat(40),
} as const;

describe('loadConfig', () => {
  it('uses loopback defaults with nothing set', () => {
    const c = loadConfig({});
    expect(c).toMatchObject({ nodeEnv: 'development', host: '127.0.0.1', port: 8080, loginRateLimit: 10 });
    expect(c.db).toEqual({
      host: '127.0.0.1',
      port: 55432,
      user: 'beadroll',
      password: 'beadroll',
      database: 'beadroll',
    });
    expect(c.smtp).toMatchObject({
      host: '127.0.0.1',
      port: 2525,
      secure: false,
      from: 'Beadroll <no-reply@beadroll.example>',
    });
    expect(c.s3).toMatchObject({
      endpoint: 'http://127.0.0.1:4569',
      bucket: 'beadroll',
      forcePathStyle: true,
    });
    expect(c.appUrl).toBe('http://127.0.0.1:8080');
  });

  it('derives the S3 endpoint and app URL from the ports, and resolves relative folders from the repository root', () => {
    const c = loadConfig({ PORT: '18041', S3_PORT: '14541', DATA_DIR: '.data-x', WEB_DIST: 'apps/web/dist' });
    expect(c.s3.endpoint).toBe('http://127.0.0.1:14541');
    expect(c.appUrl).toBe('http://127.0.0.1:18041');
    expect(c.dataDir).toBe(path.join(repoRoot, '.data-x'));
    expect(c.mailDir).toBe(path.join(repoRoot, '.data-x', 'mail'));
    expect(c.webDist).toBe(path.join(repoRoot, 'apps/web/dist'));
    expect(loadConfig({ DATA_DIR: '/srv/beadroll' }).dataDir).toBe('/srv/beadroll');
  });

  it('requires a JWT secret in production and names every bad variable', () => {
    expect(() => loadConfig({ NODE_ENV: 'production' })).toThrow(
      /JWT_SECRET: Required when NODE_ENV=production/,
    );
    expect(() => loadConfig({ PGPORT: 'abc', SMTP_SECURE: 'maybe' })).toThrow(/PGPORT[\s\S]*SMTP_SECURE/);
    expect(loadConfig({ ...production }).isProduction).toBe(true);
  });

  it('refuses to start in production without a real secret, an https APP_URL and real mail and bucket settings', () => {
    const refused = (env: Record<string, string | undefined>, key: string) =>
      expect(() => loadConfig({ ...production, ...env }), key).toThrow(new RegExp(`${key}:`));
    refused({ JWT_SECRET: undefined }, 'JWT_SECRET');
    refused({ JWT_SECRET: 'beadroll-development-secret-not-for-production' }, 'JWT_SECRET');
    refused({ APP_URL: undefined }, 'APP_URL');
    refused({ APP_URL: 'http://beadroll.example.com' }, 'APP_URL');
    refused({ SMTP_HOST: undefined, SMTP_PORT: undefined }, 'SMTP_HOST');
    refused({ S3_ENDPOINT: undefined }, 'S3_ENDPOINT');
    refused({ S3_ACCESS_KEY_ID: undefined }, 'S3_ACCESS_KEY_ID');
    refused({ S3_ACCESS_KEY_ID: 'S3RVER', S3_SECRET_ACCESS_KEY: 'S3RVER' }, 'S3_SECRET_ACCESS_KEY');
    refused({ DEV_MAIL_OPEN: 'true' }, 'DEV_MAIL_OPEN');
    const c = loadConfig(production);
    expect(c.jwtSecret).toBe(production.JWT_SECRET);
    expect(c.s3).toMatchObject({ accessKeyId: 'AKIAEXAMPLE', secretAccessKey: 's'.repeat(40) });
  });

  it('outside production, makes one random secret set per data folder and keeps it', async () => {
    const a = await mkdtemp(path.join(tmpdir(), 'beadroll-cfg-'));
    const b = await mkdtemp(path.join(tmpdir(), 'beadroll-cfg-'));
    try {
      const first = loadConfig({ DATA_DIR: a });
      expect(readdirSync(a)).toEqual([]); // nothing is written until a secret is needed
      const secret = first.jwtSecret;
      expect(secret).not.toBe('beadroll-development-secret-not-for-production');
      expect(secret.length).toBeGreaterThanOrEqual(32);
      expect(statSync(path.join(a, DEV_SECRETS_FILE)).mode & 0o077).toBe(0);
      expect(loadConfig({ DATA_DIR: a }).jwtSecret).toBe(secret);
      expect(loadConfig({ DATA_DIR: a }).s3.accessKeyId).toBe(first.s3.accessKeyId);
      expect(first.s3.accessKeyId).not.toBe('S3RVER');
      expect(loadConfig({ DATA_DIR: b }).jwtSecret).not.toBe(secret);
      expect(loadConfig({ DATA_DIR: b, JWT_SECRET: 'x'.repeat(32) }).jwtSecret).toBe('x'.repeat(32));
    } finally {
      await rm(a, { recursive: true, force: true });
      await rm(b, { recursive: true, force: true });
    }
  });

  it('is silent in tests unless LOG_LEVEL says otherwise', () => {
    expect(loadConfig({ NODE_ENV: 'test' }).logLevel).toBe('silent');
    expect(loadConfig({ NODE_ENV: 'test', LOG_LEVEL: 'debug' }).logLevel).toBe('debug');
  });
});
