/**
 * The invented deep star of the relativity checks and benchmarks (demo values, not check values):
 * 6 × 10⁶ M☉ at 10 kpc, P = 10 yr, e = 0.9, periapsis at JD 2461771.5, every redshift and
 * precession term on.
 */
import type { OrbitInput } from '../../../../server/science/orbit/index.ts';

export const DEEP_PERIAPSIS_JD = 2461771.5;

/** The deep star's orbit with both relativity factors at `factor` (1: general relativity). */
export function deepStar(factor = 1): OrbitInput {
  return {
    elements: {
      periodYears: 10,
      periapsis: `JD ${DEEP_PERIAPSIS_JD}`,
      eccentricity: 0.9,
      semiMajorAxisArcsec: 0.0843,
      inclinationDeg: 60,
      ascendingNodeDeg: 100,
      argPeriapsisDeg: 30,
    },
    distancePc: 10_000,
    systemicVelocityKmS: 0,
    relativity: { gravitationalRedshift: true, transverseDoppler: true, precession: true },
    relativityFactors: { redshiftFactor: factor, precessionFactor: factor },
  };
}
