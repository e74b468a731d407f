import { EntitySchema } from 'typeorm';
import { col } from '../lib/entity-columns.js';

/** A company. Every other row belongs to exactly one organization, and every query is scoped by it. */
export interface Organization {
  id: string;
  name: string;
  createdAt: Date;
}

export const OrganizationEntity = new EntitySchema<Organization>({
  name: 'Organization',
  tableName: 'organizations',
  columns: { id: col.id(), name: col.text('name'), createdAt: col.createdAt() },
});
