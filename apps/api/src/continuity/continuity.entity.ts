import { EntitySchema } from 'typeorm';
import { col } from '../lib/entity-columns.js';

/** One cell of the monthly continuity log: a welder used a process in a shop in a month. */
export interface ContinuityEntryRow {
  id: string;
  organizationId: string;
  welderId: string;
  shopId: string;
  process: string;
  month: string;
  usedOn: string;
  jobReference: string;
  note: string;
  flaggedLapsed: boolean;
  reviewStatus: 'pending' | 'reviewed' | null;
  reviewNote: string | null;
  reviewDecision: string | null;
  reviewedBy: string | null;
  reviewedAt: Date | null;
  loggedBy: string | null;
  createdAt: Date;
  updatedAt: Date;
  version: number;
}

export const ContinuityEntryEntity = new EntitySchema<ContinuityEntryRow>({
  name: 'ContinuityEntry',
  tableName: 'continuity_entries',
  columns: {
    id: col.id(),
    organizationId: col.uuid('organization_id'),
    welderId: col.uuid('welder_id'),
    shopId: col.uuid('shop_id'),
    process: col.text('process'),
    month: { type: 'date', name: 'month' },
    usedOn: { type: 'date', name: 'used_on' },
    jobReference: col.text('job_reference'),
    note: col.text('note'),
    flaggedLapsed: col.bool('flagged_lapsed'),
    reviewStatus: col.text('review_status', true),
    reviewNote: col.text('review_note', true),
    reviewDecision: col.text('review_decision', true),
    reviewedBy: col.uuid('reviewed_by', true),
    reviewedAt: col.at('reviewed_at', true),
    loggedBy: col.uuid('logged_by', true),
    createdAt: col.createdAt(),
    updatedAt: col.at('updated_at'),
    version: col.int('version'),
  },
});

/** The maintained continuity state of one (welder, process, code) pair. */
export interface ContinuityStateRow {
  welderId: string;
  process: string;
  code: string;
  organizationId: string;
  qualifiedOn: string;
  lastEvidence: string;
  lastTest: string;
  lapsesOn: string;
  renewedOn: string | null;
  ignored: string[];
  updatedAt: Date;
}

export const ContinuityStateEntity = new EntitySchema<ContinuityStateRow>({
  name: 'ContinuityState',
  tableName: 'continuity_states',
  columns: {
    welderId: { type: 'uuid', name: 'welder_id', primary: true },
    process: { type: 'text', name: 'process', primary: true },
    code: { type: 'text', name: 'code', primary: true },
    organizationId: col.uuid('organization_id'),
    qualifiedOn: { type: 'date', name: 'qualified_on' },
    lastEvidence: { type: 'date', name: 'last_evidence' },
    lastTest: { type: 'date', name: 'last_test' },
    lapsesOn: { type: 'date', name: 'lapses_on' },
    renewedOn: { type: 'date', name: 'renewed_on', nullable: true },
    ignored: { type: 'date', name: 'ignored', array: true },
    updatedAt: col.at('updated_at'),
  },
});
