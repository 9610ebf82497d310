/**
 * The response guard: an answer that breaks its route's declared schema becomes a 500 naming the
 * route and the field, so a test exercising the route fails; a conforming answer passes untouched.
 */
import { OpenAPIHono, createRoute, z } from '@hono/zod-openapi';
import { describe, expect, it } from 'vitest';
import { responseCheck } from '../../server/http/response-check.ts';

const Answer = z.object({ separationMas: z.number() }).strict();

function appAnswering(body: unknown) {
  const app = new OpenAPIHono();
  app.use('/api/*', responseCheck(app));
  const api = new OpenAPIHono();
  api.openapi(
    createRoute({
      method: 'get',
      path: '/things/{id}',
      request: { params: z.object({ id: z.string() }) },
      responses: {
        200: { content: { 'application/json': { schema: Answer } }, description: 'a thing' },
      },
    }),
    // The declared type is bypassed on purpose: the guard exists for answers the types let through.
    (c) => c.json(body as z.output<typeof Answer>, 200),
  );
  app.route('/api', api);
  return app;
}

describe('responseCheck', () => {
  it('passes an answer that fits the declared schema', async () => {
    const res = await appAnswering({ separationMas: 12.5 }).request('/api/things/7');
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ separationMas: 12.5 });
  });

  it('turns an undocumented field into a 500 naming route and field', async () => {
    const res = await appAnswering({ separationMas: 12.5, extra: 1 }).request('/api/things/7');
    expect(res.status).toBe(500);
    const body = (await res.json()) as { error: { code: string; message: string } };
    expect(body.error.code).toBe('response_schema');
    expect(body.error.message).toContain('GET /api/things/:id 200');
  });

  it('turns a wrong type into a 500 naming the field', async () => {
    const res = await appAnswering({ separationMas: '12.5' }).request('/api/things/7');
    expect(res.status).toBe(500);
    expect(((await res.json()) as { error: { message: string } }).error.message).toContain(
      'separationMas',
    );
  });
});
