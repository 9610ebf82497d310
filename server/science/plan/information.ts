/**
 * How much a planned measurement would tighten an orbit: the Fisher information of the predicted
 * astrometry (Δα*, Δδ, each with σ in mas) or radial velocity (σ in km/s) with respect to the orbit's
 * parameters, added to the information of the current solution (the inverse of its covariance).
 * Derivatives by central differences of the orbit engine's batch prediction. The answer is linear:
 * it is what a least-squares refit would report when the orbit is already well determined.
 */
import { Matrix, inverse } from 'ml-matrix';
import {
  getParameter,
  predictBatch,
  withParameter,
  type CovarianceParameter,
  type Orbit,
} from '../orbit/index.ts';
import type { BlockKind } from './candidates.ts';

export interface Precision {
  /** 1σ of each astrometric offset component, mas, > 0. */
  astrometryMas: number;
  /** 1σ of a radial velocity, km/s, > 0. */
  spectroscopyKmS: number;
}

/** The parameters of a nominal prior, used to rank epochs when an orbit carries no covariance. */
const NOMINAL: { name: CovarianceParameter; sigma: (o: Orbit) => number }[] = [
  { name: 'periodYears', sigma: (o) => 0.01 * (o.periodDays / 365.25) },
  { name: 'periapsisDays', sigma: (o) => 0.01 * o.periodDays },
  { name: 'eccentricity', sigma: () => 0.01 },
  { name: 'semiMajorAxisArcsec', sigma: (o) => 0.01 * (o.aMas / 1000) },
  { name: 'inclinationDeg', sigma: () => 1 },
  { name: 'ascendingNodeDeg', sigma: () => 1 },
  { name: 'argPeriapsisDeg', sigma: () => 1 },
];

export interface InformationModel {
  orbit: Orbit;
  parameters: CovarianceParameter[];
  /** Prior information (inverse covariance), row-major n×n. */
  prior: Float64Array;
  /** True when the orbit had no covariance and the nominal 1 % / 1° prior stands in for it. */
  nominalPrior: boolean;
  /** Gradient of ln M (M ∝ a³d³/P²) over the parameters, or null when neither P nor a is among them. */
  lnMassGradient: Float64Array | null;
}

export function informationModel(orbit: Orbit): InformationModel {
  let parameters: CovarianceParameter[];
  let cov: number[][];
  const nominalPrior = orbit.covariance === null;
  if (orbit.covariance) {
    parameters = [...orbit.covariance.parameters];
    cov = orbit.covariance.matrix.map((r) => [...r]);
  } else {
    parameters = NOMINAL.map((p) => p.name);
    cov = NOMINAL.map((p, i) => NOMINAL.map((_, j) => (i === j ? p.sigma(orbit) ** 2 : 0)));
  }
  const n = parameters.length;
  // A parameter held exactly (σ = 0) would make the covariance singular: give it a vanishing variance instead.
  for (let i = 0; i < n; i++)
    if (!(cov[i]![i]! > 0))
      cov[i]![i] = 1e-12 * Math.max(1, Math.abs(getParameter(orbit, parameters[i]!))) ** 2;
  const prior = Float64Array.from(inverse(new Matrix(cov)).to1DArray());
  const g = new Float64Array(n);
  let any = false;
  parameters.forEach((p, i) => {
    const v = getParameter(orbit, p);
    if (p === 'periodYears') {
      g[i] = -2 / v;
      any = true;
    }
    if (p === 'semiMajorAxisArcsec' || p === 'distancePc') {
      g[i] = 3 / v;
      any = true;
    }
  });
  return { orbit, parameters, prior, nominalPrior, lnMassGradient: any ? g : null };
}

/**
 * Jacobians of the predicted observables at many epochs, one batch prediction per perturbed
 * parameter: rows [Δα*, Δδ, v_r] per epoch, columns the model's parameters.
 * @returns jac[e] = Float64Array(3·n), row-major (3 × n); v_r rows are 0 without a distance.
 */
export function jacobians(model: InformationModel, jd: Float64Array): Float64Array[] {
  const n = model.parameters.length;
  const m = jd.length;
  const out = Array.from({ length: m }, () => new Float64Array(3 * n));
  const sigmaOf = (i: number) => Math.sqrt(1 / Math.max(model.prior[i * n + i]!, 1e-300));
  model.parameters.forEach((p, j) => {
    const x = getParameter(model.orbit, p);
    let h = 1e-3 * Math.min(sigmaOf(j), Math.abs(x) > 0 ? Math.abs(x) : 1);
    if (p === 'eccentricity') h = Math.min(h, (1 - x) / 2, x > 0 ? x / 2 : h);
    if (!(h > 0)) return;
    const plus = predictBatch(withParameter(model.orbit, p, x + h), jd);
    const minus = predictBatch(withParameter(model.orbit, p, x - h), jd);
    for (let e = 0; e < m; e++) {
      const J = out[e]!;
      J[j] = (plus.dRaMas[e]! - minus.dRaMas[e]!) / (2 * h);
      J[n + j] = (plus.dDecMas[e]! - minus.dDecMas[e]!) / (2 * h);
      const dv = (plus.radialVelocityKmS[e]! - minus.radialVelocityKmS[e]!) / (2 * h);
      J[2 * n + j] = Number.isFinite(dv) ? dv : 0;
    }
  });
  return out;
}

