// Reading the audit trail: one query plus one count, newest first, always within one company.
import type { EntityManager } from 'typeorm';
import type { AuditEvent } from '@beadroll/rules';
import { AuditEventEntity } from './audit-event.entity.js';

type AuditRaw = Omit<AuditEvent, 'at'> & { at: Date };

export interface AuditFilter {
  organizationId: string;
  entityType?: string;
  entityId?: string;
  page: number;
  pageSize: number;
}

export async function listAuditEvents(
  db: EntityManager,
  f: AuditFilter,
): Promise<{ items: AuditEvent[]; total: number }> {
  const qb = db
    .createQueryBuilder()
    .from(AuditEventEntity, 'e')
    .leftJoin('User', 'u', 'u.id = e.actor_id')
    .select('e.id', 'id')
    .addSelect('e.at', 'at')
    .addSelect(
      `CASE WHEN u.id IS NULL THEN NULL ELSE json_build_object('id', u.id, 'name', u.name) END`,
      'actor',
    )
    .addSelect('e.action', 'action')
    .addSelect('e.entity_type', 'entityType')
    .addSelect('e.entity_id', 'entityId')
    .addSelect('e.before', 'before')
    .addSelect('e.after', 'after')
    .where('e.organization_id = :org', { org: f.organizationId });
  if (f.entityType) qb.andWhere('e.entity_type = :entityType', { entityType: f.entityType });
  if (f.entityId) qb.andWhere('e.entity_id = :entityId', { entityId: f.entityId });
  const total = await qb.clone().getCount();
  const rows = await qb
    .orderBy('e.at', 'DESC')
    .addOrderBy('e.id', 'DESC')
    .offset((f.page - 1) * f.pageSize)
    .limit(f.pageSize)
    .getRawMany<AuditRaw>();
  return { items: rows.map((r) => ({ ...r, at: r.at.toISOString() })), total };
}
