import { EntitySchema } from 'typeorm';
import { col } from '../lib/entity-columns.js';

export type TokenPurpose = 'invitation' | 'password-reset';

/** A single-use link token. Only its SHA-256 hash is stored. */
export interface AuthToken {
  id: string;
  userId: string;
  tokenHash: string;
  purpose: TokenPurpose;
  expiresAt: Date;
  usedAt: Date | null;
  createdAt: Date;
}

export const AuthTokenEntity = new EntitySchema<AuthToken>({
  name: 'AuthToken',
  tableName: 'auth_tokens',
  columns: {
    id: col.id(),
    userId: col.uuid('user_id'),
    tokenHash: col.text('token_hash'),
    purpose: col.text('purpose'),
    expiresAt: col.at('expires_at'),
    usedAt: col.at('used_at', true),
    createdAt: col.createdAt(),
  },
});
