import { z, type ZodType } from 'zod';
import { ROUTES, type RouteSpec } from './registry';

// The OpenAPI 3.1 document of the API, built from the route registry: zod's own JSON Schema
// output (draft 2020-12, which OpenAPI 3.1 uses) for every path, query and body schema, as the
// caller sends them (`io: 'input'`: ids in paths are digit strings, dates "YYYY-MM-DD").

export type JsonSchema = Record<string, unknown> & {
  type?: string | string[];
  properties?: Record<string, JsonSchema>;
  required?: string[];
  items?: JsonSchema;
  anyOf?: JsonSchema[];
  enum?: unknown[];
};

export interface Parameter {
  name: string;
  in: 'path' | 'query';
  required: boolean;
  schema: JsonSchema;
  example?: string;
}

export interface Operation {
  operationId: string;
  summary: string;
  tags: string[];
  'x-permission': string;
  security?: Record<string, string[]>[];
  parameters?: Parameter[];
  requestBody?: {
    required: boolean;
    content: Record<string, { schema: JsonSchema; example?: unknown }>;
  };
  responses: Record<string, { description: string; content?: Record<string, unknown> }>;
}

export interface OpenApiDocument {
  openapi: '3.1.0';
  info: { title: string; version: string; description: string };
  paths: Record<string, Partial<Record<RouteSpec['method'], Operation>>>;
  components: Record<string, unknown>;
}

export function jsonSchemaOf(schema: ZodType): JsonSchema {
  const { $schema: _drop, ...rest } = z.toJSONSchema(schema, {
    io: 'input',
    unrepresentable: 'any',
    target: 'draft-2020-12',
  }) as JsonSchema;
  return rest;
}

function parametersOf(
  schema: ZodType | undefined,
  where: 'path' | 'query',
  example: Record<string, string> | undefined,
): Parameter[] {
  if (!schema) return [];
  const json = jsonSchemaOf(schema);
  const required = new Set(json.required ?? []);
  return Object.entries(json.properties ?? {}).map(([name, property]) => ({
    name,
    in: where,
    required: where === 'path' || required.has(name),
    schema: property,
    ...(example?.[name] !== undefined ? { example: example[name] } : {}),
  }));
}

const problem = {
  'application/problem+json': { schema: { $ref: '#/components/schemas/Problem' } },
};

function operationOf(spec: RouteSpec): Operation {
  const parameters = [
    ...parametersOf(spec.params, 'path', spec.example?.params),
    ...parametersOf(spec.query, 'query', spec.example?.query),
  ];
  const operation: Operation = {
    operationId: `${spec.method}${spec.path.replace(/[^A-Za-z0-9]+(.)?/g, (_, c?: string) => (c ? c.toUpperCase() : ''))}`,
    summary: spec.summary,
    tags: [spec.path.split('/')[2] ?? 'api'],
    'x-permission': spec.permission,
    responses: {
      [String(spec.status)]: { description: 'Success' },
      '4XX': {
        description:
          'A problem document (RFC 9457): 400 with field errors, 401 signed out, 403 for a role without the permission, 404 outside the caller’s shops, 409 a conflict',
        content: problem,
      },
    },
  };
  if (spec.permission !== 'public') operation.security = [{ session: [] }];
  if (parameters.length) operation.parameters = parameters;
  if (spec.body) {
    const type = spec.bodyType === 'multipart' ? 'multipart/form-data' : 'application/json';
    operation.requestBody = {
      required: true,
      content: {
        [type]: {
          schema: jsonSchemaOf(spec.body),
          ...(spec.example?.body !== undefined ? { example: spec.example.body } : {}),
        },
      },
    };
  } else if (spec.bodyType === 'raw') {
    operation.requestBody = {
      required: true,
      content: { 'application/json': { schema: { type: 'object' } } },
    };
  }
  return operation;
}

let built: OpenApiDocument | null = null;

/** The document, built once per process. */
export function openApiDocument(): OpenApiDocument {
  if (built) return built;
  const paths: OpenApiDocument['paths'] = {};
  for (const spec of ROUTES) (paths[spec.path] ??= {})[spec.method] = operationOf(spec);
  built = {
    openapi: '3.1.0',
    info: {
      title: 'Reelwright API',
      version: '1',
      description:
        'Signed-in routes take the session cookie that sign-in sets; a state-changing request must come from the app’s own origin with a JSON body. Errors are problem documents (RFC 9457).',
    },
    paths,
    components: {
      securitySchemes: {
        session: { type: 'apiKey', in: 'cookie', name: 'next-auth.session-token' },
      },
      schemas: {
        Problem: {
          type: 'object',
          required: ['type', 'title', 'status'],
          properties: {
            type: { type: 'string' },
            title: { type: 'string' },
            status: { type: 'integer' },
            detail: { type: 'string' },
            instance: { type: 'string' },
            errors: {
              type: 'array',
              items: {
                type: 'object',
                required: ['field', 'message'],
                properties: { field: { type: 'string' }, message: { type: 'string' } },
              },
            },
          },
        },
      },
    },
  };
  return built;
}
