// The audit list query. @beadroll/rules has no schema for it yet; this one is the API's until the rules
// package takes it over (then import it from there and delete this file).
import { z } from 'zod';

export const auditListQuery = z.object({
  entityType: z
    .enum(['shop', 'person', 'welder', 'procedure', 'coupon', 'qualification', 'upload', 'verify-token', 'continuity-entry', 'company-settings'])
    .optional(),
  entityId: z.string().uuid('Not a valid id').optional(),
  page: z.coerce.number().int().min(1).optional().default(1),
});
export type AuditListQuery = z.output<typeof auditListQuery>;
