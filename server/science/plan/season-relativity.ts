/**
 * The relativity goal of the season planner: when a campaign asks for it, an option's score also
 * counts the fractional variance it removes from the redshift and precession factors — the same
 * linear (Fisher) information as the detection forecast (forecast.ts: fisherRows over the target's
 * measurements, every element, the distance and γ free), at the precision the epoch would have
 * there (precision.ts). A weak prior (σ = PRIOR_SIGMA on each factor) keeps the information
 * invertible before the data determine a factor; it is far wider than any factor's plausible range.
 * Kept blocks (blocks that stay in place) add their information before any epoch is chosen.
 */
import { CholeskyDecomposition, Matrix } from 'ml-matrix';
import { fisherRows } from '../orbit/fit/fisher.ts';
import type { MeasurementInput } from '../orbit/fit/types.ts';
import type { Orbit } from '../orbit/index.ts';
import { FORECAST_FACTORS } from './forecast.ts';
import type { Option } from './season-nights.ts';

const PRIOR_SIGMA = 100;

const sigmaOf = (o: Pick<Option, 'kind' | 'precision'>) =>
  o.kind === 'astrometry' ? o.precision.astrometryMas : o.precision.spectroscopyKmS;

export interface RelativityState {
  n: number;
  /** Indices of the factors among the parameters. */
  factors: number[];
  /** Information of the measurements, the prior and the epochs chosen so far, n×n. */
  info: Matrix;
  /** Its inverse, recomputed after each chosen epoch. */
  cov: Matrix;
  /** Rows of each option at unit σ (2 for astrometry, 1 for spectroscopy), by option. */
  rows: Map<Option, Float64Array[]>;
}

/** The target's relativity state over its options, or null when its orbit has no distance or no term to scale. */
export function relativityState(
  orbit: Orbit,
  measurements: readonly MeasurementInput[],
  options: readonly Option[],
  kept: readonly Pick<Option, 'jd' | 'kind' | 'precision'>[] = [],
): RelativityState | null {
  if (orbit.distancePc === null) return null;
  if (!orbit.relativity.gravitationalRedshift && !orbit.relativity.precession) return null;
  const unit: MeasurementInput[] = [...kept, ...options].map((o) =>
    o.kind === 'spectroscopy'
      ? { kind: 'radial-velocity', epoch: o.jd, radialVelocityKmS: 0, sigmaRadialVelocityKmS: 1 }
      : { kind: 'offsets', epoch: o.jd, dRaMas: 0, dDecMas: 0, sigmaDRaMas: 1, sigmaDDecMas: 1 },
  );
  const f = fisherRows(orbit, [...measurements, ...unit], [...FORECAST_FACTORS]);
  const n = f.parameters.length;
  const factors = FORECAST_FACTORS.map((x) => f.parameters.indexOf(x)).filter((i) => i >= 0);
  const info = new Matrix(n, n);
  for (let k = 0; k < measurements.length; k++) addRows(info, f.rows[k]!, 1);
  // Blocks that stay in place are information the season starts with, at their own σ.
  kept.forEach((o, k) => {
    addRows(info, f.rows[measurements.length + k]!, 1 / sigmaOf(o) ** 2);
  });
  for (const q of factors) info.set(q, q, info.get(q, q) + 1 / PRIOR_SIGMA ** 2);
  const rows = new Map<Option, Float64Array[]>();
  const first = measurements.length + kept.length;
  options.forEach((o, k) => {
    rows.set(o, f.rows[first + k]!);
  });
  const state = { n, factors, info, cov: info, rows };
  state.cov = inverseOf(info);
  return state;
}

function addRows(info: Matrix, rows: readonly Float64Array[], weight: number): void {
  for (const r of rows)
    for (let i = 0; i < r.length; i++) {
      if (r[i] === 0) continue;
      for (let j = 0; j < r.length; j++) info.set(i, j, info.get(i, j) + weight * (r[i]! * r[j]!)); // symmetric to the bit
    }
}

/** Inverse by Cholesky after scaling to unit diagonal (the parameters' units differ by many decades). */
function inverseOf(info: Matrix): Matrix {
  const n = info.rows;
  const d = Array.from({ length: n }, (_, i) => Math.sqrt(Math.max(info.get(i, i), 1e-300)));
  const scaled = new Matrix(n, n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) scaled.set(i, j, info.get(i, j) / (d[i]! * d[j]!));
  const inv = new CholeskyDecomposition(scaled).solve(Matrix.eye(n));
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) inv.set(i, j, inv.get(i, j) / (d[i]! * d[j]!));
  return inv;
}

/**
 * Σ over the factors of the fractional variance the option removes: for rows R at its σ,
 * g'CR'(I + RCR')⁻¹RCg / g'Cg with g the factor's unit vector (one or two rows: solved directly).
 */
export function relativityReduction(rs: RelativityState, o: Option): number {
  const raw = rs.rows.get(o);
  if (!raw) return 0;
  const w = 1 / sigmaOf(o);
  const R = raw.map((r) => r.map((x) => x * w));
  const C = rs.cov;
  const RC = R.map((r) => {
    const out = new Float64Array(rs.n);
    for (let j = 0; j < rs.n; j++) {
      let s = 0;
      for (let i = 0; i < rs.n; i++) s += r[i]! * C.get(i, j);
      out[j] = s;
    }
    return out;
  });
  const k = R.length;
  // S = I + R C Rᵀ (k×k, k ≤ 2)
  const S = Array.from({ length: k }, (_, a) =>
    Array.from({ length: k }, (_, b) => {
      let s = a === b ? 1 : 0;
      for (let j = 0; j < rs.n; j++) s += RC[a]![j]! * R[b]![j]!;
      return s;
    }),
  );
  const solve = (v: number[]): number[] => {
    if (k === 1) return [v[0]! / S[0]![0]!];
    const det = S[0]![0]! * S[1]![1]! - S[0]![1]! * S[1]![0]!;
    return [
      (S[1]![1]! * v[0]! - S[0]![1]! * v[1]!) / det,
      (S[0]![0]! * v[1]! - S[1]![0]! * v[0]!) / det,
    ];
  };
  let total = 0;
  for (const q of rs.factors) {
    const u = RC.map((row) => row[q]!); // R C g
    const x = solve(u);
    const removed = u.reduce((s, ui, a) => s + ui * x[a]!, 0);
    const base = C.get(q, q);
    if (base > 0) total += removed / base;
  }
  return total;
}

/** Add a chosen option's information (at its σ). */
export function addRelativityEpoch(rs: RelativityState, o: Option): void {
  const raw = rs.rows.get(o);
  if (!raw) return;
  addRows(rs.info, raw, 1 / sigmaOf(o) ** 2);
  rs.cov = inverseOf(rs.info);
}
