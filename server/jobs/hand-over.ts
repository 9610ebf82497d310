/**
 * A job's arguments on their way to a worker thread. Structured cloning copies a message on the
 * server's thread in one go: 100,000 measurement objects held it for a second under load. So each
 * long array in the arguments (a fit's measurements, an export's rows) is serialized here in
 * chunks, with the event loop free between chunks, and its bytes are moved to the worker (a
 * transfer, not a copy), which reads them back. The same structured-clone algorithm (v8.serialize)
 * writes them, so the worker sees exactly what a plain message would have given it.
 */
import { deserialize, serialize } from 'node:v8';

/** Elements per chunk: serializing one holds the server's thread a few milliseconds. */
const ROWS_PER_CHUNK = 2000;
/** How deep the arguments are searched for long arrays (a fit request's stars' measurements: 3). */
const DEPTH = 4;
/** The key of a long array's stand-in; only this module writes one, with bytes no JSON can hold. */
const CHUNKS = 'handedOverChunks';

interface Chunked {
  [CHUNKS]: Uint8Array[];
}

const isPlain = (v: unknown): v is Record<string, unknown> =>
  typeof v === 'object' &&
  v !== null &&
  (Object.getPrototypeOf(v) === Object.prototype || Object.getPrototypeOf(v) === null);

const isChunked = (v: unknown): v is Chunked =>
  isPlain(v) &&
  Array.isArray(v[CHUNKS]) &&
  (v[CHUNKS] as unknown[]).every((c) => c instanceof Uint8Array);

const nextTurn = (): Promise<void> => new Promise((r) => setImmediate(r));

/**
 * The arguments with every array longer than a chunk (within DEPTH levels) replaced by its
 * serialized chunks, and the buffers to move with the message.
 */
export async function handOver(
  args: unknown[],
): Promise<{ args: unknown[]; transferList: ArrayBuffer[] }> {
  const transferList: ArrayBuffer[] = [];
  const visit = async (v: unknown, depth: number): Promise<unknown> => {
    if (depth > DEPTH) return v;
    if (Array.isArray(v)) {
      if (v.length <= ROWS_PER_CHUNK) {
        let copy: unknown[] | null = null;
        for (let i = 0; i < v.length; i++) {
          const e = v[i];
          if (typeof e !== 'object' || e === null) continue;
          const next = await visit(e, depth + 1);
          if (next === e) continue;
          copy ??= [...v];
          copy[i] = next;
        }
        return copy ?? v;
      }
      const chunks: Uint8Array[] = [];
      for (let i = 0; i < v.length; i += ROWS_PER_CHUNK) {
        const bytes = serialize(v.slice(i, i + ROWS_PER_CHUNK));
        chunks.push(bytes);
        // Moved when the bytes own their buffer (v8.serialize's do), copied otherwise.
        if (bytes.byteOffset === 0 && bytes.byteLength === bytes.buffer.byteLength)
          transferList.push(bytes.buffer as ArrayBuffer);
        await nextTurn();
      }
      return { [CHUNKS]: chunks } satisfies Chunked;
    }
    if (!isPlain(v)) return v;
    let copy: Record<string, unknown> | null = null;
    for (const [k, e] of Object.entries(v)) {
      if (typeof e !== 'object' || e === null) continue;
      const next = await visit(e, depth + 1);
      if (next === e) continue;
      copy ??= { ...v };
      copy[k] = next;
    }
    return copy ?? v;
  };
  const out: unknown[] = [];
  for (const a of args) out.push(await visit(a, 0));
  return { args: out, transferList };
}

/** On the worker: the arguments as they were handed over, every long array read back in place. */
export function takeOver(args: unknown[]): unknown[] {
  const visit = (v: unknown, depth: number): unknown => {
    if (depth > DEPTH || typeof v !== 'object' || v === null) return v;
    if (isChunked(v)) {
      const rows: unknown[] = [];
      for (const chunk of v[CHUNKS])
        for (const row of deserialize(chunk) as unknown[]) rows.push(row);
      return rows;
    }
    if (Array.isArray(v)) {
      for (let i = 0; i < v.length; i++) v[i] = visit(v[i], depth + 1);
      return v;
    }
    if (!isPlain(v)) return v;
    for (const [k, e] of Object.entries(v)) v[k] = visit(e, depth + 1);
    return v;
  };
  return args.map((a) => visit(a, 0));
}
