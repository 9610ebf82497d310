/**
 * From a minimum to what users read: every parameter and derived quantity with its 1σ (linear
 * propagation through the covariance, gradients by central differences of quantities.ts),
 * residuals per measurement with outliers flagged, and per star an OrbitInput with its covariance
 * that can be stored as a new orbit-solution version.
 */
import { componentCount, epochExtent } from './measurements.ts';
import { DEG } from '../../constants.ts';
import { jdToIso } from '../../time/index.ts';
import { COVARIANCE_PARAMETERS, type CovarianceParameter, type OrbitInput } from '../types.ts';
import { propagate } from './covariance.ts';
import { physicalQuantities } from '../physical.ts';
import { starOrbit } from './layout.ts';
import { evaluateModel, stepFor } from './model.ts';
import { nextCycle, quantityNames, starQuantities } from './quantities.ts';
import type { CheckedRequest } from './request.ts';
import type { Solution } from './solve.ts';
import type {
  DerivedQuantity,
  FittedParameter,
  RelativityFactorName,
  RelativitySettings,
  Residual,
} from './types.ts';

/** |whitened residual| above this flags the measurement as an outlier. */
export const OUTLIER_SIGMA = 5;

export interface StarSolution {
  name: string;
  /** Elements, Thiele–Innes constants and (with a distance) physical quantities, each with 1σ. */
  quantities: (DerivedQuantity & { fitted: boolean })[];
  /** The solution as an orbit input, with the covariance of the elements, distance and γ. */
  orbit: OrbitInput;
  nextPeriapsis: string;
  chi2: number;
  components: number;
}

export interface FitResult {
  method: string;
  derivatives: string;
  loss: 'gaussian' | 'huber';
  stars: StarSolution[];
  /** The fitted vector in interface units (fixed ones with σ = 0). */
  parameters: FittedParameter[];
  /** Covariance of the free parameters, interface units. */
  covariance: { parameters: string[]; matrix: number[][] };
  chi2: number;
  dof: number;
  reducedChi2: number | null;
  components: number;
  iterations: number;
  converged: boolean;
  frameEpoch: string | null;
  asOf: string;
  residuals: Residual[];
  outliers: number;
  /** Which relativistic terms were on and why; the relativity factors and their tests. */
  relativity: RelativitySettings;
  /** Things a user should know about the model chosen (e.g. terms left off that the data can see). */
  warnings: string[];
  posterior?: {
    ensembleSize: number;
    rounds: number;
    discardRounds: number;
    seed: number;
    acceptance: number;
    samples: number;
  };
}

const wrap180 = (x: number) => x - 360 * Math.round(x / 360);

/** ∂q/∂x for every quantity of star k over the free parameters, by central differences. */
export function quantityGradients(sol: Solution, k: number, cycle: number): Float64Array[] {
  const { L, problem, theta } = sol;
  const desc = quantityNames(L);
  const grads = desc.map(() => new Float64Array(problem.n));
  problem.free.forEach((idx, j) => {
    const h = stepFor(L, theta, idx);
    const tp = Float64Array.from(theta),
      tm = Float64Array.from(theta);
    tp[idx] = theta[idx]! + h;
    tm[idx] = theta[idx]! - h;
    const qp = starQuantities(L, tp, k, cycle),
      qm = starQuantities(L, tm, k, cycle);
    desc.forEach((d, q) => {
      const diff = qp[q]! - qm[q]!;
      grads[q]![j] = (d.angle ? wrap180(diff) : diff) / (2 * h);
    });
  });
  return grads;
}

/** Derived dates count from the request's asOf, or from the latest epoch. */
export function asOfJdOf(sol: Solution, req: CheckedRequest): number {
  return req.asOfJd ?? epochExtent(sol.L.stars.flatMap((s) => Array.from(s.jd))).last;
}

