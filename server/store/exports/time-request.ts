/**
 * A semester's time request as CSV: one row per site, target and kind (blocks, hours, weather
 * allowance, request), then the site's total row; hours to 0.001 h, text cells safe to open in a
 * spreadsheet (csv/cells.ts). The CLI's --csv and the HTTP answer (the client's download) share it.
 */
import { stringify } from 'csv-stringify/sync';
import type { TimeRequest } from '../../science/plan/time-request.ts';
import { escapeFormulaCell } from '../csv/cells.ts';

export const TIME_REQUEST_CSV_COLUMNS = [
  'semester',
  'site',
  'target',
  'kind',
  'blocks',
  'hours',
  'weather_h',
  'request_h',
] as const;

/** The label of a site's total row in the target column. */
export const SITE_TOTAL = '(site total)';

const h3 = (x: number) => String(Number(x.toFixed(3)));

export function timeRequestCsv(r: TimeRequest): string {
  const text = escapeFormulaCell;
  const rows = r.sites.flatMap((s) => [
    ...s.byTarget.map((b) => [
      text(r.semester.name),
      text(s.site),
      text(b.target),
      b.kind,
      String(b.blocks),
      h3(b.hours),
      h3(b.allowanceHours),
      h3(b.hours + b.allowanceHours),
    ]),
    [
      text(r.semester.name),
      text(s.site),
      SITE_TOTAL,
      '',
      String(s.byTarget.reduce((n, b) => n + b.blocks, 0)),
      h3(s.hours),
      h3(s.allowanceHours),
      h3(s.requestHours),
    ],
  ]);
  return stringify([[...TIME_REQUEST_CSV_COLUMNS], ...rows]);
}
