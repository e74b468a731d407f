// The development mail catcher's inbox, read through the API (never mounted in production).
import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import { apiRequest, apiSend } from '@/lib/api-client';

// The catcher may give one address or several.
const addressList = z
  .union([z.string(), z.array(z.string())])
  .nullable()
  .optional()
  .transform((v) => (Array.isArray(v) ? v.join(', ') : (v ?? '')));

export const mailSummarySchema = z.object({
  id: z.string(),
  date: z.string().nullable().optional(),
  from: addressList,
  to: addressList,
  subject: z.string(),
});
export const mailMessageSchema = mailSummarySchema.extend({
  text: z.string().nullable().optional(),
  html: z.string().nullable().optional(),
});
export type MailSummary = z.infer<typeof mailSummarySchema>;
export type MailMessage = z.infer<typeof mailMessageSchema>;

export const mailQueries = {
  all: () => ['dev-mail'] as const,
  list: () =>
    queryOptions({
      queryKey: [...mailQueries.all(), 'list'] as const,
      queryFn: async ({ signal }) =>
        (await apiRequest('/api/dev/mail', z.object({ items: z.array(mailSummarySchema) }), { signal, redirectOn401: false })).items,
      refetchInterval: 5000,
    }),
  detail: (id: string) =>
    queryOptions({
      queryKey: [...mailQueries.all(), 'detail', id] as const,
      queryFn: ({ signal }) => apiRequest(`/api/dev/mail/${encodeURIComponent(id)}`, mailMessageSchema, { signal, redirectOn401: false }),
    }),
  /** Whether the API runs as a development tool (the inbox answers); decides the sign-in footer link. */
  available: () =>
    queryOptions({
      queryKey: [...mailQueries.all(), 'available'] as const,
      queryFn: ({ signal }) =>
        apiSend('/api/dev/mail', { signal, redirectOn401: false }).then(
          () => true,
          () => false,
        ),
      staleTime: Infinity,
    }),
};
