import { EntitySchema } from 'typeorm';
import { col } from '../lib/entity-columns.js';

/** A file in the object store (under `storageKey`), with the name it was uploaded as. */
export interface UploadRow {
  id: string;
  organizationId: string;
  storageKey: string;
  fileName: string;
  contentType: string;
  size: number;
  sha256: string;
  kind: string;
  uploadedBy: string | null;
  createdAt: Date;
}

export const UploadEntity = new EntitySchema<UploadRow>({
  name: 'Upload',
  tableName: 'uploads',
  columns: {
    id: col.id(),
    organizationId: col.uuid('organization_id'),
    storageKey: col.text('storage_key'),
    fileName: col.text('file_name'),
    contentType: col.text('content_type'),
    size: col.int('size'),
    sha256: col.text('sha256'),
    kind: col.text('kind'),
    uploadedBy: col.uuid('uploaded_by', true),
    createdAt: col.createdAt(),
  },
});
