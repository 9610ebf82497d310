/**
 * The write gate (server/store/write-gate.ts): a transaction begun inside another of the same
 * database fails at once with NestedTransaction, and the outer one rolls back; transactions that
 * follow each other, or run side by side from separate callers, still go through.
 * Constructed cases on both backends.
 */
import { count } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { systems } from '../../db/schema.ts';
import { LOCAL_OPERATOR } from '../../server/store/index.ts';
import { databaseOf } from '../../server/store/testing.ts';
import { NestedTransaction } from '../../server/store/write-gate.ts';
import { BACKENDS } from './backends.ts';

describe.each(BACKENDS)('the write gate on $name', (backend) => {
  it('refuses a nested transaction at once, and the outer one writes nothing', async () => {
    const { store, cleanup } = await backend.open();
    try {
      const { db } = databaseOf(store);
      const outer = db.transaction(async (tx) => {
        await tx.insert(systems).values({
          name: 'Gate Deep',
          raDeg: 1,
          decDeg: 2,
          createdAt: '2026-01-01T00:00:00Z',
          updatedAt: '2026-01-01T00:00:00Z',
        });
        // Through a repository, as code that forgot its tx would do it.
        await store.systems.create(LOCAL_OPERATOR, { name: 'Gate Inner', raDeg: 3, decDeg: 4 });
      });
      // Without the guard this waits behind the outer transaction forever (the test's timeout fails it).
      await expect(outer).rejects.toBeInstanceOf(NestedTransaction);
      await expect(outer).rejects.toThrow(/use the tx you were given/);
      const [{ n }] = (await db.select({ n: count() }).from(systems)) as [{ n: number }];
      expect(n).toBe(0); // the outer transaction rolled back
      // The gate is free again: sequential and concurrent transactions go through.
      await store.systems.create(LOCAL_OPERATOR, { name: 'Gate One', raDeg: 1, decDeg: 2 });
      await Promise.all([
        store.systems.create(LOCAL_OPERATOR, { name: 'Gate Two', raDeg: 1, decDeg: 2 }),
        store.systems.create(LOCAL_OPERATOR, { name: 'Gate Three', raDeg: 1, decDeg: 2 }),
      ]);
      expect((await store.systems.list()).total).toBe(3);
    } finally {
      cleanup();
    }
  });
});
