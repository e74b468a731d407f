import { EntitySchema } from 'typeorm';
import type { Role } from '@beadroll/rules';
import { col } from '../lib/entity-columns.js';

/** A sign-in. passwordHash is null until the invitation link has been used. */
export interface User {
  id: string;
  organizationId: string;
  email: string;
  name: string;
  role: Role;
  passwordHash: string | null;
  active: boolean;
  welderId: string | null;
  invitedAt: Date | null;
  lastSignInAt: Date | null;
  createdAt: Date;
}

export const UserEntity = new EntitySchema<User>({
  name: 'User',
  tableName: 'users',
  columns: {
    id: col.id(),
    organizationId: col.uuid('organization_id'),
    email: col.text('email'),
    name: col.text('name'),
    role: col.text('role'),
    passwordHash: col.text('password_hash', true),
    active: col.bool('active'),
    welderId: col.uuid('welder_id', true),
    invitedAt: col.at('invited_at', true),
    lastSignInAt: col.at('last_sign_in_at', true),
    createdAt: col.createdAt(),
  },
});
