// Writes one audit event inside the caller's transaction, so a change and its record commit together.
import type { EntityManager } from 'typeorm';
import type { AuditEntityType } from '@beadroll/rules';
import type { Actor } from './scope.js';

export interface AuditInput {
  action: string;
  entityType: AuditEntityType;
  entityId: string;
  before: Record<string, unknown> | null;
  after: Record<string, unknown> | null;
}

export async function recordAudit(
  db: EntityManager,
  actor: Actor,
  at: Date,
  event: AuditInput,
): Promise<void> {
  await db.query(
    `INSERT INTO audit_events (organization_id, actor_id, at, action, entity_type, entity_id, before, after)
     VALUES ($1, $2, $3, $4, $5, $6, $7, $8)`,
    [
      actor.organizationId,
      actor.id,
      at,
      event.action,
      event.entityType,
      event.entityId,
      event.before === null ? null : JSON.stringify(event.before),
      event.after === null ? null : JSON.stringify(event.after),
    ],
  );
}

/** The fields that differ between two snapshots, as { before, after } holding only those fields. */
export function diff<T extends Record<string, unknown>>(
  before: T,
  after: T,
): { before: Partial<T>; after: Partial<T>; changed: (keyof T)[] } {
  const b: Partial<T> = {};
  const a: Partial<T> = {};
  const changed: (keyof T)[] = [];
  for (const key of Object.keys(after) as (keyof T)[]) {
    if (JSON.stringify(before[key]) !== JSON.stringify(after[key])) {
      b[key] = before[key];
      a[key] = after[key];
      changed.push(key);
    }
  }
  return { before: b, after: a, changed };
}
