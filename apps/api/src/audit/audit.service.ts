// The audit trail of a company, for the QA manager and for auditors.
import type { AuditEvent, AuditListQuery } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import type { Actor } from '../lib/scope.js';
import * as repo from './audit.repository.js';

export const AUDIT_PAGE_SIZE = 50;

export async function listAudit(
  deps: AppDeps,
  actor: Actor,
  query: AuditListQuery,
): Promise<{ items: AuditEvent[]; total: number; page: number; pageSize: number }> {
  const { items, total } = await repo.listAuditEvents(deps.dataSource.manager, {
    organizationId: actor.organizationId,
    ...query,
    pageSize: AUDIT_PAGE_SIZE,
  });
  return { items, total, page: query.page, pageSize: AUDIT_PAGE_SIZE };
}
