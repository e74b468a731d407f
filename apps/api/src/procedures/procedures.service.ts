// The company's WPS register: listing (QA manager and foreman), adding and revising (QA manager), with
// optimistic locking on `version`. A WPS is never deleted; superseding is a status change.
import type { EntityManager } from 'typeorm';
import type { z } from 'zod';
import {
  toMm,
  type Procedure,
  type procedureInput,
  type procedureListQuery,
  type procedureUpdateInput,
} from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { AppError } from '../lib/errors.js';
import { isUuid, type Actor } from '../lib/scope.js';
import { diff, recordAudit } from '../lib/audit.js';
import { isUniqueViolation } from '../lib/db-errors.js';
import { checkAttachments } from '../uploads/uploads.service.js';
import * as repo from './procedures.repository.js';

type Input = z.output<typeof procedureInput>;
type UpdateInput = z.output<typeof procedureUpdateInput>;
type ListQuery = z.output<typeof procedureListQuery>;

const STALE = 'Someone else changed this WPS since you opened it; reload to see their change and try again';
const numberTaken = (number: string, revision: string) =>
  AppError.validation({ revision: `WPS ${number} rev ${revision} is already in the register` });

export async function listProcedures(deps: AppDeps, actor: Actor, q: ListQuery) {
  return { items: await repo.listProcedures(deps.dataSource.manager, actor.organizationId, q) };
}

export async function getProcedure(deps: AppDeps, actor: Actor, id: string): Promise<Procedure> {
  const p = isUuid(id) ? await repo.findProcedure(deps.dataSource.manager, actor.organizationId, id) : null;
  if (!p) throw AppError.notFound('WPS');
  return p;
}

function fieldsOf(input: Input): repo.ProcedureFields {
  return {
    number: input.number,
    revision: input.revision,
    code: input.code,
    processes: [...new Set(input.processes)],
    pNumbers: input.pNumbers,
    fNumber: input.fNumber ?? null,
    positions: [...new Set(input.positions)],
    thicknessMin: input.thicknessMin ?? null,
    thicknessMax: input.thicknessMax ?? null,
    status: input.status,
    documentUploadId: input.documentUploadId ?? null,
    notes: input.notes,
  };
}

async function check(db: EntityManager, actor: Actor, f: repo.ProcedureFields, selfId?: string) {
  if (f.thicknessMin && f.thicknessMax && toMm(f.thicknessMin) > toMm(f.thicknessMax))
    throw AppError.validation({ thicknessMax: 'The largest thickness is smaller than the smallest' });
  const taken = await repo.findByNumber(db, actor.organizationId, f.number, f.revision);
  if (taken && taken.id !== selfId) throw numberTaken(f.number, f.revision);
  if (f.documentUploadId)
    await checkAttachments(db, actor, [{ field: 'documentUploadId', id: f.documentUploadId }]);
}

function onUnique(f: { number?: string; revision?: string }) {
  return (err: unknown): never => {
    if (isUniqueViolation(err, 'procedures_number_revision_key'))
      throw numberTaken(f.number ?? '', f.revision ?? '');
    throw err;
  };
}

export async function createProcedure(deps: AppDeps, actor: Actor, input: Input): Promise<Procedure> {
  const fields = fieldsOf(input);
  const id = await deps.dataSource
    .transaction(async (db) => {
      await check(db, actor, fields);
      const now = deps.clock.now();
      const procedureId = await repo.insertProcedure(db, actor.organizationId, fields, now);
      await recordAudit(db, actor, now, {
        action: 'procedure.created',
        entityType: 'procedure',
        entityId: procedureId,
        before: null,
        after: { ...fields },
      });
      return procedureId;
    })
    .catch(onUnique(fields));
  return getProcedure(deps, actor, id);
}

export async function updateProcedure(
  deps: AppDeps,
  actor: Actor,
  id: string,
  input: UpdateInput,
): Promise<Procedure> {
  if (!isUuid(id)) throw AppError.notFound('WPS');
  await deps.dataSource
    .transaction(async (db) => {
      const current = await repo.lockProcedure(db, actor.organizationId, id);
      if (!current) throw AppError.notFound('WPS');
      if (current.version !== input.version) throw AppError.conflict(STALE);
      const { id: _id, version: _v, ...before } = current;
      const patch: Partial<repo.ProcedureFields> = {};
      for (const [k, v] of Object.entries(input) as [keyof UpdateInput, unknown][]) {
        if (k === 'version' || v === undefined) continue;
        (patch as Record<string, unknown>)[k] = v;
      }
      if (patch.processes) patch.processes = [...new Set(patch.processes)];
      if (patch.positions) patch.positions = [...new Set(patch.positions)];
      const after: repo.ProcedureFields = { ...before, ...patch };
      const changes = diff(before, after);
      if (changes.changed.length === 0) return;
      await check(db, actor, after, id);
      const now = deps.clock.now();
      if (!(await repo.updateProcedure(db, id, current.version, changes.after, now)))
        throw AppError.conflict(STALE);
      await recordAudit(db, actor, now, {
        action:
          changes.changed.includes('status') && after.status === 'superseded'
            ? 'procedure.superseded'
            : 'procedure.updated',
        entityType: 'procedure',
        entityId: id,
        before: changes.before,
        after: changes.after,
      });
    })
    .catch(onUnique(input));
  return getProcedure(deps, actor, id);
}