export function assemble(sol: Solution, req: CheckedRequest, derivatives: string): FitResult {
  const { L, problem, lm } = sol;
  const asOfJd = asOfJdOf(sol, req);
  const parameters = fittedParameters(sol);
  const fit = {
    r: problem.evaluate(lm.x, false).r,
    model: evaluateModel(L, sol.theta, false).values,
  };
  const residuals: Residual[] = [];
  const stars = L.stars.map((_, k) => starSolution(sol, k, parameters, asOfJd, fit, residuals));
  const dof = problem.rows - problem.n;
  return {
    method:
      'grid over P, e, T with linear Thiele–Innes and γ/distance solves; Levenberg–Marquardt on all parameters',
    derivatives,
    loss: req.loss,
    stars,
    parameters,
    covariance: freeCovariance(sol),
    chi2: lm.chi2,
    dof,
    reducedChi2: dof > 0 ? lm.chi2 / dof : null,
    components: L.components,
    iterations: lm.iterations,
    converged: lm.converged,
    frameEpoch: L.sys.x0 >= 0 || L.sys.vx >= 0 ? jdToIso(L.frameEpochJd) : null,
    asOf: jdToIso(asOfJd),
    residuals,
    outliers: residuals.filter((x) => x.outlier).length,
    relativity: relativitySettings(sol, req, parameters),
    warnings: L.stars.flatMap((_, k) => [
      ...newtonianWarnings(sol, k),
      ...restingPrimaryWarnings(sol, k),
    ]),
  };
}

/** The fitted vector in interface units; angles other than i in [0, 360), fixed ones with σ = 0. */
function fittedParameters(sol: Solution): FittedParameter[] {
  const { L, problem, theta, covariance: C } = sol;
  const freePos = new Map(problem.free.map((idx, j) => [idx, j]));
  return L.params.map((p, idx) => {
    const j = freePos.get(idx);
    const raw = theta[idx]! * p.scale;
    return {
      name: p.name,
      value: p.angle && p.key !== 'inclinationDeg' ? ((raw % 360) + 360) % 360 : raw,
      sigma: j === undefined ? 0 : Math.sqrt(Math.max(C[j]![j]!, 0)) * Math.abs(p.scale),
      unit: p.unit,
      fixed: j === undefined,
    };
  });
}

/** The covariance of the free parameters, scaled from the solver's units to interface units. */
function freeCovariance(sol: Solution): FitResult['covariance'] {
  const { L, problem, covariance: C } = sol;
  const scales = problem.free.map((idx) => L.params[idx]!.scale);
  return {
    parameters: problem.free.map((idx) => L.params[idx]!.name),
    matrix: C.map((row, a) => row.map((v, b) => v * scales[a]! * scales[b]!)),
  };
}

/**
 * One star's part of the result: its quantities with 1σ, its solution as a storable orbit, its χ²;
 * its residuals are appended to `residuals`.
 */
function starSolution(
  sol: Solution,
  k: number,
  parameters: FittedParameter[],
  asOfJd: number,
  fit: { r: ArrayLike<number>; model: ArrayLike<number> },
  residuals: Residual[],
): StarSolution {
  const { L, theta, covariance: C } = sol;
  const cycle = nextCycle(L, theta, k, asOfJd);
  const desc = quantityNames(L);
  const values = starQuantities(L, theta, k, cycle);
  const grads = quantityGradients(sol, k, cycle);
  const own = new Set(
    L.params
      .filter((p) => (p.star === k || p.star === null) && !parameters[L.params.indexOf(p)]!.fixed)
      .map((p) => p.key as string),
  );
  const quantities = desc.map((d, q) => ({
    name: d.name,
    value: values[q]!,
    sigma: Math.sqrt(propagate(C, grads[q]!)),
    unit: d.unit,
    fitted: own.has(d.name),
  }));
  const at = (n: string) => values[desc.findIndex((d) => d.name === n)]!;
  const star = L.stars[k]!;
  const { chi2, components } = starResiduals(star, fit, residuals);
  return {
    name: star.name,
    quantities,
    orbit: storableOrbit(sol, k, at, elementCovariance(C, desc, grads)),
    nextPeriapsis: jdToIso(at('nextPeriapsisJd')),
    chi2,
    components,
  };
}

