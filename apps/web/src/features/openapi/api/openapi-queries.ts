// The API description the API serves about itself (GET /api/openapi.json).
import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import { apiRequest } from '@/lib/api-client';

const schemaObject: z.ZodType<JsonSchema> = z.lazy(() => z.looseObject({}));
export interface JsonSchema {
  type?: string | string[];
  properties?: Record<string, JsonSchema>;
  required?: string[];
  items?: JsonSchema;
  enum?: unknown[];
  anyOf?: JsonSchema[];
  oneOf?: JsonSchema[];
  format?: string;
  description?: string;
  default?: unknown;
  const?: unknown;
  minimum?: number;
  maximum?: number;
  maxLength?: number;
  minLength?: number;
  pattern?: string;
  additionalProperties?: JsonSchema | boolean;
}

const mediaSchema = z.record(z.string(), z.object({ schema: schemaObject.optional() }));
export const operationSchema = z.object({
  summary: z.string().optional(),
  description: z.string().optional(),
  tags: z.array(z.string()).optional(),
  parameters: z
    .array(z.object({ name: z.string(), in: z.string(), required: z.boolean().optional(), schema: schemaObject.optional() }))
    .optional(),
  requestBody: z.object({ content: mediaSchema }).optional(),
  responses: z.record(z.string(), z.object({ description: z.string().optional(), content: mediaSchema.optional() })),
});
export type Operation = z.infer<typeof operationSchema>;

export const openApiSchema = z.object({
  openapi: z.string(),
  info: z.object({ title: z.string(), version: z.string(), description: z.string().optional() }),
  paths: z.record(z.string(), z.record(z.string(), operationSchema)),
});
export type OpenApiDoc = z.infer<typeof openApiSchema>;

export const openApiQueries = {
  document: () =>
    queryOptions({
      queryKey: ['openapi'] as const,
      queryFn: ({ signal }) => apiRequest('/api/openapi.json', openApiSchema, { signal, redirectOn401: false }),
      staleTime: Infinity,
    }),
};
