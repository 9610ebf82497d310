/**
 * Rows a long transaction keeps instead of reading again (crud.ts rememberRows): a read after an
 * update or delete inside that transaction sees the stored row, never the kept one; a transaction
 * that did not ask keeps nothing. Constructed cases.
 */
import { describe, expect, it } from 'vitest';
import { systems } from '../../db/schema.ts';
import { findById, insertIn, rememberRows, removeIn, updateIn } from '../../server/store/crud.ts';
import { openDatabase } from '../../server/store/database.ts';
import { systemEntity } from '../../server/store/repos/catalogue.ts';
import { LOCAL_OPERATOR } from '../../server/store/index.ts';

const values = { name: 'Tarn Cluster', raDeg: 40, decDeg: 10 };

describe('rows kept by a transaction', () => {
  it('are read once, forgotten on update and delete, and only where asked for', async () => {
    const database = await openDatabase({ url: ':memory:' });
    try {
      await database.db.transaction(async (tx) => {
        rememberRows(tx, [systems]);
        const made = await insertIn(tx, systemEntity, LOCAL_OPERATOR, values);
        const first = await findById(tx, systemEntity, made.id);
        // Kept: the same object comes back without a query.
        expect(await findById(tx, systemEntity, made.id)).toBe(first);
        await updateIn(tx, systemEntity, LOCAL_OPERATOR, made.id, { name: 'Tarn Cluster B' });
        expect((await findById(tx, systemEntity, made.id))?.name).toBe('Tarn Cluster B');
        await removeIn(tx, systemEntity, LOCAL_OPERATOR, made.id);
        expect(await findById(tx, systemEntity, made.id)).toBeNull();
      });
      await database.db.transaction(async (tx) => {
        const made = await insertIn(tx, systemEntity, LOCAL_OPERATOR, { ...values, name: 'Fold' });
        const first = await findById(tx, systemEntity, made.id);
        expect(await findById(tx, systemEntity, made.id)).not.toBe(first);
      });
    } finally {
      database.close();
    }
  });
});
