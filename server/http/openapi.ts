import type { Router } from 'express';
import { z } from 'zod';

import { sessionCookie } from '@/server/auth';
import { type Action, can, roles } from '@/telemetry/roles';

import { type MountedRoute, mountedRoutes } from './meta';

type Json = Record<string, unknown>;

const errorBody = z.object({
  error: z.object({ code: z.string(), message: z.string(), details: z.unknown().optional() }),
});
const jsonSchema = (s: z.ZodType, io: 'input' | 'output') => {
  const { $schema: _drop, ...rest } = z.toJSONSchema(s, {
    io,
    unrepresentable: 'any',
    target: 'draft-2020-12',
  }) as Json;
  return rest;
};

/** Express's "/:id" as OpenAPI's "/{id}". */
export const openApiPath = (p: string) => p.replace(/:([A-Za-z0-9_]+)/g, '{$1}');

function parameters(r: MountedRoute): Json[] {
  const out: Json[] = [];
  const names = [...r.path.matchAll(/:([A-Za-z0-9_]+)/g)].map((m) => m[1]);
  const paramProps = r.meta.params
    ? ((jsonSchema(r.meta.params, 'input').properties ?? {}) as Record<string, Json>)
    : {};
  for (const n of names) out.push({ name: n, in: 'path', required: true, schema: paramProps[n] ?? { type: 'string' } });
  if (r.meta.query) {
    const q = jsonSchema(r.meta.query, 'input');
    const required = new Set((q.required as string[] | undefined) ?? []);
    for (const [name, schema] of Object.entries((q.properties ?? {}) as Record<string, Json>))
      out.push({ name, in: 'query', required: required.has(name), schema });
  }
  return out;
}

function who(access: MountedRoute['meta']['access'], narrowed?: readonly string[]): { text: string; roles: string[] } {
  if (narrowed) return { text: `Signed in as ${narrowed.join(', ')}.`, roles: [...narrowed] };
  if (!access || access === 'public') return { text: 'No sign-in needed.', roles: [] };
  if (access === 'signed-in') return { text: 'Any signed-in person.', roles: [...roles] };
  const allowed = roles.filter((r) => can(r, access as Action));
  return { text: `Permission \`${access}\`: ${allowed.join(', ')}.`, roles: allowed };
}

/**
 * The OpenAPI 3.1 document of the REST API, read off the mounted router: paths,
 * parameters, request and response schemas from the shared zod schemas, the
 * errors every route can answer, and the roles allowed.
 */
export function openApiDocument(api: Router, info: { version: string; serverUrl: string }): Json {
  const paths: Record<string, Record<string, Json>> = {};
  for (const r of mountedRoutes(api, '')) {
    const path = openApiPath(r.path);
    const access = who(r.meta.access, r.meta.roles);
    const status = String(r.meta.status ?? (r.method === 'post' ? 200 : 200));
    const responses: Record<string, Json> = {
      [status]: r.meta.contentType
        ? { description: 'OK', content: { [r.meta.contentType]: { schema: { type: 'string' } } } }
        : status === '204'
          ? { description: 'Done, nothing to return' }
          : {
              description: 'OK',
              content: {
                'application/json': {
                  schema: r.meta.response ? jsonSchema(r.meta.response, 'output') : { type: 'object' },
                },
              },
            },
      400: { $ref: '#/components/responses/BadRequest' },
      503: { $ref: '#/components/responses/Unavailable' },
    };
    if (r.meta.access && r.meta.access !== 'public')
      Object.assign(responses, {
        401: { $ref: '#/components/responses/Unauthenticated' },
        403: { $ref: '#/components/responses/Forbidden' },
      });
    if (r.path.includes(':')) responses[404] = { $ref: '#/components/responses/NotFound' };
    if (r.method !== 'get') responses[409] = { $ref: '#/components/responses/Conflict' };
    const op: Json = {
      operationId: `${r.method}${path.replace(/[{}]/g, '').replace(/[^A-Za-z0-9]+(.)?/g, (_m, c: string | undefined) => (c ? c.toUpperCase() : ''))}`,
      summary: r.meta.summary ?? `${r.method.toUpperCase()} ${path}`,
      description: access.text,
      tags: [path.split('/')[1] ?? 'api'],
      'x-roles': access.roles,
      parameters: parameters(r),
      responses,
    };
    if (r.meta.access && r.meta.access !== 'public') op.security = [{ session: [] }, { token: [] }];
    if (r.meta.body)
      op.requestBody = {
        required: true,
        content: { 'application/json': { schema: jsonSchema(r.meta.body, 'input') } },
      };
    if (r.meta.upload) {
      op.requestBody = {
        required: true,
        content: {
          'multipart/form-data': {
            schema: {
              type: 'object',
              required: [r.meta.upload],
              properties: { [r.meta.upload]: { type: 'string', format: 'binary' } },
            },
          },
        },
      };
    }
    (paths[path] ??= {})[r.method] = op;
  }
  const errorResponse = (description: string) => ({
    description,
    content: { 'application/json': { schema: { $ref: '#/components/schemas/Error' } } },
  });
  return {
    openapi: '3.1.0',
    info: {
      title: 'Thawline API',
      version: info.version,
      description:
        'Sites, controllers, readings, alarms and reports of Thawline. Browsers sign in with a session cookie; scripts with a named API token sent as `Authorization: Bearer`. Errors have one shape: `{ error: { code, message, details } }`, with `details` naming each bad field.',
    },
    servers: [{ url: info.serverUrl }],
    paths,
    components: {
      schemas: { Error: jsonSchema(errorBody, 'output') },
      securitySchemes: {
        session: { type: 'apiKey', in: 'cookie', name: sessionCookie },
        token: { type: 'http', scheme: 'bearer', description: 'A named API token from /api/auth/tokens' },
      },
      responses: {
        BadRequest: errorResponse('The request is not valid; `details` lists each field'),
        Unauthenticated: errorResponse('Sign in first'),
        Forbidden: errorResponse('The role may not do this'),
        NotFound: errorResponse('No such thing, or not in the sites this person sees'),
        Conflict: errorResponse('Not possible in the present state'),
        Unavailable: errorResponse('A part of the system (the database) is down'),
      },
    },
  };
}
