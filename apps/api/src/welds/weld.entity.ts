import { EntitySchema } from 'typeorm';
import { col } from '../lib/entity-columns.js';

/** A production weld of a job (weld or joint number unique within the job), checked on entry. */
export interface WeldRow {
  id: string;
  organizationId: string;
  shopId: string;
  jobReference: string;
  weldNumber: string;
  weldedOn: string;
  procedureId: string | null;
  joint: object;
  examination: object | null;
  note: string;
  flagged: boolean;
  checkedAt: Date;
  rulesVersion: string;
  reviewStatus: 'pending' | 'dispositioned' | null;
  disposition: 'accepted' | 'cut-out' | 'requalify' | null;
  dispositionReason: string | null;
  dispositionBy: string | null;
  dispositionAt: Date | null;
  loggedBy: string | null;
  createdAt: Date;
  updatedAt: Date;
  version: number;
}

export const WeldEntity = new EntitySchema<WeldRow>({
  name: 'Weld',
  tableName: 'welds',
  columns: {
    id: col.id(),
    organizationId: col.uuid('organization_id'),
    shopId: col.uuid('shop_id'),
    jobReference: col.text('job_reference'),
    weldNumber: col.text('weld_number'),
    weldedOn: { type: 'date', name: 'welded_on' },
    procedureId: col.uuid('procedure_id', true),
    joint: { type: 'jsonb', name: 'joint' },
    examination: col.jsonb('examination'),
    note: col.text('note'),
    flagged: col.bool('flagged'),
    checkedAt: col.at('checked_at'),
    rulesVersion: col.text('rules_version'),
    reviewStatus: col.text('review_status', true),
    disposition: col.text('disposition', true),
    dispositionReason: col.text('disposition_reason', true),
    dispositionBy: col.uuid('disposition_by', true),
    dispositionAt: col.at('disposition_at', true),
    loggedBy: col.uuid('logged_by', true),
    createdAt: col.createdAt(),
    updatedAt: col.at('updated_at'),
    version: col.int('version'),
  },
});

/** One welder's part of a weld with one process, and the check of it against their qualification. */
export interface WeldPassRow {
  id: string;
  weldId: string;
  organizationId: string;
  welderId: string;
  process: string;
  layer: 'root' | 'fill' | 'cap' | 'all';
  weldedOn: string;
  qualified: boolean;
  qualificationId: string | null;
  reasons: object;
  tested: boolean;
  position: number;
}

export const WeldPassEntity = new EntitySchema<WeldPassRow>({
  name: 'WeldPass',
  tableName: 'weld_passes',
  columns: {
    id: col.id(),
    weldId: col.uuid('weld_id'),
    organizationId: col.uuid('organization_id'),
    welderId: col.uuid('welder_id'),
    process: col.text('process'),
    layer: col.text('layer'),
    weldedOn: { type: 'date', name: 'welded_on' },
    qualified: col.bool('qualified'),
    qualificationId: col.uuid('qualification_id', true),
    reasons: { type: 'jsonb', name: 'reasons' },
    tested: col.bool('tested'),
    position: col.int('position'),
  },
});
