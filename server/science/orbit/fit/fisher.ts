/**
 * The Fisher information a set of measurements carries about an orbit's parameters, relativity
 * factors included, at a known orbit: the whitened Jacobian of the fit's own model (the same
 * layout, derivatives and whitening as a fit), one block of rows per measurement. Its inverse is
 * the covariance a least-squares refit of such data would report, to first order: what a forecast
 * needs before the data exist. Measurement values are not used (only epochs, kinds and σ).
 */
import { InputError } from '../../errors.ts';
import type { Orbit } from '../types.ts';
import { whiten } from './problem.ts';
import { checkRequest } from './request.ts';
import { build, thetaFromOrbit } from './solve.ts';
import type { MeasurementInput, RelativityFactorName } from './types.ts';

export interface FisherRows {
  /** Names of the free parameters (the columns), as a fit reports them. */
  parameters: string[];
  /** Per measurement, in input order: its whitened Jacobian rows (1 or 2), each of length n. */
  rows: Float64Array[][];
}

/**
 * @param orbit the orbit at which to linearise (with a distance; its switches are kept)
 * @param measurements epochs, kinds and σ (values are ignored)
 * @param freeFactors the relativity factors to include as parameters
 * @throws InputError when the orbit has no distance or a measurement is malformed
 */
export function fisherRows(
  orbit: Orbit,
  measurements: MeasurementInput[],
  freeFactors: RelativityFactorName[],
): FisherRows {
  if (orbit.distancePc === null)
    throw new InputError('orbit.distancePc', null, 'is needed to forecast relativistic terms');
  const req = checkRequest({
    stars: [{ name: 'target', measurements }],
    relativity: { ...orbit.relativity },
    freeFactors,
    // The distance and γ stay free: a forecast must not assume them better known than the data make them.
  });
  const b = build(req, req.stars, true);
  const theta = thetaFromOrbit(b.L, orbit);
  const nf = b.free.length;
  const { J } = whiten(b.L, theta, b.free, [], true);
  const rows: Float64Array[][] = [];
  let c = 0;
  for (const m of b.L.stars[0]!.obs) {
    const k = m.kind === 'radial-velocity' ? 1 : 2;
    const mine: Float64Array[] = [];
    for (let q = 0; q < k; q++) mine.push(J!.slice((c + q) * nf, (c + q + 1) * nf));
    rows[m.index] = mine;
    c += k;
  }
  return { parameters: b.free.map((j) => b.L.params[j]!.name), rows };
}
