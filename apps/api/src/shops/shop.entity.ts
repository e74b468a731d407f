import { EntitySchema } from 'typeorm';
import { col } from '../lib/entity-columns.js';

/** A shop (or field crew) of a company; its code is unique within the company. */
export interface Shop {
  id: string;
  organizationId: string;
  name: string;
  code: string;
  location: string;
  active: boolean;
  createdAt: Date;
}

export const ShopEntity = new EntitySchema<Shop>({
  name: 'Shop',
  tableName: 'shops',
  columns: {
    id: col.id(),
    organizationId: col.uuid('organization_id'),
    name: col.text('name'),
    code: col.text('code'),
    location: col.text('location'),
    active: col.bool('active'),
    createdAt: col.createdAt(),
  },
});
