/**
 * The OpenAPI 3.1 document, generated from the route table: JSON Schema (draft 2020-12, which OpenAPI 3.1
 * uses) comes from zod 4's `z.toJSONSchema`; request bodies and parameters use the input side (defaults
 * optional), responses the output side.
 */
import * as z from 'zod';
import type { RouteSpec } from './route-table.ts';

type JsonObject = Record<string, unknown>;

function jsonSchema(schema: z.ZodType, io: 'input' | 'output'): JsonObject {
  const out = z.toJSONSchema(schema, { target: 'draft-2020-12', io, unrepresentable: 'any' }) as JsonObject;
  delete out.$schema;
  return out;
}

function isOptional(schema: z.ZodType): boolean {
  return schema.safeParse(undefined).success;
}

const ERROR_SCHEMA = z.object({
  error: z.object({
    code: z.string(),
    message: z.string(),
    issues: z.array(z.object({ path: z.string(), message: z.string(), code: z.string().optional() })).optional(),
  }),
});

const STANDARD_ERRORS: Record<number, string> = {
  400: 'Invalid request: `error.issues` lists every failing field path',
  401: 'Missing, malformed, unknown or revoked bearer token',
  403: 'The token lacks a role this route needs',
  413: 'Request body over the size limit',
  429: 'Too many requests for this token (see the RateLimit headers)',
  500: 'Internal error (no details; see the server log by request id)',
};

export interface OpenApiInfo { title: string; version: string; description: string }

/** Builds the document for the given routes. */
export function buildOpenApi(specs: readonly RouteSpec[], info: OpenApiInfo): JsonObject {
  const paths: Record<string, JsonObject> = {};
  for (const spec of specs) {
    const path = spec.path.replace(/:([A-Za-z0-9_]+)/g, '{$1}');
    const parameters: JsonObject[] = [];
    for (const [where, schema] of [['path', spec.params], ['query', spec.query]] as const) {
      if (!schema) continue;
      for (const [name, field] of Object.entries(schema.shape as Record<string, z.ZodType>)) {
        parameters.push({
          name, in: where, required: where === 'path' || !isOptional(field),
          schema: jsonSchema(field, 'input'),
          ...(field.description ? { description: field.description } : {}),
        });
      }
    }
    const responses: JsonObject = {};
    for (const [status, r] of Object.entries(spec.responses)) {
      responses[status] = {
        description: r.description,
        ...(r.schema ? { content: { [r.contentType ?? 'application/json']: { schema: jsonSchema(r.schema, 'output') } } } : {}),
      };
    }
    const errors = [500, 429];
    if (spec.params || spec.query || spec.body) errors.push(400);
    if (spec.body) errors.push(413);
    if (spec.roles) errors.push(401, 403);
    for (const status of errors) {
      responses[String(status)] ??= {
        description: STANDARD_ERRORS[status],
        content: { 'application/json': { schema: jsonSchema(ERROR_SCHEMA, 'output') } },
      };
    }
    const operation: JsonObject = {
      summary: spec.summary,
      ...(spec.description ? { description: spec.description } : {}),
      tags: spec.tags,
      operationId: `${spec.method}${path.replace(/[{}]/g, '').split('/').filter(Boolean).map((p) => p[0]!.toUpperCase() + p.slice(1)).join('')}`,
      ...(parameters.length ? { parameters } : {}),
      ...(spec.body ? { requestBody: { required: true, content: { 'application/json': { schema: jsonSchema(spec.body, 'input') } } } } : {}),
      responses,
      ...(spec.roles ? { security: [{ bearerAuth: [] }], 'x-roles': spec.roles } : { security: [] }),
    };
    paths[path] = { ...(paths[path] ?? {}), [spec.method]: operation };
  }
  return {
    openapi: '3.1.0',
    info,
    jsonSchemaDialect: 'https://json-schema.org/draft/2020-12/schema',
    servers: [{ url: '/' }],
    paths,
    components: { securitySchemes: { bearerAuth: { type: 'http', scheme: 'bearer', description: 'veer API token' } } },
  };
}