/** Add one measurement's information Jᵀ W J into `info` (n×n, row-major). */
export function addInformation(
  info: Float64Array,
  jac: Float64Array,
  n: number,
  kind: BlockKind,
  precision: Precision,
): void {
  const rows = kind === 'astrometry' ? [0, 1] : [2];
  const w =
    kind === 'astrometry' ? 1 / precision.astrometryMas ** 2 : 1 / precision.spectroscopyKmS ** 2;
  for (const r of rows) {
    for (let a = 0; a < n; a++) {
      const ja = jac[r * n + a]! * w;
      if (ja === 0) continue;
      for (let b = 0; b < n; b++) info[a * n + b] = info[a * n + b]! + ja * jac[r * n + b]!;
    }
  }
}

export interface Uncertainties {
  /** 1σ of the periapsis epoch T, days (null when T is not a parameter). */
  periapsisDays: number | null;
  /** 1σ of the mass, as a fraction of the mass (null when neither P nor a is a parameter). */
  massFraction: number | null;
}

/** 1σ of T and of the mass from the total information (prior + added). */
export function uncertainties(model: InformationModel, added: Float64Array | null): Uncertainties {
  const n = model.parameters.length;
  const total = Float64Array.from(model.prior);
  if (added) for (let i = 0; i < n * n; i++) total[i] = total[i]! + added[i]!;
  const rows = Array.from({ length: n }, (_, i) => Array.from(total.subarray(i * n, i * n + n)));
  const cov = inverse(new Matrix(rows));
  const t = model.parameters.indexOf('periapsisDays');
  let massFraction: number | null = null;
  const g = model.lnMassGradient;
  if (g) {
    let s = 0;
    for (let a = 0; a < n; a++) for (let b = 0; b < n; b++) s += g[a]! * cov.get(a, b) * g[b]!;
    massFraction = Math.sqrt(Math.max(0, s));
  }
  return { periapsisDays: t < 0 ? null : Math.sqrt(Math.max(0, cov.get(t, t))), massFraction };
}

/** Covariance after adding information (n×n, row-major). */
export function posteriorCovariance(
  model: InformationModel,
  added: Float64Array | null,
): Float64Array {
  const n = model.parameters.length;
  const rows = Array.from({ length: n }, (_, i) =>
    Array.from({ length: n }, (_, j) => model.prior[i * n + j]! + (added ? added[i * n + j]! : 0)),
  );
  return Float64Array.from(inverse(new Matrix(rows)).to1DArray());
}

/**
 * Variance of gᵀθ removed by one more measurement, for a covariance C: vᵀ S⁻¹ v with
 * v = J C g and S = W⁻¹ + J C Jᵀ (the Kalman update; at most 2 rows, so no matrix inverse).
 */
export function varianceReduction(
  cov: Float64Array,
  n: number,
  jac: Float64Array,
  kind: BlockKind,
  precision: Precision,
  g: Float64Array,
): number {
  const rows = kind === 'astrometry' ? [0, 1] : [2];
  const r = rows.length;
  const JC: Float64Array[] = rows.map((row) => {
    const out = new Float64Array(n);
    for (let b = 0; b < n; b++) {
      let s = 0;
      for (let a = 0; a < n; a++) s += jac[row * n + a]! * cov[a * n + b]!;
      out[b] = s;
    }
    return out;
  });
  const v = JC.map((u) => u.reduce((s, x, b) => s + x * g[b]!, 0));
  const noise =
    kind === 'astrometry' ? precision.astrometryMas ** 2 : precision.spectroscopyKmS ** 2;
  const S = rows.map((_, i) =>
    rows.map(
      (row2, j) =>
        JC[i]!.reduce((s, x, b) => s + x * jac[row2 * n + b]!, 0) + (i === j ? noise : 0),
    ),
  );
  if (r === 1) return v[0]! ** 2 / S[0]![0]!;
  const det = S[0]![0]! * S[1]![1]! - S[0]![1]! * S[1]![0]!;
  if (!(det > 0)) return 0;
  return (S[1]![1]! * v[0]! ** 2 - 2 * S[0]![1]! * v[0]! * v[1]! + S[0]![0]! * v[1]! ** 2) / det;
}
