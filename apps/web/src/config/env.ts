// The web app's build-time settings, checked once. The API is served at the same origin by default.
import { z } from 'zod';

const envSchema = z.object({
  VITE_API_BASE: z.string().default(''),
  MODE: z.string(),
  DEV: z.boolean(),
});

export const env = envSchema.parse(import.meta.env);
