import { EntitySchema } from 'typeorm';
import { col } from '../lib/entity-columns.js';

/** One change, append-only: the database refuses UPDATE, DELETE and TRUNCATE on this table. */
export interface AuditEventRow {
  id: string;
  organizationId: string;
  actorId: string | null;
  at: Date;
  action: string;
  entityType: string;
  entityId: string;
  before: unknown;
  after: unknown;
}

export const AuditEventEntity = new EntitySchema<AuditEventRow>({
  name: 'AuditEvent',
  tableName: 'audit_events',
  columns: {
    id: col.id(),
    organizationId: col.uuid('organization_id'),
    actorId: col.uuid('actor_id', true),
    at: col.at('at'),
    action: col.text('action'),
    entityType: col.text('entity_type'),
    entityId: col.uuid('entity_id'),
    before: col.jsonb('before'),
    after: col.jsonb('after'),
  },
});
