/**
 * The flags cache: the same question answers from memory until a write that can change a flag,
 * whether this store made the write or another one on the same file did (the CLI, another server).
 * The demo's orbits are invented; the shifted periapsis is a constructed case.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { LOCAL_OPERATOR, createStore, openDatabase, type Store } from '../../server/store/index.ts';
import { nowJd } from '../../server/clock.ts';
import { parseEpoch } from '../../server/science/time/index.ts';
import { HEADLINE } from '../../server/store/demo/scenario.ts';

let dir: string;
let url: string;
let store: Store;
beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'epochwright-flags-cache-'));
  url = `file:${join(dir, 'flags.db')}`;
  store = createStore(await openDatabase({ url }));
  await store.loadDemo(LOCAL_OPERATOR, {});
});
afterAll(() => {
  store.close();
  rmSync(dir, { recursive: true, force: true });
});

const periapsisOf = (answer: Awaited<ReturnType<Store['plans']['flags']>>) =>
  answer.flags.find((f) => f.kind === 'periapsis-ahead' && f.target === HEADLINE)!.date;

describe('flags kept until a write', () => {
  it('answers a repeated question from memory, and afresh after a write that moves a flag', async () => {
    const at = { nowJd: Math.floor(nowJd()) + 0.5 };
    const first = await store.plans.flags(1, at);
    expect(await store.plans.flags(1, at)).toBe(first); // the same answer, not recomputed
    expect(await store.plans.flags(1, { nowJd: at.nowJd + 1 })).not.toBe(first); // another moment

    const target = (await store.targets.list({})).items.find((t) => t.name === HEADLINE)!;
    const current = (await store.orbitSolutions.current(target.id)).solution;
    const elements = (current.orbit as { elements: { periapsis: string | number } }).elements;
    const shifted = {
      ...current.orbit,
      elements: {
        ...elements,
        periapsis: `JD ${parseEpoch(elements.periapsis, 'periapsis') + 60}`,
      },
    };
    await store.orbitSolutions.create(LOCAL_OPERATOR, {
      targetId: target.id,
      orbit: shifted,
      provenance: 'entered',
      reference: 'a periapsis 60 days later (constructed case)',
      makeCurrent: true,
    });
    const after = await store.plans.flags(1, at);
    expect(after).not.toBe(first);
    const moved = (Date.parse(periapsisOf(after)) - Date.parse(periapsisOf(first))) / 86_400_000;
    expect(Math.abs(moved - 60)).toBeLessThan(0.01); // moved with the orbit: 60 days (constructed case)

    // Another store on the same file (as the CLI would be) puts the old solution back.
    const other = createStore(await openDatabase({ url }));
    try {
      await other.orbitSolutions.makeCurrent(LOCAL_OPERATOR, current.id);
    } finally {
      other.close();
    }
    const back = await store.plans.flags(1, at);
    expect(back).not.toBe(after);
    expect(periapsisOf(back)).toBe(periapsisOf(first));
  });

  it('keeps no failure: an unknown campaign is refused each time', async () => {
    const at = { nowJd: nowJd() };
    await expect(store.plans.flags(999, at)).rejects.toThrow(/999/);
    await expect(store.plans.flags(999, at)).rejects.toThrow(/999/);
  });
});
