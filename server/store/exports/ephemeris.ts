/**
 * Ephemeris rows as CSV: epoch first, then every prediction column in its unit (names carry
 * units), then the linear 1σ of each quantity that has one (`sigmaDRaMas`, … as in the
 * measurements CSV, same unit) when the
 * orbit has a covariance. A row without a σ (no covariance) leaves those cells empty.
 */
import { stringify } from 'csv-stringify/sync';
import {
  PREDICTION_FIELDS,
  UNCERTAIN_FIELDS,
  type EphemerisRow,
} from '../../science/orbit/index.ts';

export function ephemerisCsv(rows: readonly EphemerisRow[]): string {
  const cols = ['epoch', ...PREDICTION_FIELDS] as const;
  const sigmas = UNCERTAIN_FIELDS.filter((f) => rows.some((r) => r.sigma?.[f] !== undefined));
  const cell = (v: unknown) => (v === null || v === undefined ? '' : String(v));
  return stringify([
    [...cols, ...sigmas.map((f) => `sigma${f[0]!.toUpperCase()}${f.slice(1)}`)],
    ...rows.map((r) => [
      ...cols.map((c) => cell((r as unknown as Record<string, unknown>)[c])),
      ...sigmas.map((f) => cell(r.sigma?.[f])),
    ]),
  ]);
}
