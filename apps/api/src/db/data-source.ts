// The TypeORM DataSource: entities and migrations listed explicitly (no globs), never synchronized.
import 'reflect-metadata';
import { DataSource, type LoggerOptions, type Logger as TypeOrmLogger } from 'typeorm';
import type { Config } from '../config.js';
import { OrganizationEntity } from '../shops/organization.entity.js';
import { ShopEntity } from '../shops/shop.entity.js';
import { UserEntity } from '../people/user.entity.js';
import { ForemanShopEntity } from '../people/foreman-shop.entity.js';
import { WelderEntity } from '../welders/welder.entity.js';
import { AuthTokenEntity } from '../auth/auth-token.entity.js';
import { AuditEventEntity } from '../audit/audit-event.entity.js';
import { Foundation1764633600000 } from './migrations/1764633600000-foundation.js';

export const entities = [
  OrganizationEntity,
  ShopEntity,
  UserEntity,
  ForemanShopEntity,
  WelderEntity,
  AuthTokenEntity,
  AuditEventEntity,
];
export const migrations = [Foundation1764633600000];

export interface DataSourceOptions {
  /** Pool size; the API default suits one instance on a small machine. */
  poolSize?: number;
  logging?: LoggerOptions;
  logger?: TypeOrmLogger;
}

export function createDataSource(db: Config['db'], opts: DataSourceOptions = {}): DataSource {
  return new DataSource({
    type: 'postgres',
    host: db.host,
    port: db.port,
    username: db.user,
    password: db.password,
    database: db.database,
    entities,
    migrations,
    migrationsTableName: 'typeorm_migrations',
    synchronize: false,
    migrationsRun: false,
    uuidExtension: 'pgcrypto',
    applicationName: 'beadroll-api',
    logging: opts.logging ?? false,
    ...(opts.logger ? { logger: opts.logger } : {}),
    poolSize: opts.poolSize ?? 10,
    extra: {
      // Fail fast when the database is away, so health answers 503 instead of hanging.
      connectionTimeoutMillis: 3000,
      idleTimeoutMillis: 30000,
      statement_timeout: 15000,
    },
  });
}

/** Runs pending migrations, each in its own transaction. Returns the names of those applied. */
export async function runMigrations(dataSource: DataSource): Promise<string[]> {
  const applied = await dataSource.runMigrations({ transaction: 'each' });
  return applied.map((m) => m.name);
}
