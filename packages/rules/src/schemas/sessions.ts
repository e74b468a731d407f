// The caller's own signed-in sessions (browsers and devices), as the account page lists them.
import { z } from 'zod';

export const sessionSchema = z.object({
  id: z.string(),
  createdAt: z.string(),
  lastSeenAt: z.string(),
  expiresAt: z.string(),
  /** The browser as it named itself, shortened; '' when unknown. */
  userAgent: z.string(),
  address: z.string(),
  /** The session this list was asked for with. */
  current: z.boolean(),
});
export type Session = z.infer<typeof sessionSchema>;

export const sessionListSchema = z.object({ items: z.array(sessionSchema) });
export type SessionList = z.infer<typeof sessionListSchema>;
