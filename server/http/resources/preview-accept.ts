/**
 * The preview/accept pair: one POST that computes a change to a stored record and writes nowhere
 * (200), and one that computes it again and stores it in one transaction (201), both under `{id}`
 * with the same body. The store computes and checks the digest; this registers the two routes,
 * each with the role it needs, from one description.
 */
import { createRoute, z } from '@hono/zod-openapi';
import { momentJd } from '../../clock.ts';
import type { Actor, Role } from '../../store/index.ts';
import { requireRole, writer } from '../auth.ts';
import {
  IdParam,
  errorResponses,
  json,
  resourceApp,
  security,
  type ResourceApp,
} from './common.ts';

/** One route of the pair: where it lives, who may call it, what it answers. */
interface Half<Out, In> {
  path: string;
  summary: string;
  role: Role;
  response: z.ZodType<Out, In>;
  /** The response's description in the OpenAPI document. */
  answers: string;
}

/**
 * Generic over the schemas' output and input types rather than over the schemas themselves: a
 * route typed with a bare schema parameter leaves hono's request and response types unresolved
 * inside the factory, while `z.ZodType<Out, In>` resolves them (and infers from the caller's
 * schemas exactly).
 */
export interface PreviewAcceptSpec<Body, BodyIn, Preview, PreviewIn, Accepted, AcceptedIn> {
  tag: string;
  body: z.ZodType<Body, BodyIn>;
  preview: Half<Preview, PreviewIn> & {
    run: (id: number, body: Body) => Promise<NoInfer<Preview>>;
  };
  accept: Half<Accepted, AcceptedIn> & {
    run: (actor: Actor, id: number, body: Body) => Promise<NoInfer<Accepted>>;
  };
  /** Routes of the same resource documented between the two (the season plan's draws). */
  between?: (app: ResourceApp) => void;
}

/** The accept body's `digest`: the preview it confirms; the store answers 409 when it moved. */
export const digestField = (what: string) =>
  z
    .string()
    .optional()
    .openapi({
      description: `accept only: the preview’s digest; 409 if the ${what} would now differ`,
    });

/** A body without its `at`, and `at` as JD (default: the clock). */
export function splitAt<T extends { at?: string }>({ at, ...body }: T) {
  return { body, atJd: momentJd(at, 'at') };
}

/** The two routes of a preview/accept pair, on an app of their own. */
export function previewAcceptRoutes<Body, BodyIn, Preview, PreviewIn, Accepted, AcceptedIn>(
  spec: PreviewAcceptSpec<Body, BodyIn, Preview, PreviewIn, Accepted, AcceptedIn>,
) {
  const { tag, preview, accept } = spec;
  const app = resourceApp();
  const request = {
    params: IdParam,
    body: { content: { 'application/json': { schema: spec.body } }, required: true },
  };
  const previewRoute = createRoute({
    method: 'post',
    path: preview.path,
    tags: [tag],
    security,
    summary: preview.summary,
    request,
    responses: { 200: json(preview.response, preview.answers), ...errorResponses },
  });
  app.openapi(previewRoute, async (c) => {
    requireRole(c, preview.role);
    return c.json(await preview.run(c.req.valid('param').id, c.req.valid('json')), 200);
  });
  spec.between?.(app);
  const acceptRoute = createRoute({
    method: 'post',
    path: accept.path,
    tags: [tag],
    security,
    summary: accept.summary,
    request,
    responses: { 201: json(accept.response, accept.answers), ...errorResponses },
  });
  app.openapi(acceptRoute, async (c) => {
    const actor = writer(c, accept.role);
    return c.json(await accept.run(actor, c.req.valid('param').id, c.req.valid('json')), 201);
  });
  return app;
}