/** The covariance of the stored elements, distance and γ, from their gradients (exactly symmetric). */
function elementCovariance(
  C: number[][],
  desc: ReturnType<typeof quantityNames>,
  grads: Float64Array[],
): NonNullable<OrbitInput['covariance']> {
  const names = COVARIANCE_PARAMETERS.filter((n) => desc.some((d) => d.name === n));
  const gi = names.map((n) => grads[desc.findIndex((d) => d.name === n)]!);
  const matrix = gi.map(() => new Array<number>(gi.length).fill(0));
  gi.forEach((ga, a) => {
    gi.forEach((gb, b) => {
      if (b >= a) matrix[a]![b] = matrix[b]![a] = bilinear(C, ga, gb);
    });
  });
  return { parameters: names as CovarianceParameter[], matrix };
}

/** Star k's solution as Campbell elements that can be stored as a new orbit-solution version. */
function storableOrbit(
  sol: Solution,
  k: number,
  at: (name: string) => number,
  covariance: NonNullable<OrbitInput['covariance']>,
): OrbitInput {
  const { L, theta } = sol;
  const o = starOrbit(L, theta, k);
  return {
    elements: {
      kind: 'campbell',
      periodYears: at('periodYears'),
      periapsis: `JD ${at('periapsisDays').toFixed(6)}`,
      eccentricity: at('eccentricity'),
      semiMajorAxisArcsec: at('semiMajorAxisArcsec'),
      inclinationDeg: at('inclinationDeg'),
      ascendingNodeDeg: at('ascendingNodeDeg'),
      argPeriapsisDeg: at('argPeriapsisDeg'),
    },
    ...(o.distancePc !== null ? { distancePc: o.distancePc } : {}),
    ...(L.sys.gamma >= 0 ? { systemicVelocityKmS: o.gammaKmS } : {}),
    relativity: { ...L.stars[k]!.relativity },
    ...(L.sys.fz >= 0 || L.sys.fw >= 0 ? { relativityFactors: { ...o.factors } } : {}),
    ...(o.massRatio !== null ? { massRatio: o.massRatio } : {}),
    ...(o.lightFraction !== null ? { lightFraction: o.lightFraction } : {}),
    covariance,
  };
}

/**
 * A star's residuals, raw (position angles in degrees, wrapped to ±180°) and whitened, appended to
 * `residuals` with outliers flagged; returns the star's χ² and its number of components.
 */
function starResiduals(
  s: Solution['L']['stars'][number],
  fit: { r: ArrayLike<number>; model: ArrayLike<number> },
  residuals: Residual[],
): { chi2: number; components: number } {
  const { r, model } = fit;
  let chi2 = 0,
    comps = 0;
  let c = s.firstComponent;
  for (const m of s.obs) {
    const n = componentCount(m);
    const res: number[] = [],
      norm: number[] = [];
    let outlier = false;
    for (let q = 0; q < n; q++) {
      let d = m.value[q]! - model[c + q]!;
      if (m.kind === 'separation' && q === 1) d = Math.atan2(Math.sin(d), Math.cos(d));
      res.push(m.kind === 'separation' && q === 1 ? d / DEG : d);
      norm.push(d / m.sigma[q]!);
      chi2 += r[c + q]! ** 2;
      if (Math.abs(r[c + q]!) > OUTLIER_SIGMA) outlier = true;
    }
    comps += n;
    residuals.push({
      star: s.name,
      index: m.index,
      ...(m.id !== undefined ? { id: m.id } : {}),
      kind: m.kind,
      component: m.component,
      jd: m.jd,
      epoch: jdToIso(m.jd),
      residual: res,
      normalized: norm,
      outlier,
    });
    c += n;
  }
  return { chi2, components: comps };
}

/**
 * A star fitted without the redshift terms or the precession whose fitted orbit makes them larger
 * than the measurements' precision (median σ): the fit is biased, and the user should know.
 */
