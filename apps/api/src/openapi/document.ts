import { z } from 'zod';
import { OpenAPIRegistry, OpenApiGeneratorV31 } from '@asteasolutions/zod-to-openapi';
import {
  catalogueListSchema,
  errorBodySchema,
  periodKeySchema,
  uploadKindSchema,
  uuidSchema,
} from '@plumbline/contracts';
import { routeDocs, type RouteDoc } from './routes.ts';

/** The schema of each path parameter, by its name in the Express path. */
const paramSchemas: Record<string, z.ZodType> = {
  labId: uuidSchema,
  id: uuidSchema,
  userId: uuidSchema,
  tokenId: uuidSchema,
  commentId: uuidSchema,
  procedureId: uuidSchema,
  controlLotId: uuidSchema,
  period: periodKeySchema,
  list: catalogueListSchema,
  kind: uploadKindSchema,
  level: z.string().regex(/^[1-9]$/, 'a control level 1–9'),
  token: z.string().max(200).describe('the secret of an invitation link'),
};

/** `/labs/:labId` → `/labs/{labId}`. */
export const openApiPath = (expressPath: string) => expressPath.replace(/:(\w+)/g, '{$1}');

function paramsOf(path: string): z.ZodObject | undefined {
  const names = [...path.matchAll(/:(\w+)/g)].map((m) => m[1]);
  if (names.length === 0) return undefined;
  return z.object(Object.fromEntries(names.map((n) => [n, paramSchemas[n] ?? z.string()])));
}

function security(route: RouteDoc): Record<string, string[]>[] {
  if (route.auth === 'none') return [];
  const user: Record<string, string[]>[] = [{ sessionCookie: [] }, { bearerSession: [] }];
  return route.auth === 'user-or-lab-token' ? [...user, { labApiToken: [] }] : user;
}

function requestBody(route: RouteDoc) {
  if (route.bodyKind === 'csv') {
    return { content: { 'text/csv': { schema: z.string().describe('the CSV file') } } };
  }
  if (!route.body) return undefined;
  const type = route.bodyKind === 'multipart' ? 'multipart/form-data' : 'application/json';
  return { content: { [type]: { schema: route.body } } };
}

function successResponse(route: RouteDoc) {
  if (route.produces === 'csv')
    return { description: 'CSV file', content: { 'text/csv': { schema: z.string() } } };
  if (route.produces === 'pdf') {
    return { description: 'PDF file', content: { 'application/pdf': { schema: z.string() } } };
  }
  if (route.status === 204) return { description: 'Done; no body' };
  return {
    description: 'Success',
    content: { 'application/json': { schema: route.response ?? z.unknown() } },
  };
}

const errorResponse = (description: string) => ({
  description,
  content: { 'application/json': { schema: errorBodySchema } },
});

/** The OpenAPI 3.1 document of the API, generated from the zod contracts. */
export function buildOpenApiDocument(publicUrl: string) {
  const registry = new OpenAPIRegistry();
  registry.registerComponent('securitySchemes', 'sessionCookie', {
    type: 'apiKey',
    in: 'cookie',
    name: 'plumbline_session',
    description:
      'Browser session, set by POST /auth/login. State-changing requests also send the plumbline_csrf cookie value in the X-CSRF-Token header.',
  });
  registry.registerComponent('securitySchemes', 'bearerSession', {
    type: 'http',
    scheme: 'bearer',
    bearerFormat: 'JWT',
    description: 'A session token as a bearer header (no CSRF token needed).',
  });
  registry.registerComponent('securitySchemes', 'labApiToken', {
    type: 'http',
    scheme: 'bearer',
    description: 'A lab API token (plb_…) for machine uploads: POST /uploads and GET /uploads/{id} only.',
  });
  for (const route of routeDocs) {
    const params = paramsOf(route.path);
    const body = requestBody(route);
    registry.registerPath({
      method: route.method,
      path: openApiPath(route.path),
      tags: [route.tag],
      summary: route.summary,
      security: security(route),
      request: {
        ...(params ? { params } : {}),
        ...(route.query ? { query: route.query } : {}),
        ...(body ? { body } : {}),
      },
      responses: {
        [String(route.status ?? 200)]: successResponse(route),
        '400': errorResponse('Malformed request: the message names the field and the problem'),
        ...(route.auth === 'none' ? {} : { '401': errorResponse('Not signed in, or the session ended') }),
        '404': errorResponse('Not found (also for another lab’s resource)'),
      },
    });
  }
  return new OpenApiGeneratorV31(registry.definitions).generateDocument({
    openapi: '3.1.0',
    info: {
      title: 'Plumbline API',
      version: '1',
      description:
        'Peer comparison of quality-control data for a network of clinical laboratories. Errors always come as { error: { code, message, details?, requestId } }.',
    },
    servers: [{ url: `${publicUrl.replace(/\/+$/, '')}/api` }],
  });
}
