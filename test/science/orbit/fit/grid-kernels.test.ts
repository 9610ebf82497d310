/**
 * The grid's node kernel against an independent weighted least-squares solve (ml-matrix's QR on
 * the whitened design matrix, no early rejection), on an invented eccentric orbit with 100
 * astrometric epochs: the same χ² at every node, the early rejection never drops a node whose
 * full χ² is within the cut, and the first bound never exceeds the node's χ².
 */
import { Matrix, solve } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { anomalyTable, TABLE_SIZE } from '../../../../server/science/orbit/fit/anomaly-table.ts';
import {
  astrometryColumns,
  twoUnknowns,
} from '../../../../server/science/orbit/fit/grid-kernels.ts';
import { checkRequest } from '../../../../server/science/orbit/fit/request.ts';
import { SeededRandom } from '../../../../server/science/random.ts';
import { epochs, simulate } from './simulate.ts';

// Invented demo orbit (not a check value): e = 0.9 around a compact object, 100 epochs over 14 yr.
const truth = {
  elements: {
    periodYears: 15,
    periapsis: 'J2021.4',
    eccentricity: 0.9,
    semiMajorAxisArcsec: 0.12,
    inclinationDeg: 47,
    ascendingNodeDeg: 318,
    argPeriapsisDeg: 152,
  },
};
const measurements = simulate(
  truth,
  { astrometryJd: epochs(2455927.5, 14 * 365.25, 100, new SeededRandom(5), 10), sigmaMas: 0.4 },
  6,
);
const obs = checkRequest({ stars: [{ name: 'K', measurements }] }).stars[0]!.obs;

/** χ² of Δα* = B·X + G·Y, Δδ = A·X + F·Y at table positions pos, by QR on the whitened rows. */
function referenceChi2(pos: Float64Array, table: Float64Array): number {
  let chi2 = 0;
  for (const axis of [0, 1] as const) {
    const rows: number[][] = [],
      rhs: number[][] = [];
    obs.forEach((m, q) => {
      if (m.kind !== 'offsets') return;
      const i = Math.floor(pos[q]!),
        f = pos[q]! - i;
      const X = table[4 * i]! + f * table[4 * i + 1]!,
        Y = table[4 * i + 2]! + f * table[4 * i + 3]!;
      const w = 1 / m.sigma[axis];
      rows.push([w * X, w * Y]);
      rhs.push([w * m.value[axis]]);
    });
    const D = new Matrix(rows),
      b = new Matrix(rhs);
    const r = b.sub(D.mmul(solve(D, b)));
    chi2 += r.norm('frobenius') ** 2;
  }
  return chi2;
}

describe('grid node kernel', () => {
  it('gives the least-squares χ² of each node, and its early bound never drops a node within the cut', () => {
    const ast = astrometryColumns(obs);
    const kernel = twoUnknowns(ast);
    const fit = { chi2: 0, sx: new Float64Array(2), sy: new Float64Array(2) };
    const rng = new SeededRandom(7);
    // The kernel takes the epochs in its own check order (ast.jd); the reference in input order.
    const byJd = new Map(obs.map((m, q) => [m.jd, q]));
    let worstRel = 0,
      worstBound = 0;
    const nodes = 300;
    for (let k = 0; k < nodes; k++) {
      const e = [0, 0.45, 0.8, 0.92, 0.97][k % 5]!;
      const table = anomalyTable(e);
      const P = 365.25 * (12 + 8 * rng.uniform());
      const phase = rng.uniform();
      const start = Float64Array.from(ast.jd, (jd) => {
        const u = (jd - 2458000) / P;
        return (u - Math.floor(u)) * TABLE_SIZE;
      });
      const offset = phase * TABLE_SIZE;
      const pos = new Float64Array(obs.length);
      ast.jd.forEach((jd, q) => {
        const x = start[q]! + offset;
        pos[byJd.get(jd)!] = x >= TABLE_SIZE ? x - TABLE_SIZE : x;
      });
      const ref = referenceChi2(pos, table);
      expect(kernel.fit(table, start, offset, Infinity, fit)).toBe(true);
      const rel = Math.abs(fit.chi2 - ref) / ref;
      worstRel = Math.max(worstRel, rel);
      // Same arithmetic up to rounding: 1e-9 relative (common practice, no source).
      expect(rel).toBeLessThan(1e-9);
      // A cut just above the node's χ² must keep it, whatever its partial sums did on the way.
      expect(kernel.fit(table, start, offset, ref * (1 + 1e-8), fit)).toBe(true);
      // A cut just below must drop it.
      expect(kernel.fit(table, start, offset, ref * (1 - 1e-8), fit)).toBe(false);
      // With no cut it stops at its first bound, which must not exceed the node's χ².
      expect(kernel.fit(table, start, offset, -Infinity, fit)).toBe(false);
      expect(fit.chi2).toBeLessThanOrEqual(ref);
      worstBound = Math.max(worstBound, fit.chi2 / ref);
    }
    console.log(
      `grid kernel vs QR least squares over ${nodes} nodes: worst relative χ² difference ${worstRel.toExponential(2)}; first bound at most ${(100 * worstBound).toFixed(1)}% of the node's χ²`,
    );
  });
});
