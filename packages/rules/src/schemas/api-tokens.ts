// Request and response contracts of API tokens: keys a QA manager gives to another system (ERP, HR,
// a customer portal). A token is shown once at creation; the registry keeps only its hash.
import { z } from 'zod';
import { shopRefSchema } from './foundation.js';

export const apiTokenAccess = ['read', 'read-write'] as const;
export type ApiTokenAccess = (typeof apiTokenAccess)[number];

export const apiTokenInput = z.object({
  name: z.string().trim().min(1, 'Required').max(80, 'At most 80 characters'),
  access: z.enum(apiTokenAccess, 'Choose read-only or read and write'),
  /** Shops the token may reach; empty means every shop of the company. */
  shopIds: z.array(z.string().uuid('Choose one from the list')).max(50).optional().default([]),
});
export type ApiTokenInput = z.input<typeof apiTokenInput>;

export const apiTokenSchema = z.object({
  id: z.string(),
  name: z.string(),
  access: z.enum(apiTokenAccess),
  /** Empty: every shop of the company. */
  shops: z.array(shopRefSchema),
  /** The first characters of the token, to tell tokens apart without revealing them. */
  prefix: z.string(),
  createdAt: z.string(),
  createdBy: z.object({ id: z.string(), name: z.string() }),
  lastUsedAt: z.string().nullable(),
  revokedAt: z.string().nullable(),
});
export type ApiToken = z.infer<typeof apiTokenSchema>;

export const apiTokenListSchema = z.object({ items: z.array(apiTokenSchema) });
export type ApiTokenList = z.infer<typeof apiTokenListSchema>;

/** The answer to creating a token: the only time the secret itself is shown. */
export const apiTokenCreatedSchema = z.object({ token: z.string(), apiToken: apiTokenSchema });
export type ApiTokenCreated = z.infer<typeof apiTokenCreatedSchema>;