function newtonianWarnings(sol: Solution, k: number): string[] {
  const s = sol.L.stars[k]!;
  const o = starOrbit(sol.L, sol.theta, k);
  if (o.distancePc === null) return [];
  const q = physicalQuantities(o);
  const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
  const out: string[] = [];
  const rvSigma = median(s.obs.filter((m) => m.kind === 'radial-velocity').map((m) => m.sigma[0]));
  const redshift = q.gravitationalRedshiftAtPeriapsisKmS + q.transverseDopplerAtPeriapsisKmS;
  if (!s.relativity.gravitationalRedshift && rvSigma !== undefined && redshift > rvSigma)
    out.push(
      `star ${s.name}: fitted without the gravitational redshift and transverse Doppler shift, ` +
        `which reach ${redshift.toFixed(1)} km/s at periapsis, above the velocities' median σ of ` +
        `${rvSigma.toFixed(1)} km/s; switch them on (relativity) or fit the redshift factor`,
    );
  const astSigma = median(s.obs.filter((m) => m.kind === 'offsets').map((m) => m.sigma[0]));
  // The advance moves the apoapsis side of the orbit by Δω·a(1 + e) per orbit on the sky.
  const shiftMas = ((q.precessionArcminPerOrbit * Math.PI) / (180 * 60)) * o.aMas * (1 + o.e);
  if (!s.relativity.precession && astSigma !== undefined && shiftMas > astSigma)
    out.push(
      `star ${s.name}: fitted without the Schwarzschild precession, which moves the orbit by up ` +
        `to ${shiftMas.toFixed(2)} mas per orbit, above the offsets' median σ of ` +
        `${astSigma.toFixed(2)} mas; switch it on (relativity) or fit the precession factor`,
    );
  return out;
}

/**
 * Above this total mass (M☉) a primary at rest is a fair model: no star weighs more than a few
 * hundred M☉, so the star's share q/(1+q) of the motion stays below a percent or so (common
 * practice, no source). Below it the primary is itself a star (or a light compact one).
 */
export const RESTING_PRIMARY_MIN_MASS_SOLAR = 1000;

/**
 * `relative` velocities (primary at rest) fitted to a system whose mass is that of stars: the
 * primary's reflex motion is ignored, and velocities of the primary taken for the star's turn Ω and
 * ω by 180° and shrink the distance. Say so rather than hand back a tidy χ².
 */
function restingPrimaryWarnings(sol: Solution, k: number): string[] {
  const s = sol.L.stars[k]!;
  if (!s.obs.some((m) => m.kind === 'radial-velocity' && m.component === 'relative')) return [];
  const o = starOrbit(sol.L, sol.theta, k);
  if (o.distancePc === null) return [];
  const mass = physicalQuantities(o).massSolar;
  if (!(mass < RESTING_PRIMARY_MIN_MASS_SOLAR)) return [];
  return [
    `star ${s.name}: the fitted total mass is ${mass.toPrecision(3)} M☉, that of stars, but its ` +
      `radial velocities are "relative" (modelled with the primary at rest); if they are ` +
      `velocities of either star about the barycentre, mark each "primary" or "secondary" so ` +
      `that the mass ratio is fitted — velocities of the primary fitted as the star's turn Ω and ` +
      `ω by 180° and give a wrong distance and mass`,
  ];
}

/** The relativity block of a result: terms, reasons, and each factor with its significances. */
function relativitySettings(
  sol: Solution,
  req: CheckedRequest,
  parameters: FittedParameter[],
): RelativitySettings {
  const names: RelativityFactorName[] = ['redshiftFactor', 'precessionFactor'];
  const factors = names.map((name) => {
    const p = parameters.find((q) => q.name === name);
    const value = p?.value ?? 1,
      sigma = p?.sigma ?? 0;
    const fitted = p !== undefined && !p.fixed;
    return {
      name,
      value,
      sigma,
      fitted,
      detectionSigma: fitted && sigma > 0 ? Math.abs(value) / sigma : 0,
      departureFromGrSigma: fitted && sigma > 0 ? Math.abs(value - 1) / sigma : 0,
    };
  });
  return {
    terms: { ...sol.L.relativity },
    reasons: { ...req.relativityReasons },
    stars: req.stars.map((s) => ({
      name: s.name,
      terms: { ...s.relativity },
      reasons: { ...s.relativityReasons },
    })),
    factors,
  };
}

function bilinear(C: number[][], a: ArrayLike<number>, b: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < C.length; i++)
    for (let j = 0; j < C.length; j++) s += a[i]! * C[i]![j]! * b[j]!;
  return s;
}
