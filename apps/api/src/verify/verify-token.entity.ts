import { EntitySchema } from 'typeorm';
import { col } from '../lib/entity-columns.js';

/** A welder's public verify token: stored as a hash for lookup and sealed (encrypted) for reprinting. */
export interface VerifyTokenRow {
  id: string;
  organizationId: string;
  welderId: string;
  tokenHash: string;
  tokenSealed: string;
  issuedAt: Date;
  issuedBy: string | null;
  revokedAt: Date | null;
}

export const VerifyTokenEntity = new EntitySchema<VerifyTokenRow>({
  name: 'VerifyToken',
  tableName: 'verify_tokens',
  columns: {
    id: col.id(),
    organizationId: col.uuid('organization_id'),
    welderId: col.uuid('welder_id'),
    tokenHash: col.text('token_hash'),
    tokenSealed: col.text('token_sealed'),
    issuedAt: col.at('issued_at'),
    issuedBy: col.uuid('issued_by', true),
    revokedAt: col.at('revoked_at', true),
  },
});
