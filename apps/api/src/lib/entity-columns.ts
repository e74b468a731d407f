// Column shorthands for the entity schemas. Every column states its database type explicitly: the API
// runs under tsx (esbuild) as well as vitest, and nothing may depend on emitted decorator metadata.
import type { EntitySchemaColumnOptions } from 'typeorm';

export const col = {
  id: (): EntitySchemaColumnOptions => ({ type: 'uuid', primary: true, generated: 'uuid' }),
  uuid: (name: string, nullable = false): EntitySchemaColumnOptions => ({ type: 'uuid', name, nullable }),
  text: (name: string, nullable = false): EntitySchemaColumnOptions => ({ type: 'text', name, nullable }),
  bool: (name: string): EntitySchemaColumnOptions => ({ type: 'boolean', name }),
  int: (name: string): EntitySchemaColumnOptions => ({ type: 'integer', name }),
  jsonb: (name: string): EntitySchemaColumnOptions => ({ type: 'jsonb', name, nullable: true }),
  at: (name: string, nullable = false): EntitySchemaColumnOptions => ({
    type: 'timestamptz',
    name,
    nullable,
  }),
  createdAt: (): EntitySchemaColumnOptions => ({ type: 'timestamptz', name: 'created_at', createDate: true }),
};
