// Request and response contracts of the foundation: sign-in, shops, people and welders.
// The API parses request bodies with these; the web resolves its forms and parses responses with them.
import { z } from 'zod';
import { searchQuerySchema, textSchema } from './common.js';

export const roles = ['qa_manager', 'foreman', 'welder'] as const;
export const roleSchema = z.enum(roles);
export type Role = z.infer<typeof roleSchema>;

const trimmed = (max: number) => textSchema({ max, min: 1 });
const email = z.string().trim().toLowerCase().email('Enter a valid e-mail address').max(254);
const uuid = z.string().uuid('Choose one from the list');

export const passwordSchema = z
  .string()
  .min(10, 'Use at least 10 characters')
  .max(200, 'At most 200 characters');

// ---- auth -------------------------------------------------------------------------------------------

export const loginInput = z.object({
  email,
  password: z.string().min(1, 'Required').max(200),
});
export type LoginInput = z.infer<typeof loginInput>;

export const setPasswordInput = z.object({
  token: z.string().min(20, 'Not a valid link').max(200),
  password: passwordSchema,
});
export type SetPasswordInput = z.infer<typeof setPasswordInput>;

export const passwordResetRequestInput = z.object({ email });
export type PasswordResetRequestInput = z.infer<typeof passwordResetRequestInput>;

export const shopRefSchema = z.object({ id: z.string(), name: z.string(), code: z.string() });
export type ShopRef = z.infer<typeof shopRefSchema>;

export const meSchema = z.object({
  id: z.string(),
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  organization: z.object({ id: z.string(), name: z.string() }),
  /** QA manager: every shop of the company; foreman: assigned shops; welder: home shop. */
  shops: z.array(shopRefSchema),
  /** The welder record a welder account belongs to; null for other roles. */
  welderId: z.string().nullable(),
  /** The company's time zone in force (IANA name): "today" and the current month are computed in it. */
  timeZone: z.string(),
});
export type Me = z.infer<typeof meSchema>;

/**
 * What a set-password link is for. A link that cannot be used (expired, used, unknown, or an address that
 * signs in elsewhere) is an answer too, not an error: the page says why, and the browser logs nothing.
 */
export const tokenInfoSchema = z.discriminatedUnion('usable', [
  z.object({
    usable: z.literal(true),
    email: z.string(),
    name: z.string(),
    purpose: z.enum(['invitation', 'password-reset']),
    expiresAt: z.string(),
    /** The inviting company's time zone: the link's end is shown on its clock. */
    timeZone: z.string(),
  }),
  z.object({ usable: z.literal(false), message: z.string() }),
]);
export type TokenInfo = z.infer<typeof tokenInfoSchema>;

// ---- shops ------------------------------------------------------------------------------------------

export const shopInput = z.object({
  name: trimmed(120),
  code: z
    .string()
    .trim()
    .toUpperCase()
    .regex(/^[A-Z0-9-]{2,12}$/, '2 to 12 letters, digits or dashes'),
  location: textSchema({ max: 200 }).optional().default(''),
});
export type ShopInput = z.input<typeof shopInput>;

export const shopUpdateInput = z
  .object({
    name: trimmed(120),
    code: shopInput.shape.code,
    location: textSchema({ max: 200 }),
    active: z.boolean(),
  })
  .partial();
export type ShopUpdateInput = z.infer<typeof shopUpdateInput>;

export const shopSchema = z.object({
  id: z.string(),
  name: z.string(),
  code: z.string(),
  location: z.string(),
  active: z.boolean(),
  welderCount: z.number().int(),
  foremen: z.array(z.object({ id: z.string(), name: z.string() })),
});
export type Shop = z.infer<typeof shopSchema>;

// ---- people (user accounts) -------------------------------------------------------------------------

export const personInput = z
  .object({
    email,
    name: trimmed(120),
    role: roleSchema,
    shopIds: z.array(uuid).max(50).optional().default([]),
    /** Required when role is welder: the welder record this account signs in for. */
    welderId: uuid.optional(),
  })
  .superRefine((v, ctx) => {
    if (v.role === 'foreman' && v.shopIds.length === 0)
      ctx.addIssue({ code: 'custom', path: ['shopIds'], message: 'Assign the foreman to at least one shop' });
    if (v.role === 'welder' && !v.welderId)
      ctx.addIssue({ code: 'custom', path: ['welderId'], message: 'Choose the welder this account is for' });
  });
export type PersonInput = z.input<typeof personInput>;

export const personUpdateInput = z
  .object({
    name: trimmed(120),
    shopIds: z.array(uuid).max(50),
    active: z.boolean(),
  })
  .partial();
export type PersonUpdateInput = z.infer<typeof personUpdateInput>;

