import { OpenAPIHono, createRoute, z } from '@hono/zod-openapi';
import { validationHook } from './validation.ts';
import { nowIso } from '../clock.ts';

const Health = z.object({
  status: z.literal('ok'),
  name: z.literal('epochwright'),
  version: z.string(),
  time: z.string().openapi({ description: 'server time, ISO 8601 UTC' }),
});

const route = createRoute({
  method: 'get',
  path: '/health',
  summary: 'Liveness check',
  responses: {
    200: { content: { 'application/json': { schema: Health } }, description: 'the server is up' },
  },
});

export function healthRoutes(version: string) {
  return new OpenAPIHono({ defaultHook: validationHook }).openapi(route, (c) =>
    c.json({ status: 'ok' as const, name: 'epochwright' as const, version, time: nowIso() }, 200),
  );
}
