/**
 * `npm start`: the HTTP server on 127.0.0.1 (or HOST), port PORT (default 8417).
 */
import { serve } from '@hono/node-server';
import { createApp } from './http/app.ts';

const port = Number(process.env.PORT ?? 8417);
const hostname = process.env.HOST ?? '127.0.0.1';
if (!Number.isInteger(port) || port < 0 || port > 65535) {
  console.error(`PORT: ${JSON.stringify(process.env.PORT)} must be an integer from 0 to 65535`);
  process.exit(2);
}

const app = createApp();
const server = serve({ fetch: app.fetch, port, hostname }, (info) => {
  console.log(`epochwright listening on http://${hostname}:${info.port}/ (API at /api, health at /api/health)`);
});
for (const sig of ['SIGINT', 'SIGTERM'] as const) {
  process.on(sig, () => {
    server.close();
    process.exit(0);
  });
}
