/**
 * The built light client (client/dist) served after the API: files as they are, and index.html
 * for every other GET so that client-side addresses (/targets/3, /nights/12/report) survive a
 * reload. Hashed assets are cached for a year; index.html never, so a new build shows at once.
 */
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { serveStatic } from '@hono/node-server/serve-static';
import type { Hono } from 'hono';

/** Where `npm run build` writes the client, from this file's place in the repo. */
export const DEFAULT_CLIENT_DIR = fileURLToPath(new URL('../../client/dist', import.meta.url));

/** True when a built client (its index.html) exists in the folder. */
export const hasBuiltClient = (dir: string) => existsSync(join(dir, 'index.html'));

// The generic Hono type keeps this usable from the OpenAPIHono app without importing its env.
// biome-ignore lint/suspicious/noExplicitAny: any app, whatever its env, variables and schema
export function mountClient(app: Hono<any, any, any>, dir: string): void {
  app.use(
    '/assets/*',
    serveStatic({
      root: dir,
      onFound: (_path, c) => c.header('cache-control', 'public, max-age=31536000, immutable'),
    }),
  );
  app.use(
    '/*',
    serveStatic({
      root: dir,
      index: 'index.html',
      onFound: (_path, c) => c.header('cache-control', 'no-cache'),
    }),
  );
  app.get(
    '*',
    serveStatic({
      path: join(dir, 'index.html'),
      onFound: (_path, c) => c.header('cache-control', 'no-cache'),
    }),
  );
}
