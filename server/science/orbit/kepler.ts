/**
 * Kepler's equation E − e·sin E = M for every 0 ≤ e < 1.
 *
 * Fast path: a starting E interpolated in a precomputed (e, M) table, then a Halley and a Newton
 * step whose sin/cos come from the nearest of 257 tabulated nodes carried across the small remaining
 * step by their series, so a solve calls no transcendental function at all (Math.sin and Math.cos cost
 * ~20 ns each on our machines, as much as the rest of a solve).
 *
 * Robust path, for the corner e → 1 near periapsis where 1 − e·cos E is small and for the rare
 * start that misses: Mikkola's cubic starter (Mikkola, Celestial Mechanics 40, 329 (1987)), good to
 * ~1e-3 rad even there, where a plain Newton iteration from E0 = M overshoots and wanders; then
 * Halley steps until the step vanishes. The same robust solver builds the table at load.
 *
 * The tests check |E − e·sin E − M| ≤ 1e-14 rad for e up to 1 − 1e-9.
 */
import { TWO_PI } from '../constants.ts';

const MAX_HALLEY_STEPS = 12;

/** Robust solve for am ∈ [0, π], 0 < e < 1. */
function keplerRobust(am: number, e: number): number {
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
    const g = 1 - e * Math.cos(E);
    const dE = -f / (g - (0.5 * f * se) / g);
    E += dE;
    if (Math.abs(dE) < 1e-15) break;
  }
  return E;
}

// Starter table: E at (e, M) on a 65 × 129 grid over e ∈ [0, 1], M ∈ [0, π]; bilinear interpolation
// is good to a few 1e-3 rad away from the corner.
const NE = 64;
const NM = 128;
const INV_HM = NM / Math.PI;
const START = new Float64Array((NE + 1) * (NM + 1));
for (let a = 0; a <= NE; a++) {
  for (let b = 0; b <= NM; b++) {
    const e = Math.min(a / NE, 1 - 1e-12);
    START[a * (NM + 1) + b] = a === 0 ? b / INV_HM : keplerRobust(b / INV_HM, e);
  }
}
// sin/cos nodes every π/256 on [0, π].
const NN = 256;
const HN = Math.PI / NN;
const INV_HN = NN / Math.PI;
const NODE_SIN = Float64Array.from({ length: NN + 1 }, (_, j) => Math.sin(j * HN));
const NODE_COS = Float64Array.from({ length: NN + 1 }, (_, j) => Math.cos(j * HN));
const INV_TWO_PI = 1 / TWO_PI;
const S3 = 1 / 6,
  S5 = 1 / 20,
  S7 = 1 / 42;
const C2 = 1 / 2,
  C4 = 1 / 12,
  C6 = 1 / 30;
/** Below this 1 − e·cos E the fast path hands over to the robust one. */
const FLAT = 0.15;

/**
 * Batch solver: E[i] for M[i] (rad) and e (one value, or one per M), written into `out`.
 * The kernel is written once, inside this loop: a function call per solve would box its result.
 * @param meanAnomalyRad mean anomalies, rad, any value
 * @param e eccentricity 0 ≤ e < 1 (not checked here: validate elements first)
 * @param out where E (rad) goes, with E − e·sin E = M (E not reduced to one turn); allocated when omitted
 */
export function solveKeplerBatch(
  meanAnomalyRad: Float64Array,
  e: number | Float64Array,
  out: Float64Array = new Float64Array(meanAnomalyRad.length),
): Float64Array {
  const n = meanAnomalyRad.length;
  const perItem = typeof e !== 'number';
  const e0 = perItem ? 0 : e;
  for (let i = 0; i < n; i++) {
    const ecc = perItem ? (e as Float64Array)[i]! : e0;
    const mIn = meanAnomalyRad[i]!;
    // Reduce M to [−π, π]; the 2πk goes back on at the end so the equation holds for the input M.
    const k = mIn >= -Math.PI && mIn <= Math.PI ? 0 : Math.round(mIn * INV_TWO_PI);
    const m = k === 0 ? mIn : mIn - k * TWO_PI;
    if (ecc === 0) {
      out[i] = mIn;
      continue;
    }
    const sign = m < 0 ? -1 : 1;
    const am = m * sign; // in [0, π]
    const xe = ecc * NE;
    const xm = am * INV_HM;
    const ia = xe | 0;
    let ib = xm | 0;
    if (ib >= NM) ib = NM - 1;
    const fa = xe - ia;
    const fb = xm - ib;
    const cell = ia * (NM + 1) + ib;
    const lowE = START[cell]! + (START[cell + 1]! - START[cell]!) * fb;
    const highE = START[cell + NM + 1]! + (START[cell + NM + 2]! - START[cell + NM + 1]!) * fb;
    let E = lowE + (highE - lowE) * fa;
    const j = (E * INV_HN + 0.5) | 0; // nearest node (E ≥ 0)
    const sinJ = NODE_SIN[j]!;
    const cosJ = NODE_COS[j]!;
    let step = 1;
    if (1 - ecc * cosJ > FLAT) {
      const Ej = j * HN;
      let d = E - Ej;
      // sin and cos of E = Ej + d from the node's values and the series of d to d⁷ and d⁶ (|d| ≲ 0.02
      // here: truncation below d⁸/8! ≈ 6e-19). A Halley step, then a Newton step.
      let d2 = d * d;
      let sd = d * (1 - d2 * S3 * (1 - d2 * S5 * (1 - d2 * S7)));
      let cd = 1 - d2 * C2 * (1 - d2 * C4 * (1 - d2 * C6));
      let sinE = sinJ * cd + cosJ * sd;
      let cosE = cosJ * cd - sinJ * sd;
      let f = Ej + d - ecc * sinE - am;
      let f1 = 1 - ecc * cosE;
      d += (-2 * f * f1) / (2 * f1 * f1 - f * ecc * sinE);
      d2 = d * d;
      sd = d * (1 - d2 * S3 * (1 - d2 * S5 * (1 - d2 * S7)));
      cd = 1 - d2 * C2 * (1 - d2 * C4 * (1 - d2 * C6));
      sinE = sinJ * cd + cosJ * sd;
      cosE = cosJ * cd - sinJ * sd;
      f = Ej + d - ecc * sinE - am;
      f1 = 1 - ecc * cosE;
      step = -f / f1;
      d += step;
      E = Ej + d;
    }
    if (!(Math.abs(step) < 1e-9)) E = keplerRobust(am, ecc);
    out[i] = sign * E + k * TWO_PI;
  }
  return out;
}

const scalarIn = new Float64Array(1);
const scalarOut = new Float64Array(1);

/** Scalar wrapper: E (rad) for one M (rad) and e (0 ≤ e < 1). */
export function solveKepler(meanAnomalyRad: number, e: number): number {
  scalarIn[0] = meanAnomalyRad;
  return solveKeplerBatch(scalarIn, e, scalarOut)[0]!;
}

/** True anomaly ν (rad, in (−π, π]) from E (rad) and e. */
export function trueAnomalyFromEccentric(E: number, e: number): number {
  return 2 * Math.atan2(Math.sqrt(1 + e) * Math.sin(E / 2), Math.sqrt(1 - e) * Math.cos(E / 2));
}

/** Eccentric anomaly E (rad, in (−π, π]) from ν (rad) and e. */
export function eccentricFromTrueAnomaly(nu: number, e: number): number {
  return 2 * Math.atan2(Math.sqrt(1 - e) * Math.sin(nu / 2), Math.sqrt(1 + e) * Math.cos(nu / 2));
}
