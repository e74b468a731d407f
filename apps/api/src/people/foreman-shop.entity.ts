import { EntitySchema } from 'typeorm';

/** Which shops a foreman looks after. */
export interface ForemanShop {
  userId: string;
  shopId: string;
}

export const ForemanShopEntity = new EntitySchema<ForemanShop>({
  name: 'ForemanShop',
  tableName: 'foreman_shops',
  columns: {
    userId: { type: 'uuid', name: 'user_id', primary: true },
    shopId: { type: 'uuid', name: 'shop_id', primary: true },
  },
});
