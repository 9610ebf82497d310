/**
 * Simulated measurements of a binary of comparable masses: relative astrometry of the secondary,
 * and radial velocities of either body about the barycentre. The velocities are written here from
 * the textbook formulas (not through the engine's predictions): v₂ = γ + K₂[cos(ν+ω) + e·cos ω],
 * v₁ = γ − K₁[cos(ν+ω) + e·cos ω], with ω of the secondary's relative orbit, K₁ = qK/(1+q),
 * K₂ = K/(1+q) and K = 2πa·sin i / (P√(1−e²)) (Heintz, Double Stars, 1978, ch. 5, from memory).
 */
import type { MeasurementInput } from '../../../../server/science/orbit/fit/index.ts';
import type { OrbitInput } from '../../../../server/science/orbit/index.ts';
import { SeededRandom } from '../../../../server/science/random.ts';
import { parseEpoch } from '../../../../server/science/time/index.ts';
import { simulate } from './simulate.ts';

const DEG = Math.PI / 180;
/** IAU 2012 au in km, and the day in seconds (exact). */
const AU_KM = 149_597_870.7;
const DAY_S = 86_400;

/** True anomaly at JD by Newton's method on Kepler's equation (written here, independent of kepler.ts). */
function trueAnomaly(jd: number, periodDays: number, periapsisJd: number, e: number): number {
  const M = (2 * Math.PI * (jd - periapsisJd)) / periodDays;
  let E = M + e * Math.sin(M);
  for (let k = 0; k < 50; k++) E -= (E - e * Math.sin(E) - M) / (1 - e * Math.cos(E));
  return 2 * Math.atan2(Math.sqrt(1 + e) * Math.sin(E / 2), Math.sqrt(1 - e) * Math.cos(E / 2));
}

/** The two bodies' semi-amplitudes (km/s) of a relative orbit at a distance, for a mass ratio q. */
export function semiAmplitudes(truth: OrbitInput, q: number): { k1: number; k2: number } {
  const el = truth.elements as unknown as Record<string, number>;
  const aKm = el.semiMajorAxisArcsec! * truth.distancePc! * AU_KM;
  const pS = el.periodYears! * 365.25 * DAY_S;
  const k =
    (2 * Math.PI * aKm * Math.sin(el.inclinationDeg! * DEG)) /
    (pS * Math.sqrt(1 - el.eccentricity! ** 2));
  return { k1: (q * k) / (1 + q), k2: k / (1 + q) };
}

export interface BinaryPlan {
  astrometryJd: number[];
  sigmaMas: number;
  primaryJd: number[];
  secondaryJd: number[];
  sigmaKmS: number;
  /** How the velocities are labelled (default: their body); `relative` reproduces the old mistake. */
  label?: 'relative';
}

/** Measurements of a binary with mass ratio q; noise from the seeded source. */
export function simulateBinary(
  truth: OrbitInput,
  q: number,
  plan: BinaryPlan,
  seed: number,
): MeasurementInput[] {
  const astrometry = simulate(
    truth,
    { astrometryJd: plan.astrometryJd, sigmaMas: plan.sigmaMas },
    seed,
  );
  const rng = new SeededRandom(seed + 7919);
  const el = truth.elements as unknown as Record<string, number>;
  const P = el.periodYears! * 365.25,
    T = parseEpoch(String(truth.elements.periapsis)),
    e = el.eccentricity!,
    w = el.argPeriapsisDeg! * DEG;
  const { k1, k2 } = semiAmplitudes(truth, q);
  const gamma = truth.systemicVelocityKmS ?? 0;
  const shape = (jd: number) => Math.cos(trueAnomaly(jd, P, T, e) + w) + e * Math.cos(w);
  const rv = (jd: number, body: 'primary' | 'secondary'): MeasurementInput => ({
    kind: 'radial-velocity',
    epoch: jd,
    radialVelocityKmS:
      gamma + (body === 'primary' ? -k1 : k2) * shape(jd) + rng.normal() * plan.sigmaKmS,
    sigmaRadialVelocityKmS: plan.sigmaKmS,
    component: plan.label ?? body,
  });
  return [
    ...astrometry,
    ...plan.primaryJd.map((jd) => rv(jd, 'primary')),
    ...plan.secondaryJd.map((jd) => rv(jd, 'secondary')),
  ];
}
