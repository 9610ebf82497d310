/**
 * A job's long arrays travel to the worker as serialized chunks whose buffers are moved, not copied
 * (server/jobs/hand-over.ts), and come back exactly as a plain message would carry them: the same
 * values, keys in the same order, -0, null and undefined kept. The rows are invented.
 */
import { describe, expect, it } from 'vitest';
import { handOver, takeOver } from '../../server/jobs/hand-over.ts';

const row = (i: number) => ({
  kind: 'offsets',
  epoch: i % 2 ? `JD ${2460000.5 + i}` : 2460000.5 + i,
  id: String(i),
  dRaMas: i % 5 === 0 ? -0 : i * 0.1,
  ...(i % 3 === 0 ? { correlation: null } : { component: undefined }),
});

describe('the hand-over of a job', () => {
  it('moves long arrays as bytes and gives back what a plain message gives', async () => {
    const request = {
      stars: [
        { name: 'Ferrule', measurements: Array.from({ length: 4321 }, (_, i) => row(i)) },
        { name: 'Gusset', measurements: [row(1), row(2)] },
      ],
      fixed: { distancePc: 12 },
    };
    const args: unknown[] = [request, Array.from({ length: 2500 }, (_, i) => i), 'text'];
    const plain = structuredClone(args);
    const { args: sent, transferList } = await handOver(args);
    // Chunks of 2,000: three for the measurements, two for the numbers, each buffer moved.
    expect(transferList).toHaveLength(5);
    const message = structuredClone(sent, { transfer: transferList });
    expect(transferList.every((b) => b.byteLength === 0)).toBe(true); // moved: detached here
    const back = takeOver(message as unknown[]);
    expect(back).toStrictEqual(plain);
    const first = (back[0] as typeof request).stars[0]!.measurements;
    expect(Object.keys(first[1]!)).toEqual(Object.keys(row(1)));
    expect(Object.is(first[0]!.dRaMas, -0)).toBe(true);
    // The caller's arguments are left as they were.
    expect(args).toStrictEqual(plain);
  });

  it('leaves short arguments as they are', async () => {
    const args = [{ stars: [{ name: 'Ferrule', measurements: [row(0)] }] }, [1, 2, 3]];
    const { args: sent, transferList } = await handOver(args);
    expect(transferList).toHaveLength(0);
    expect(sent[0]).toBe(args[0]);
    expect(sent[1]).toBe(args[1]);
  });
});
