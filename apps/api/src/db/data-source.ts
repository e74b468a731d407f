// The TypeORM DataSource: entities and migrations listed explicitly (no globs), never synchronized.
import 'reflect-metadata';
import { DataSource, type EntityManager, type LoggerOptions, type Logger as TypeOrmLogger } from 'typeorm';
import type { IsolationLevel } from 'typeorm/driver/types/IsolationLevel.js';
import { withConflictRetry } from '../lib/transaction.js';
import type { Config } from '../config.js';
import { OrganizationEntity } from '../shops/organization.entity.js';
import { ShopEntity } from '../shops/shop.entity.js';
import { UserEntity } from '../people/user.entity.js';
import { ForemanShopEntity } from '../people/foreman-shop.entity.js';
import { WelderEntity } from '../welders/welder.entity.js';
import { AuthTokenEntity } from '../auth/auth-token.entity.js';
import { AuditEventEntity } from '../audit/audit-event.entity.js';
import { UploadEntity } from '../uploads/upload.entity.js';
import { ProcedureEntity } from '../procedures/procedure.entity.js';
import { CouponEntity, CouponUploadEntity } from '../coupons/coupon.entity.js';
import { QualificationEntity } from '../qualifications/qualification.entity.js';
import { VerifyTokenEntity } from '../verify/verify-token.entity.js';
import { Foundation1764633600000 } from './migrations/1764633600000-foundation.js';
import { Records1764720000000 } from './migrations/1764720000000-records.js';
import { Continuity1764806400000 } from './migrations/1764806400000-continuity.js';
import { ContinuityEntryEntity, ContinuityStateEntity } from '../continuity/continuity.entity.js';
import { LapseWatch1764892800000 } from './migrations/1764892800000-lapse-watch.js';
import { ContinuityIndexes1764979200000 } from './migrations/1764979200000-continuity-indexes.js';
import { LapseDelivery1765200000000 } from './migrations/1765200000000-lapse-delivery.js';
import { CouponEvaluation1765300000000 } from './migrations/1765300000000-coupon-evaluation.js';
import { ImportsAndApiTokens1765700000000 } from './migrations/1765700000000-imports-and-api-tokens.js';
import { Sessions1765500000000 } from './migrations/1765500000000-sessions.js';
import { ImportPhase1765700000001 } from './migrations/1765700000001-import-phase.js';
import { ExaminationParts1766200000000 } from './migrations/1766200000000-examination-parts.js';
import { SignInThrottle1765500000001 } from './migrations/1765500000001-sign-in-throttle.js';
import { WpqNumbers1765400000000 } from './migrations/1765400000000-wpq-numbers.js';
import { ReviewDecision1766100000000 } from './migrations/1766100000000-review-decision.js';
import { InvitationsPerCompany1766400000000 } from './migrations/1766400000000-invitations-per-company.js';
import { PaperRecords1767500000000 } from './migrations/1767500000000-paper-records.js';
import { QualificationRangesKey1767100000000 } from './migrations/1767100000000-qualification-ranges-key.js';
import { CrewCoveringIndex1767100000001 } from './migrations/1767100000001-crew-covering-index.js';
import { RetestLink1767000000000 } from './migrations/1767000000000-retest-link.js';
import { LinkMailOutbox1767300000000 } from './migrations/1767300000000-link-mail-outbox.js';
import { PendingUploads1767400000000 } from './migrations/1767400000000-pending-uploads.js';
import { CombinationQualifications1767000000001 } from './migrations/1767000000001-combination-qualifications.js';
import { ProductionWelds1767200000000 } from './migrations/1767200000000-production-welds.js';
import { WeldFlagNotices1767210000000 } from './migrations/1767210000000-weld-flag-notices.js';
import { WeldEntity, WeldPassEntity } from '../welds/weld.entity.js';
import { CompanySettingsEntity } from '../settings/company-settings.entity.js';
import { LapseNoticeEntity, LapseWatchRunEntity, NoticeDeliveryEntity } from '../lapse-watch/lapse-watch.entity.js';

export const entities = [
  OrganizationEntity,
  ShopEntity,
  UserEntity,
  ForemanShopEntity,
  WelderEntity,
  AuthTokenEntity,
  AuditEventEntity,
  UploadEntity,
  ProcedureEntity,
  CouponEntity,
  CouponUploadEntity,
  QualificationEntity,
  VerifyTokenEntity,
  ContinuityEntryEntity,
  ContinuityStateEntity,
  CompanySettingsEntity,
  LapseWatchRunEntity,
  LapseNoticeEntity,
  NoticeDeliveryEntity,
  WeldEntity,
  WeldPassEntity,
];
export const migrations = [Foundation1764633600000, Records1764720000000, Continuity1764806400000, LapseWatch1764892800000, ContinuityIndexes1764979200000, LapseDelivery1765200000000, ImportsAndApiTokens1765700000000, Sessions1765500000000, ImportPhase1765700000001, SignInThrottle1765500000001, CouponEvaluation1765300000000, WpqNumbers1765400000000, ExaminationParts1766200000000, InvitationsPerCompany1766400000000, ReviewDecision1766100000000, PaperRecords1767500000000, QualificationRangesKey1767100000000, RetestLink1767000000000, LinkMailOutbox1767300000000, PendingUploads1767400000000, CombinationQualifications1767000000001, CrewCoveringIndex1767100000001, ProductionWelds1767200000000, WeldFlagNotices1767210000000];

export interface DataSourceOptions {
  /** Pool size; the API default suits one instance on a small machine. */
  poolSize?: number;
  logging?: LoggerOptions;
  logger?: TypeOrmLogger;
}

/** A DataSource whose transactions are retried on deadlock and serialization failure (lib/transaction.ts). */
export class RetryingDataSource extends DataSource {
  override transaction<T>(run: (manager: EntityManager) => Promise<T>): Promise<T>;
  override transaction<T>(isolation: IsolationLevel, run: (manager: EntityManager) => Promise<T>): Promise<T>;
  override transaction<T>(
    a: IsolationLevel | ((manager: EntityManager) => Promise<T>),
    b?: (manager: EntityManager) => Promise<T>,
  ): Promise<T> {
    return withConflictRetry(() =>
      typeof a === 'function' ? super.transaction(a) : super.transaction(a, b!),
    );
  }
}

export function createDataSource(db: Config['db'], opts: DataSourceOptions = {}): DataSource {
  return new RetryingDataSource({
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
      // No JIT: Beadroll's queries are short, and the continuity walk's plan cost (a large estimate over
      // window functions) made PostgreSQL spend seconds compiling it on every save of a big shop and every
      // full recompute (bench:continuity: about 4 s of a 9 s walk went to JIT, measured with EXPLAIN ANALYZE).
      options: '-c jit=off',
    },
  });
}

/** Runs pending migrations, each in its own transaction. Returns the names of those applied. */
export async function runMigrations(dataSource: DataSource): Promise<string[]> {
  const applied = await dataSource.runMigrations({ transaction: 'each' });
  return applied.map((m) => m.name);
}
