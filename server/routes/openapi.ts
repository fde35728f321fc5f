import { z, type ZodType } from 'zod';
import { errorBodySchema } from '#shared/schemas/error.ts';
import type { RouteRegistry, RouteSpec } from './registry.ts';

const jsonSchema = (schema: ZodType, io: 'input' | 'output') =>
  z.toJSONSchema(schema, { io, unrepresentable: 'any', target: 'openapi-3.0' });

function parameters(spec: RouteSpec) {
  const out: object[] = [];
  for (const [where, schema] of [
    ['path', spec.params],
    ['query', spec.query],
  ] as const) {
    if (!schema) continue;
    const js = jsonSchema(schema, 'input') as { properties?: Record<string, object>; required?: string[] };
    for (const [name, s] of Object.entries(js.properties ?? {})) {
      out.push({ name, in: where, required: where === 'path' || (js.required ?? []).includes(name), schema: s });
    }
  }
  return out;
}

/** OpenAPI 3 document built from the route table and the shared zod schemas (zod 4 JSON Schema). */
export function buildOpenApi(routes: readonly RouteSpec[]) {
  const paths: Record<string, Record<string, object>> = {};
  for (const spec of routes) {
    const path = spec.path.replace(/:(\w+)/g, '{$1}');
    const ok = spec.produces
      ? { description: 'OK', content: { [spec.produces]: {} } }
      : { description: 'OK', content: spec.response ? { 'application/json': { schema: jsonSchema(spec.response, 'output') } } : {} };
    const error = { description: 'Error', content: { 'application/json': { schema: jsonSchema(errorBodySchema, 'output') } } };
    (paths[path] ??= {})[spec.method] = {
      summary: spec.summary,
      'x-roles': spec.access === 'public' ? 'public' : spec.access,
      parameters: parameters(spec),
      ...(spec.body ? { requestBody: { required: true, content: { 'application/json': { schema: jsonSchema(spec.body, 'input') } } } } : {}),
      responses: {
        200: ok,
        ...(spec.access === 'public' ? {} : { 401: error, 403: error }),
        400: error,
      },
    };
  }
  return {
    openapi: '3.0.3',
    info: { title: 'Osmia API', version: '0.1.0', description: 'Maintenance KPIs for membrane water-treatment plants' },
    components: { securitySchemes: { session: { type: 'apiKey', in: 'cookie', name: 'osmia_session' } } },
    security: [{ session: [] }],
    paths,
  };
}

export function openApiRoutes(r: RouteRegistry) {
  r.get('/api/openapi.json', { access: 'public', summary: 'This API, described' }, (_req, res) => {
    res.json(buildOpenApi(r.routes));
  });
}
