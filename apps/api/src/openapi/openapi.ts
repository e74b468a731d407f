// The OpenAPI 3.1 description of /api, generated (zod-to-openapi) from the route table, whose schemas are
// the very zod objects the handlers parse with. Built once per process and cached.
import { OpenAPIRegistry, OpenApiGeneratorV31, type RouteConfig } from '@asteasolutions/zod-to-openapi';
import { z } from 'zod';
import { errorBodySchema } from '@beadroll/rules';
import { allRouteDocs, type RouteDoc } from './route-docs.js';

/** Express `/welders/:id/card.pdf` → OpenAPI `/welders/{id}/card.pdf`. */
export const openApiPath = (expressPath: string) => expressPath.replace(/:(\w+)/g, '{$1}');

const paramsOf = (path: string) => {
  const names = [...path.matchAll(/:(\w+)/g)].map((m) => m[1]!);
  return names.length ? z.object(Object.fromEntries(names.map((n) => [n, z.string()]))) : undefined;
};

const errorResponse = (description: string) => ({
  description,
  content: { 'application/json': { schema: errorBodySchema } },
});

function routeConfig(doc: RouteDoc): RouteConfig {
  const params = paramsOf(doc.path);
  const request: NonNullable<RouteConfig['request']> = {};
  if (params) request.params = params;
  if (doc.query) request.query = doc.query;
  if (doc.body) request.body = { required: true, content: { 'application/json': { schema: doc.body } } };
  if (doc.multipart)
    request.body = {
      required: true,
      content: { 'multipart/form-data': { schema: doc.multipart.extend({ file: z.string().meta({ format: 'binary' }) }) } },
    };
  const ok =
    doc.response === null
      ? { description: 'Done (no body)' }
      : 'binary' in doc.response
        ? { description: 'The file', content: { [doc.response.binary]: { schema: z.string().meta({ format: 'binary' }) } } }
        : { description: 'Success', content: { 'application/json': { schema: doc.response } } };
  const security: Record<string, string[]>[] =
    doc.access === 'public' ? [] : doc.access === 'session' ? [{ session: [] }] : [{ session: [] }, { apiToken: [] }];
  const who = doc.roles ? ` Roles: ${doc.roles.join(', ')}.` : '';
  const how =
    doc.access === 'public' ? 'No sign-in.' : doc.access === 'session' ? 'Signed-in person only (no API token).' : 'Session or API token.';
  return {
    method: doc.method,
    path: openApiPath(doc.path),
    summary: doc.summary,
    description: `${how}${who}`,
    tags: [doc.tag],
    security,
    request,
    responses: {
      [doc.status]: ok,
      400: errorResponse('Invalid input; `fields` names each wrong field'),
      ...(doc.access === 'public' ? {} : { 401: errorResponse('Not signed in, or the API token is not valid') }),
      ...(doc.access === 'public' ? {} : { 403: errorResponse('The role or token scope does not allow this') }),
      404: errorResponse('No such record (or not of your company)'),
    },
  };
}

let cached: ReturnType<OpenApiGeneratorV31['generateDocument']> | undefined;

export function openApiDocument() {
  if (cached) return cached;
  const registry = new OpenAPIRegistry();
  registry.registerComponent('securitySchemes', 'session', {
    type: 'apiKey',
    in: 'cookie',
    name: 'beadroll_session',
    description: 'The browser session of a signed-in person (set by POST /api/auth/login).',
  });
  registry.registerComponent('securitySchemes', 'apiToken', {
    type: 'http',
    scheme: 'bearer',
    description:
      'An API token made by a QA manager in Settings → API tokens: `Authorization: Bearer brt_…`. Read-only tokens may only GET; a token limited to shops reaches what a foreman of those shops reaches.',
  });
  for (const doc of allRouteDocs()) registry.registerPath(routeConfig(doc));
  cached = new OpenApiGeneratorV31(registry.definitions).generateDocument({
    openapi: '3.1.0',
    info: {
      title: 'Beadroll API',
      version: '1',
      description:
        'The welder-qualification registry’s HTTP API. Computed ranges and statuses support, and do not replace, the code edition in force, the company’s quality manual and the responsible inspector.',
    },
    servers: [{ url: '/api' }],
  });
  return cached;
}
