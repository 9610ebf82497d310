/** Ephemeris rows as CSV: epoch first, then every prediction column in its unit (names carry units). */
import { stringify } from 'csv-stringify/sync';
import { PREDICTION_FIELDS, type EphemerisRow } from '../../science/orbit/index.ts';

export function ephemerisCsv(rows: readonly EphemerisRow[]): string {
  const cols = ['epoch', ...PREDICTION_FIELDS] as const;
  const cell = (r: EphemerisRow, c: (typeof cols)[number]) => {
    const v = (r as unknown as Record<string, unknown>)[c];
    return v === null || v === undefined ? '' : String(v);
  };
  return stringify([[...cols], ...rows.map((r) => cols.map((c) => cell(r, c)))]);
}
