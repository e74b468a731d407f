import { EntitySchema } from 'typeorm';
import { col } from '../lib/entity-columns.js';

/** One revision of a welding procedure specification in the company's register. Never deleted. */
export interface ProcedureRow {
  id: string;
  organizationId: string;
  number: string;
  revision: string;
  code: string;
  processes: string[];
  pNumbers: string[];
  fNumber: number | null;
  positions: string[];
  thicknessMin: { value: number; unit: 'in' | 'mm' } | null;
  thicknessMax: { value: number; unit: 'in' | 'mm' } | null;
  status: string;
  documentUploadId: string | null;
  notes: string;
  /** Optimistic-lock version: an edit from a stale version gets 409. */
  version: number;
  createdAt: Date;
  updatedAt: Date;
}

export const ProcedureEntity = new EntitySchema<ProcedureRow>({
  name: 'Procedure',
  tableName: 'procedures',
  columns: {
    id: col.id(),
    organizationId: col.uuid('organization_id'),
    number: col.text('number'),
    revision: col.text('revision'),
    code: col.text('code'),
    processes: { type: 'text', name: 'processes', array: true },
    pNumbers: { type: 'text', name: 'p_numbers', array: true },
    fNumber: { type: 'integer', name: 'f_number', nullable: true },
    positions: { type: 'text', name: 'positions', array: true },
    thicknessMin: col.jsonb('thickness_min'),
    thicknessMax: col.jsonb('thickness_max'),
    status: col.text('status'),
    documentUploadId: col.uuid('document_upload_id', true),
    notes: col.text('notes'),
    version: col.int('version'),
    createdAt: col.createdAt(),
    updatedAt: col.at('updated_at'),
  },
});
