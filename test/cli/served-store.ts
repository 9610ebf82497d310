/**
 * A store behind a running HTTP server, as the CLI's `--server` mode reaches it: a lead user with
 * a token, the app on a free port (port 0) of the loopback, and the options that point a command
 * at it.
 */
import type { AddressInfo } from 'node:net';
import { serve } from '@hono/node-server';
import { createApp } from '../../server/http/app.ts';
import { LOCAL_OPERATOR, type Store } from '../../server/store/index.ts';

export interface ServedStore {
  /** The lead whose token the options carry. */
  lead: { id: number; secret: string };
  /** `--server <url> --token <secret>`. */
  remote: string[];
  /** Stops the server (the store stays open: its owner closes it). */
  close: () => Promise<void>;
}

export async function serveStore(store: Store, leadName: string): Promise<ServedStore> {
  const l = await store.users.createWithToken(LOCAL_OPERATOR, { name: leadName, role: 'lead' });
  const server = serve({ fetch: createApp({ store }).fetch, port: 0, hostname: '127.0.0.1' });
  await new Promise((r) => server.once('listening', r));
  return {
    lead: { id: l.user.id, secret: l.secret },
    remote: [
      '--server',
      `http://127.0.0.1:${(server.address() as AddressInfo).port}`,
      '--token',
      l.secret,
    ],
    close: () => new Promise<void>((r) => server.close(() => r())),
  };
}
