/**
 * The grid's anomalies: X = cos E − e and Y = √(1−e²)·sin E tabulated over one orbit in mean
 * anomaly, per eccentricity, and read by linear interpolation. The grid needs ~10⁶ anomalies per
 * fit and only start-level accuracy (≲0.01 rad at e = 0.97 next to periapsis, far less
 * elsewhere), so a table filled by the engine's Kepler solver replaces a solve per epoch per node.
 */
import { TWO_PI } from '../../constants.ts';
import { solveKeplerBatch } from '../kepler.ts';

/** Intervals per orbit. */
export const TABLE_SIZE = 8192;

/**
 * Interleaved per interval k: X_k, X_{k+1} − X_k, Y_k, Y_{k+1} − Y_k, so one read of four
 * neighbouring numbers (one cache line) gives both interpolants.
 */
export type AnomalyTable = Float64Array;

const tables = new Map<number, AnomalyTable>();

/** The table for eccentricity e (0 ≤ e < 1); kept for reuse (the grid's eccentricity nodes repeat). */
export function anomalyTable(e: number): AnomalyTable {
  let t = tables.get(e);
  if (!t) {
    const M = Float64Array.from({ length: TABLE_SIZE + 1 }, (_, k) => (TWO_PI * k) / TABLE_SIZE);
    const E = solveKeplerBatch(M, e);
    const sq = Math.sqrt(1 - e * e);
    t = new Float64Array(4 * TABLE_SIZE);
    for (let k = 0; k < TABLE_SIZE; k++) {
      const x0 = Math.cos(E[k]!) - e,
        x1 = Math.cos(E[k + 1]!) - e;
      const y0 = sq * Math.sin(E[k]!),
        y1 = sq * Math.sin(E[k + 1]!);
      t[4 * k] = x0;
      t[4 * k + 1] = x1 - x0;
      t[4 * k + 2] = y0;
      t[4 * k + 3] = y1 - y0;
    }
    if (tables.size > 64) tables.clear();
    tables.set(e, t);
  }
  return t;
}

/**
 * X and Y at orbital phase u (fraction of the period since periapsis, any real), written into
 * out[0], out[1]. The grid's inner loop inlines this read.
 */
export function readTable(t: AnomalyTable, u: number, out: Float64Array): void {
  const x = (u - Math.floor(u)) * TABLE_SIZE;
  const i = Math.min(x | 0, TABLE_SIZE - 1),
    f = x - i;
  out[0] = t[4 * i]! + f * t[4 * i + 1]!;
  out[1] = t[4 * i + 2]! + f * t[4 * i + 3]!;
}
