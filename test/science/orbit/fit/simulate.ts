/**
 * Simulated measurements for the fit checks: invented orbits (demo values, not check values),
 * epochs chosen per test, Gaussian noise at the stated σ from the project's seeded source.
 */
import {
  predictBatch,
  validateOrbit,
  type OrbitInput,
} from '../../../../server/science/orbit/index.ts';
import type { MeasurementInput } from '../../../../server/science/orbit/fit/index.ts';
import { SeededRandom } from '../../../../server/science/random.ts';

export interface SimulationPlan {
  /** Astrometric epochs (JD) and the σ of each offset component, mas. */
  astrometryJd: number[];
  sigmaMas: number;
  /** Radial-velocity epochs (JD) and σ, km/s. */
  velocityJd?: number[];
  sigmaRadialVelocityKmS?: number;
  /** Report astrometry as separation and position angle instead of offsets. */
  polar?: boolean;
  /** Correlation of the Δα*, Δδ errors. */
  correlation?: number;
}

export function simulate(
  truth: OrbitInput,
  plan: SimulationPlan,
  seed: number,
): MeasurementInput[] {
  const orbit = validateOrbit(truth);
  const rng = new SeededRandom(seed);
  const out: MeasurementInput[] = [];
  const a = predictBatch(orbit, Float64Array.from(plan.astrometryJd));
  const rho = plan.correlation ?? 0;
  plan.astrometryJd.forEach((jd, k) => {
    const s = plan.sigmaMas;
    if (plan.polar) {
      const sep = a.separationMas[k]!;
      const sigmaPaDeg = ((s / sep) * 180) / Math.PI;
      out.push({
        kind: 'separation',
        epoch: jd,
        separationMas: sep + rng.normal() * s,
        positionAngleDeg: a.positionAngleDeg[k]! + rng.normal() * sigmaPaDeg,
        sigmaSeparationMas: s,
        sigmaPositionAngleDeg: sigmaPaDeg,
      });
      return;
    }
    const z1 = rng.normal(),
      z2 = rng.normal();
    out.push({
      kind: 'offsets',
      epoch: jd,
      dRaMas: a.dRaMas[k]! + s * z1,
      dDecMas: a.dDecMas[k]! + s * (rho * z1 + Math.sqrt(1 - rho * rho) * z2),
      sigmaDRaMas: s,
      sigmaDDecMas: s,
      ...(rho !== 0 ? { correlation: rho } : {}),
    });
  });
  if (plan.velocityJd) {
    const v = predictBatch(orbit, Float64Array.from(plan.velocityJd));
    plan.velocityJd.forEach((jd, k) => {
      out.push({
        kind: 'radial-velocity',
        epoch: jd,
        radialVelocityKmS: v.radialVelocityKmS[k]! + rng.normal() * plan.sigmaRadialVelocityKmS!,
        sigmaRadialVelocityKmS: plan.sigmaRadialVelocityKmS!,
      });
    });
  }
  return out;
}

/** n epochs (JD) spread evenly from startJd over spanDays, each jittered by up to ±jitterDays. */
export function epochs(
  startJd: number,
  spanDays: number,
  n: number,
  rng: SeededRandom,
  jitterDays = 0,
): number[] {
  return Array.from(
    { length: n },
    (_, k) =>
      startJd + (spanDays * k) / Math.max(n - 1, 1) + (rng.uniform() - 0.5) * 2 * jitterDays,
  );
}
