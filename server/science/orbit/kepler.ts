/**
 * Kepler's equation E − e·sin E = M for every 0 ≤ e < 1.
 *
 * Start from Mikkola's cubic approximation (Mikkola, Celestial Mechanics 40, 329 (1987)), good to
 * ~1e-3 rad even for e → 1 near periapsis, where a plain Newton iteration from E0 = M overshoots and
 * wanders. Then Halley steps (third order) until the step is below 1e-15 rad: one or two suffice
 * almost everywhere. The tests check |E − e·sin E − M| ≤ 1e-14 rad for e up to 1 − 1e-9.
 */
import { TWO_PI } from '../constants.ts';

const MAX_HALLEY_STEPS = 8;

/** The kernel: M in rad (any value), 0 ≤ e < 1. Returns E in rad with E − e·sin E = M (not reduced). */
function kepler(meanAnomalyRad: number, e: number): number {
  // Reduce M to [−π, π]; the 2πk goes back on at the end so the equation holds for the input M.
  const k = Math.round(meanAnomalyRad / TWO_PI);
  const m = meanAnomalyRad - k * TWO_PI;
  if (e === 0) return meanAnomalyRad;
  const sign = m < 0 ? -1 : 1;
  const am = m * sign; // in [0, π]
  const denom = 4 * e + 0.5;
  const alpha = (1 - e) / denom;
  const beta = (0.5 * am) / denom;
  const z = Math.cbrt(beta + Math.sqrt(beta * beta + alpha * alpha * alpha));
  let s = z - alpha / z;
  s -= (0.078 * s * s * s * s * s) / (1 + e);
  let E = am + e * (3 * s - 4 * s * s * s);
  for (let it = 0; it < MAX_HALLEY_STEPS; it++) {
    const se = e * Math.sin(E);
    const f = E - se - am;
    const f1 = 1 - e * Math.cos(E);
    const dE = -f / (f1 - (0.5 * f * se) / f1);
    E += dE;
    if (Math.abs(dE) < 1e-15) break;
  }
  return sign * E + k * TWO_PI;
}

/**
 * Batch solver: E[i] for M[i] (rad) and e (one value, or one per M), written into `out`.
 * @param meanAnomalyRad mean anomalies, rad, any value
 * @param e eccentricity 0 ≤ e < 1 (not checked here: validate elements first)
 * @param out where E (rad) goes; allocated when omitted
 */
export function solveKeplerBatch(
  meanAnomalyRad: Float64Array,
  e: number | Float64Array,
  out: Float64Array = new Float64Array(meanAnomalyRad.length),
): Float64Array {
  const n = meanAnomalyRad.length;
  if (typeof e === 'number') {
    for (let i = 0; i < n; i++) out[i] = kepler(meanAnomalyRad[i]!, e);
  } else {
    for (let i = 0; i < n; i++) out[i] = kepler(meanAnomalyRad[i]!, e[i]!);
  }
  return out;
}

/** Scalar wrapper: E (rad) for one M (rad) and e (0 ≤ e < 1). */
export function solveKepler(meanAnomalyRad: number, e: number): number {
  return kepler(meanAnomalyRad, e);
}

/** True anomaly ν (rad, in (−π, π]) from E (rad) and e. */
export function trueAnomalyFromEccentric(E: number, e: number): number {
  return 2 * Math.atan2(Math.sqrt(1 + e) * Math.sin(E / 2), Math.sqrt(1 - e) * Math.cos(E / 2));
}

/** Eccentric anomaly E (rad, in (−π, π]) from ν (rad) and e. */
export function eccentricFromTrueAnomaly(nu: number, e: number): number {
  return 2 * Math.atan2(Math.sqrt(1 - e) * Math.sin(nu / 2), Math.sqrt(1 + e) * Math.cos(nu / 2));
}
