/**
 * Measurements for `epochwright fit --file`: the CSV layout that `epochwright export measurements`
 * writes and `epochwright import --kind measurements` reads (column names carry the units:
 * dRaMas, sigmaDRaMas, positionAngleDeg, radialVelocityKmS, …). One star per target name.
 */
import { parse } from 'csv-parse/sync';
import type { MeasurementInput, StarInput } from '../../science/orbit/fit/index.ts';
import { MEASUREMENT_COLUMNS, NUMERIC } from '../../store/index.ts';
import { readTextFile } from '../args.ts';
import { UsageError } from '../io.ts';

const REQUIRED = ['target', 'kind', 'epoch'];

/** Stars with their measurements from CSV text; `only` keeps the named targets. */
export function starsFromCsv(text: string, source: string, only: string[] = []): StarInput[] {
  let rows: string[][];
  try {
    rows = parse(text, { skip_empty_lines: true, trim: true, bom: true }) as string[][];
  } catch (err) {
    throw new UsageError(`${source}: not valid CSV (${(err as Error).message})`);
  }
  const [header, ...body] = rows;
  if (!header)
    throw new UsageError(`${source}: empty file; expected a header with ${REQUIRED.join(', ')}`);
  for (const c of REQUIRED)
    if (!header.includes(c))
      throw new UsageError(`${source}: the header lacks the column ${JSON.stringify(c)}`);
  header.forEach((c) => {
    if (!(MEASUREMENT_COLUMNS as readonly string[]).includes(c))
      throw new UsageError(
        `${source}: unknown column ${JSON.stringify(c)}; known: ${MEASUREMENT_COLUMNS.join(', ')}`,
      );
  });
  const stars = new Map<string, MeasurementInput[]>();
  body.forEach((cells, k) => {
    const line = k + 2;
    const rec: Record<string, unknown> = { id: `line ${line}` };
    header.forEach((c, j) => {
      const v = cells[j] ?? '';
      if (v === '') return;
      if (NUMERIC.has(c)) {
        const x = Number(v);
        if (!Number.isFinite(x))
          throw new UsageError(
            `${source}: line ${line}, column ${c}: ${JSON.stringify(v)} is not a number`,
          );
        rec[c] = x;
      } else rec[c] = v;
    });
    const target = String(rec.target ?? '');
    if (target === '')
      throw new UsageError(`${source}: line ${line}, column target: must name the target`);
    if (only.length > 0 && !only.includes(target)) return;
    for (const drop of ['system', 'target', 'instrument', 'blockId', 'notes']) delete rec[drop];
    const list = stars.get(target) ?? [];
    list.push(rec as unknown as MeasurementInput);
    stars.set(target, list);
  });
  for (const t of only)
    if (!stars.has(t))
      throw new UsageError(`--target: ${JSON.stringify(t)} has no measurements in ${source}`);
  if (stars.size === 0) throw new UsageError(`${source}: no measurements`);
  return [...stars].map(([name, measurements]) => ({ name, measurements }));
}

export function readStarsFile(path: string, only: string[]): StarInput[] {
  return starsFromCsv(readTextFile('file', path), path, only);
}
