/**
 * The Hono application: every resource module mounted under /api, one error handler, a body limit.
 */
import { costed } from '../jobs/cost.ts';
import { inProcess, type Runner } from '../jobs/tasks.ts';
import { OpenAPIHono } from '@hono/zod-openapi';
import { bodyLimit } from 'hono/body-limit';
import { secureHeaders } from 'hono/secure-headers';
import { signedIn } from './auth.ts';
import { HttpError, errorResponse } from './errors.ts';
import { healthRoutes } from './health.ts';
import { methodNotAllowed } from 'hono/method-not-allowed';
import { orbitRoutes } from './orbit.ts';
import { skyRoutes } from './sky.ts';
import { fitRoutes } from './fit.ts';
import { storeRoutes } from './resources/index.ts';
import { mountClient } from './client-static.ts';
import type { Store } from '../store/index.ts';
import { unknownQueryCheck, validationHook } from './validation.ts';
import { responseCheck } from './response-check.ts';

export const VERSION = '0.1.0';

export interface AppOptions {
  /** Largest accepted request body, bytes (default 2 MiB). */
  maxBodyBytes?: number;
  /**
   * Largest accepted CSV import (POST /api/imports/…), bytes (default 64 MiB: 100,000 measurement
   * rows take ~10 MB).
   */
  maxImportBytes?: number;
  /** The campaign store; without it only the stateless routes (health, ephemeris, events, sky) exist. */
  store?: Store;
  /** Where heavy computations run: the server passes its worker pool's `run`; default this thread. */
  run?: Runner;
  /** A built client folder (client/dist) to serve after the API, with index.html for client-side routes. */
  clientDir?: string;
  /** Check every JSON answer against its route's declared schema (tests; default: EPOCHWRIGHT_CHECK_RESPONSES=1). */
  checkResponses?: boolean;
}

/**
 * Headers on every answer, the client's files included: scripts, styles and data from this server
 * only, no framing by other pages, no content-type guessing, no referrer (sign-in links carry a
 * token). hono's middleware adds the other usual isolation headers.
 */
const securityHeaders = secureHeaders({
  contentSecurityPolicy: {
    defaultSrc: ["'self'"],
    scriptSrc: ["'self'"],
    styleSrc: ["'self'"],
    imgSrc: ["'self'", 'data:'],
    connectSrc: ["'self'"],
    objectSrc: ["'none'"],
    baseUri: ["'self'"],
    formAction: ["'self'"],
    frameAncestors: ["'none'"],
  },
  xFrameOptions: 'DENY',
  referrerPolicy: 'no-referrer',
});

export function createApp(options: AppOptions = {}) {
  const app = new OpenAPIHono({ defaultHook: validationHook });
  app.onError((err, c) => errorResponse(c, err));
  app.use('*', securityHeaders);
  // 405 (RFC 9110 §15.5.6) with `Allow` for a path served under other methods: a PATCH on an
  // immutable orbit solution is refused as such, not reported missing. Hono's middleware finds the
  // methods after the 404 fallback has answered; we give the answer our error shape.
  app.use(
    '/api/*',
    methodNotAllowed({
      app,
      onMethodNotAllowed: (c, methods) => {
        const allow = [...methods].sort();
        c.header('Allow', allow.join(', '));
        return errorResponse(
          c,
          new HttpError(
            405,
            'method_not_allowed',
            `${c.req.method} is not allowed on ${c.req.path}; allowed: ${allow.join(', ')}`,
            { method: c.req.method, allow },
          ),
        );
      },
    }),
  );
  if (options.checkResponses ?? process.env.EPOCHWRIGHT_CHECK_RESPONSES === '1')
    app.use('/api/*', responseCheck(app));
  app.use('/api/*', unknownQueryCheck(app));
  const bodyLimits = bodyLimitsFor(options);
  app.use('/api/*', (c, next) =>
    (c.req.path.startsWith('/api/imports/') ? bodyLimits.imports : bodyLimits.other)(c, next),
  );
  const api = new OpenAPIHono({ defaultHook: validationHook });
  api.route('/', healthRoutes(VERSION));
  // Every job is costed before it runs (server/jobs/cost.ts): beyond a bound is a 422.
  const run = costed(options.run ?? inProcess);
  // With a store there are users: every computation needs at least a viewer's token (health and
  // the OpenAPI document stay open). Without one (tests, embedding) there is no one to sign in.
  if (options.store)
    for (const path of COMPUTE_PATHS) api.use(path, signedIn(options.store, 'viewer'));
  api.route('/', orbitRoutes(run));
  api.route('/', skyRoutes(run));
  if (options.store) api.route('/', storeRoutes(options.store, run));
  api.route('/', fitRoutes(run, options.store));
  api.doc31('/openapi.json', {
    openapi: '3.1.0',
    info: { title: 'epochwright API', version: VERSION },
  });
  app.route('/api', api);
  app.all('/api/*', (c) =>
    errorResponse(
      c,
      new HttpError(404, 'not_found', `no such endpoint: ${c.req.method} ${c.req.path}`),
    ),
  );
  if (options.clientDir) mountClient(app, options.clientDir);
  app.notFound((c) =>
    errorResponse(c, new HttpError(404, 'not_found', `not found: ${c.req.path}`)),
  );
  return app;
}

/** The stateless computations, open only to signed-in users when the app has a store. */
export const COMPUTE_PATHS = ['/ephemeris', '/events', '/sky/night', '/sky/season', '/fit'];

export const DEFAULT_MAX_BODY_BYTES = 2 * 1024 * 1024;
export const DEFAULT_MAX_IMPORT_BYTES = 64 * 1024 * 1024;

/**
 * The body limits. A 413 says `connection: close`: the rest of the body is never read, so the
 * connection cannot carry another request (Node closes it after the reply).
 */
function bodyLimitsFor(options: AppOptions) {
  const limit = (maxSize: number, what: string) =>
    bodyLimit({
      maxSize,
      onError: () => {
        throw new HttpError(
          413,
          'body_too_large',
          `the request body exceeds ${maxSize} bytes, the limit for ${what}`,
          { limitBytes: maxSize },
          { connection: 'close' },
        );
      },
    });
  return {
    imports: limit(options.maxImportBytes ?? DEFAULT_MAX_IMPORT_BYTES, 'a CSV import'),
    other: limit(options.maxBodyBytes ?? DEFAULT_MAX_BODY_BYTES, 'a request body'),
  };
}
