import { EntitySchema } from 'typeorm';
import { col } from '../lib/entity-columns.js';

/** A certified welder performance qualification (WPQ). Never deleted: revoked or superseded instead. */
export interface QualificationRow {
  id: string;
  organizationId: string;
  welderId: string;
  couponId: string;
  /** 'WPQ-2026-0042': drawn by the database at insert (per company and year of certification). */
  number: string;
  code: string;
  process: string;
  transferMode: string | null;
  progression: string | null;
  ranges: object;
  certifiedOn: string;
  certifiedBy: string;
  certifiedByName: string;
  rulesVersion: string;
  revokedOn: string | null;
  revokedReason: string | null;
  revokedBy: string | null;
  supersedesId: string | null;
  supersededById: string | null;
  version: number;
  createdAt: Date;
  updatedAt: Date;
}

export const QualificationEntity = new EntitySchema<QualificationRow>({
  name: 'Qualification',
  tableName: 'qualifications',
  columns: {
    id: col.id(),
    organizationId: col.uuid('organization_id'),
    welderId: col.uuid('welder_id'),
    couponId: col.uuid('coupon_id'),
    number: { type: 'text', name: 'number', insert: false, update: false },
    code: col.text('code'),
    process: col.text('process'),
    transferMode: col.text('transfer_mode', true),
    progression: col.text('progression', true),
    ranges: { type: 'jsonb', name: 'ranges' },
    certifiedOn: { type: 'date', name: 'certified_on' },
    certifiedBy: col.uuid('certified_by'),
    certifiedByName: col.text('certified_by_name'),
    rulesVersion: col.text('rules_version'),
    revokedOn: { type: 'date', name: 'revoked_on', nullable: true },
    revokedReason: col.text('revoked_reason', true),
    revokedBy: col.uuid('revoked_by', true),
    supersedesId: col.uuid('supersedes_id', true),
    supersededById: col.uuid('superseded_by_id', true),
    version: col.int('version'),
    createdAt: col.createdAt(),
    updatedAt: col.at('updated_at'),
  },
});
