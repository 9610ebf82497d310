/** The store's public surface is pinned (STYLE.md item 8): a change to it is a deliberate change to this list. */
import { expect, it } from 'vitest';
import * as store from '../../server/store/index.ts';

it('exports exactly the store entry points', () => {
  expect(Object.keys(store).sort()).toEqual([
    'ConflictError',
    'LOCAL_OPERATOR',
    'NotFoundError',
    'createStore',
    'openDatabase',
    'resolveDatabaseUrl',
  ]); // server/store/index.ts as designed
});
