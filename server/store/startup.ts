/**
 * What the server does with its store on start: open (and migrate) the database, load the demo
 * campaign into a database that has never been written to (unless EPOCHWRIGHT_DEMO=0), and on
 * first start create the local lead and hand back its token, which is shown once.
 */
import { count } from 'drizzle-orm';
import { auditTrail } from '../../db/schema.ts';
import { LOCAL_OPERATOR } from './audit.ts';
import { openDatabase, type OpenOptions } from './database.ts';
import type { loadDemo } from './demo/load.ts';
import { contextOf } from './context.ts';
import { createStore, type Store } from './store.ts';
import type { IssuedToken } from './repos/users.ts';

export interface Started {
  store: Store;
  /** Demo counts when the demo was loaded on this start. */
  demo: Awaited<ReturnType<typeof loadDemo>> | null;
  /** The first lead's token when it was created on this start. */
  firstLead: IssuedToken | null;
}

export interface StartOptions extends OpenOptions {
  /** Load the demo into an empty database. Default: EPOCHWRIGHT_DEMO !== '0'. */
  demo?: boolean;
  /** Name of the first lead. */
  leadName?: string;
  /** The moment the demo is built around (ISO 8601); default the clock. */
  now?: string;
}

export async function startStore(options: StartOptions = {}): Promise<Started> {
  const database = await openDatabase(options);
  const store = createStore(database);
  const { db } = contextOf(store);
  const [{ n }] = (await db.select({ n: count() }).from(auditTrail)) as [{ n: number }];
  const neverWritten = n === 0;
  const wantDemo = options.demo ?? process.env.EPOCHWRIGHT_DEMO !== '0';
  const demo =
    neverWritten && wantDemo
      ? await store.loadDemo(LOCAL_OPERATOR, options.now ? { now: options.now } : {})
      : null;
  const firstLead =
    (await store.users.count()) === 0
      ? await store.users.createWithToken(
          LOCAL_OPERATOR,
          { name: options.leadName ?? 'local lead', role: 'lead' },
          'created at first start',
        )
      : null;
  return { store, demo, firstLead };
}
