import { EntitySchema } from 'typeorm';
import { col } from '../lib/entity-columns.js';

/** A welder of a company, known by a stamp unique within the company. Never hard-deleted: left = inactive. */
export interface Welder {
  id: string;
  organizationId: string;
  stamp: string;
  name: string;
  homeShopId: string;
  email: string;
  active: boolean;
  leftAt: Date | null;
  /** Optimistic-lock version: every update increments it; an edit from a stale version gets 409. */
  version: number;
  createdAt: Date;
  updatedAt: Date;
}

export const WelderEntity = new EntitySchema<Welder>({
  name: 'Welder',
  tableName: 'welders',
  columns: {
    id: col.id(),
    organizationId: col.uuid('organization_id'),
    stamp: col.text('stamp'),
    name: col.text('name'),
    homeShopId: col.uuid('home_shop_id'),
    email: col.text('email'),
    active: col.bool('active'),
    leftAt: col.at('left_at', true),
    version: col.int('version'),
    createdAt: col.createdAt(),
    updatedAt: col.at('updated_at'),
  },
});
