/**
 * Orbit solutions for export in the import layout (csv/columns.ts ORBIT_COLUMNS): elements, the
 * σ columns and correlations cell from the stored covariance (descriptors/covariance.ts, the
 * inverse of what the import does), relativity switches and factors, so an export read back by
 * the import gives the same orbits.
 */
import { stringify } from 'csv-stringify/sync';
import { and, asc, eq } from 'drizzle-orm';
import { orbitSolutions, systems, targets } from '../../../db/schema.ts';
import {
  CORRELATIONS_COLUMN,
  correlationsText,
  sigmaColumn,
  sigmasOf,
} from '../../../descriptors/covariance.ts';
import type { DbOrTx } from '../database.ts';
import { NUMERIC, ORBIT_COLUMNS } from '../csv/columns.ts';
import { escapeFormulaCell } from '../csv/cells.ts';
import type { OrbitSolutionRow } from '../repos/orbits.ts';

export type ExportedOrbit = OrbitSolutionRow & { system: string; target: string };

export interface OrbitExportFilter {
  targetId?: number | undefined;
  systemId?: number | undefined;
  /** Only the current versions (true) or every version (false, the default). */
  currentOnly?: boolean | undefined;
}

/** Every orbit solution matching `filter`, by system, target and version (no paging: exports are whole). */
export async function orbitsForExport(
  db: DbOrTx,
  filter: OrbitExportFilter = {},
): Promise<ExportedOrbit[]> {
  const where = [
    filter.targetId === undefined ? undefined : eq(orbitSolutions.targetId, filter.targetId),
    filter.systemId === undefined ? undefined : eq(targets.systemId, filter.systemId),
    filter.currentOnly ? eq(orbitSolutions.current, true) : undefined,
  ];
  const rows = await db
    .select({ o: orbitSolutions, system: systems.name, target: targets.name })
    .from(orbitSolutions)
    .innerJoin(targets, eq(targets.id, orbitSolutions.targetId))
    .innerJoin(systems, eq(systems.id, targets.systemId))
    .where(and(...where))
    .orderBy(asc(systems.name), asc(targets.name), asc(orbitSolutions.version));
  return rows.map((r) => ({ ...r.o, system: r.system, target: r.target }));
}

/** One stored solution as the cells of the import layout (absent values left out). */
function orbitCells(r: ExportedOrbit): Record<string, unknown> {
  const { orbit } = r;
  const el = orbit.elements as unknown as Record<string, unknown>;
  const cells: Record<string, unknown> = {
    system: r.system,
    target: r.target,
    ...el,
    kind: el.kind ?? 'campbell',
    distancePc: orbit.distancePc,
    systemicVelocityKmS: orbit.systemicVelocityKmS,
    massRatio: orbit.massRatio,
    lightFraction: orbit.lightFraction,
    relativity: Object.entries(orbit.relativity ?? {})
      .filter(([, on]) => on)
      .map(([name]) => name)
      .join('; '),
    redshiftFactor: orbit.relativityFactors?.redshiftFactor,
    precessionFactor: orbit.relativityFactors?.precessionFactor,
    reference: r.reference,
    notes: r.notes,
    makeCurrent: r.current,
  };
  if (orbit.covariance) {
    const { sigmas, correlations } = sigmasOf(orbit.covariance);
    // A parameter a fit held fixed has variance 0: its σ cell stays empty, as the import reads it
    // (a σ must be positive there), and it has no correlations.
    for (const [p, s] of Object.entries(sigmas))
      if (s > 0) cells[sigmaColumn(p as keyof typeof sigmas)] = s;
    cells[CORRELATIONS_COLUMN] = correlationsText(correlations);
  }
  return cells;
}

/**
 * RFC 4180 CSV with the header of ORBIT_COLUMNS; numbers at full precision, text cells safe to
 * open in a spreadsheet. σ are √C_ii and ρ = C_ij/(σ_i σ_j) of the stored covariance, so the
 * import rebuilds it to rounding (ρ kept to 12 digits).
 */
export function orbitsCsv(rows: readonly ExportedOrbit[]): string {
  const body = rows.map((r) => {
    const cells = orbitCells(r);
    return ORBIT_COLUMNS.map((c) => {
      const v = cells[c];
      if (v === null || v === undefined || v === '') return '';
      return NUMERIC.has(c) || typeof v === 'boolean' ? String(v) : escapeFormulaCell(String(v));
    });
  });
  return stringify([[...ORBIT_COLUMNS], ...body]);
}
