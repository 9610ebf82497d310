/**
 * A fit's residuals as CSV, one line per measurement: full precision, each component's unit in a
 * column of its own (the kinds differ: Δα* and Δδ in mas, ρ in mas and θ in degrees, v in km/s), text
 * cells safe to open in a spreadsheet (csv/cells.ts). The HTTP fit's CSV and the CLI's share it.
 */
import { stringify } from 'csv-stringify/sync';
import type { Residual } from '../../science/orbit/fit/index.ts';
import { escapeFormulaCell } from '../csv/cells.ts';

export const RESIDUAL_CSV_COLUMNS = [
  'star',
  'index',
  'id',
  'kind',
  'component',
  'epoch',
  'jd',
  'residual_1',
  'unit_1',
  'residual_2',
  'unit_2',
  'normalized_1',
  'normalized_2',
  'outlier',
] as const;

/** The units of each residual component, by kind (observed − model, as the fit reports them). */
const UNITS: Record<Residual['kind'], [string, string]> = {
  offsets: ['mas (Δα*)', 'mas (Δδ)'],
  separation: ['mas (ρ)', 'deg (θ)'],
  'radial-velocity': ['km/s', ''],
};

export function residualsCsv(residuals: readonly Residual[]): string {
  const num = (v: number | undefined) => (v === undefined ? '' : String(v));
  const rows = residuals.map((r) => {
    const [u1, u2] = UNITS[r.kind];
    return [
      escapeFormulaCell(r.star),
      String(r.index),
      r.id === undefined ? '' : escapeFormulaCell(r.id),
      r.kind,
      r.component,
      r.epoch,
      String(r.jd),
      num(r.residual[0]),
      u1,
      num(r.residual[1]),
      u2,
      num(r.normalized[0]),
      num(r.normalized[1]),
      r.outlier ? 'yes' : 'no',
    ];
  });
  return stringify([[...RESIDUAL_CSV_COLUMNS], ...rows]);
}
