/**
 * `npm start`: open the campaign store (DATABASE_URL, or a file in the data folder), load the demo
 * on first start unless EPOCHWRIGHT_DEMO=0, and serve the API on 127.0.0.1 (or HOST), port PORT
 * (default 8417). On first start the local lead's token is printed once.
 */
import { serve } from '@hono/node-server';
import { createApp } from './http/app.ts';
import { DEFAULT_CLIENT_DIR, hasBuiltClient } from './http/client-static.ts';
import { displayUrl, locateDatabase, startStore } from './store/index.ts';
import { createJobPool, poolOptionsFromEnv, type JobPool } from './jobs/pool.ts';

const port = Number(process.env.PORT ?? 8417);
const hostname = process.env.HOST ?? '127.0.0.1';
if (!Number.isInteger(port) || port < 0 || port > 65535) {
  console.error(`PORT: ${JSON.stringify(process.env.PORT)} must be an integer from 0 to 65535`);
  process.exit(2);
}

let started: Awaited<ReturnType<typeof startStore>>;
try {
  started = await startStore();
} catch (err) {
  console.error(
    `epochwright: cannot open the database: ${err instanceof Error ? err.message : String(err)}`,
  );
  process.exit(1);
}
const { store, demo, firstLead } = started;
const withClient = hasBuiltClient(DEFAULT_CLIENT_DIR);
let pool: JobPool;
try {
  pool = createJobPool(poolOptionsFromEnv());
} catch (err) {
  console.error(`epochwright: ${err instanceof Error ? err.message : String(err)}`);
  process.exit(2);
}
const app = createApp({
  store,
  run: pool.run,
  ...(withClient ? { clientDir: DEFAULT_CLIENT_DIR } : {}),
});
const server = serve({ fetch: app.fetch, port, hostname }, (info) => {
  const base = `http://${hostname}:${info.port}/`;
  console.log(`epochwright listening on ${base} (API at /api, OpenAPI at /api/openapi.json)`);
  console.log(
    withClient
      ? `light client: open ${base} in a browser`
      : 'no built client in client/dist: run `npm run build` for the browser views',
  );
  console.log(`database: ${displayUrl(store.url)} (from ${locateDatabase().source})`);
  const p = pool.options;
  console.log(
    `computations: ${p.threads} worker thread(s), ${p.maxQueue} waiting at most, ${p.timeLimitS} s per job`,
  );
  if (demo)
    console.log(
      `demo campaign loaded: ${demo.nights} nights, ${demo.blocks} blocks, ${demo.reports} night ` +
        `reports, ${demo.measurements} measurements (start with EPOCHWRIGHT_DEMO=0 for an empty ` +
        `store)`,
    );
  if (firstLead) {
    console.log(
      `first start: created lead ${JSON.stringify(firstLead.user.name)}. Its token is shown this once; keep it safe:`,
    );
    console.log(`  token: ${firstLead.secret}`);
    console.log(`  sign in: ${base}?token=${firstLead.secret}`);
  }
});
for (const sig of ['SIGINT', 'SIGTERM'] as const) {
  process.on(sig, () => {
    server.close();
    store.close();
    process.exit(0);
    void pool.close().finally(() => process.exit(0));
  });
}