export const personSchema = z.object({
  id: z.string(),
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  /** invited: has not set a password yet; active: can sign in; deactivated: cannot sign in. */
  status: z.enum(['invited', 'active', 'deactivated']),
  shops: z.array(shopRefSchema),
  welderId: z.string().nullable(),
  lastSignInAt: z.string().nullable(),
});
export type Person = z.infer<typeof personSchema>;

// ---- welders ----------------------------------------------------------------------------------------

export const stampSchema = z
  .string()
  .trim()
  .toUpperCase()
  .regex(/^[A-Z0-9-]{1,12}$/, '1 to 12 letters, digits or dashes');

export const welderInput = z.object({
  stamp: stampSchema,
  name: trimmed(120),
  homeShopId: uuid,
  email: z.union([email, z.literal('')]).optional().default(''),
});
export type WelderInput = z.input<typeof welderInput>;

export const welderUpdateInput = z.object({
  stamp: stampSchema.optional(),
  name: trimmed(120).optional(),
  homeShopId: uuid.optional(),
  email: z.union([email, z.literal('')]).optional(),
  active: z.boolean().optional(),
  /** The version the editor started from; a stale one gives 409. */
  version: z.number().int().min(1),
});
export type WelderUpdateInput = z.infer<typeof welderUpdateInput>;

export const welderSortKeys = ['stamp', 'name', 'homeShop', 'createdAt', 'lapsesOn'] as const;
/** Continuity states a welders list can be filtered by (welders with at least one qualification in it). */
export const welderStateFilters = ['current', 'lapsing', 'lapsed', 'revoked'] as const;

export const welderListQuery = z.object({
  q: searchQuerySchema,
  shopId: uuid.optional(),
  status: z.enum(['active', 'left', 'all']).optional().default('active'),
  state: z.enum(welderStateFilters).optional(),
  sort: z.enum(welderSortKeys).optional().default('stamp'),
  dir: z.enum(['asc', 'desc']).optional().default('asc'),
  page: z.coerce.number().int().min(1).optional().default(1),
  pageSize: z.coerce.number().int().min(1).max(200).optional().default(25),
});
export type WelderListQuery = z.input<typeof welderListQuery>;

export const welderSchema = z.object({
  id: z.string(),
  stamp: z.string(),
  name: z.string(),
  homeShop: shopRefSchema,
  email: z.string(),
  active: z.boolean(),
  /** Whether a welder sign-in exists for this record. */
  hasAccount: z.boolean(),
  version: z.number().int(),
  createdAt: z.string(),
  /** Non-superseded qualifications with their continuity state today (issue 5). */
  qualifications: z
    .array(
      z.object({
        id: z.string(),
        process: z.string(),
        code: z.string(),
        state: z.enum(welderStateFilters),
        lapsesOn: z.string(),
        daysLeft: z.number().int(),
      }),
    )
    .optional(),
});
export type Welder = z.infer<typeof welderSchema>;

export const pageOf = <T extends z.ZodTypeAny>(item: T) =>
  z.object({ items: z.array(item), total: z.number().int(), page: z.number().int(), pageSize: z.number().int() });

export const welderPageSchema = pageOf(welderSchema);
export type WelderPage = z.infer<typeof welderPageSchema>;

// ---- audit ------------------------------------------------------------------------------------------

/** Every kind of record the audit trail writes about. */
export const auditEntityTypes = [
  'shop',
  'person',
  'welder',
  'procedure',
  'coupon',
  'qualification',
  'upload',
  'verify-token',
  'continuity-entry',
  'company-settings',
  'api-token',
  'import',
  'lapse-watch-run',
  'weld',
] as const;
export type AuditEntityType = (typeof auditEntityTypes)[number];

export const auditListQuery = z.object({
  entityType: z.enum(auditEntityTypes).optional(),
  entityId: uuid.optional(),
  page: z.coerce.number().int().min(1).optional().default(1),
});
export type AuditListQuery = z.output<typeof auditListQuery>;

export const auditEventSchema = z.object({
  id: z.string(),
  at: z.string(),
  actor: z.object({ id: z.string(), name: z.string() }).nullable(),
  action: z.string(),
  entityType: z.string(),
  entityId: z.string(),
  before: z.unknown().nullable(),
  after: z.unknown().nullable(),
});
export type AuditEvent = z.infer<typeof auditEventSchema>;

// ---- errors -----------------------------------------------------------------------------------------

export const errorCodes = [
  'validation',
  'unauthenticated',
  'forbidden',
  'not_found',
  'conflict',
  'payload_too_large',
  'rate_limited',
  'unavailable',
  'internal',
] as const;
export const errorBodySchema = z.object({
  error: z.object({
    code: z.enum(errorCodes),
    message: z.string(),
    fields: z.record(z.string(), z.string()).optional(),
  }),
});
export type ErrorBody = z.infer<typeof errorBodySchema>;
