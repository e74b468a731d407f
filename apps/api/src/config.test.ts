import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadConfig, repoRoot } from './config.js';

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
    expect(loadConfig({ NODE_ENV: 'production', JWT_SECRET: 'p'.repeat(40) }).isProduction).toBe(true);
  });

  it('is silent in tests unless LOG_LEVEL says otherwise', () => {
    expect(loadConfig({ NODE_ENV: 'test' }).logLevel).toBe('silent');
    expect(loadConfig({ NODE_ENV: 'test', LOG_LEVEL: 'debug' }).logLevel).toBe('debug');
  });
});
