/**
 * The fit itself: refusals first, then per star the grid start and Levenberg–Marquardt, then (for
 * several stars) the joint fit that shares the mass, the distance, γ and the frame, started from
 * the single-star solutions. Returns the minimum and its covariance; result.ts dresses it up.
 */
import { componentCount, epochExtent, type Observation } from './measurements.ts';
import { JULIAN_YEAR_DAYS } from '../../constants.ts';
import { campbellToThieleInnes, thieleInnesToCampbell } from '../elements.ts';
import { massSolar, semiMajorAxisAu } from '../physical.ts';
import { predictBatch, prepare } from '../predict.ts';
import type { Orbit } from '../types.ts';
import { covarianceFromJacobian } from './covariance.ts';
import { gridSearch, type GridNode } from './grid.ts';
import { buildLayout, findParameter, type Layout, starOrbit } from './layout.ts';
import { levenbergMarquardt, type LmResult } from './lm.ts';
import {
  canonicalize,
  finiteDifferenceProblem,
  makeProblem,
  type Prior,
  type Problem,
} from './problem.ts';
import { FitRefusal } from './refusal.ts';
import type { CheckedRequest, CheckedStar } from './request.ts';
import type { RangeHint } from './types.ts';

export interface Solution {
  L: Layout;
  problem: Problem;
  /** The full parameter vector at the minimum (internal units). */
  theta: Float64Array;
  lm: LmResult;
  /** Covariance of the free parameters (internal units), in the order of problem.free. */
  covariance: number[][];
  /** Per star, the period range searched (days): the sampler's prior bounds on P. */
  periodRanges: { min: number; max: number }[];
}

interface Built {
  L: Layout;
  base: Float64Array;
  free: number[];
  fixedMask: boolean[];
  priors: Prior[];
}

/** Layout, fixed values and priors for some of the request's stars. `strict`: unknown names are errors. */
export function build(req: CheckedRequest, stars: CheckedStar[], strict: boolean): Built {
  const ast = req.stars.flatMap((s) =>
    s.obs.filter((m) => m.kind !== 'radial-velocity').map((m) => m.jd),
  );
  const frameEpochJd =
    req.frameEpochJd ?? (ast.length ? ast.reduce((a, b) => a + b, 0) / ast.length : 0);
  const distanceWanted =
    req.fixed.some(([k]) => k === 'distancePc') || req.priors.some(([k]) => k === 'distancePc');
  const L = buildLayout(stars, {
    relativity: req.relativity,
    frameOffset: req.frameOffset,
    frameDrift: req.frameDrift,
    frameEpochJd,
    distanceWanted,
    freeFactors: req.freeFactors,
  });
  const base = new Float64Array(L.params.length);
  for (const j of [L.sys.fz, L.sys.fw]) if (j >= 0) base[j] = 1;
  const fixedMask = L.params.map(() => false);
  const lookup = (name: string, field: string): number => {
    try {
      return findParameter(L, name, field);
    } catch (err) {
      if (strict) throw err;
      return -1;
    }
  };
  for (const [name, v] of req.fixed) {
    const j = lookup(name, `fixed.${name}`);
    if (j < 0) continue;
    base[j] = v / L.params[j]!.scale;
    fixedMask[j] = true;
  }
  const priors: Prior[] = [];
  for (const [name, p] of req.priors) {
    const j = lookup(name, `priors.${name}`);
    if (j >= 0)
      priors.push({
        index: j,
        mean: p.mean / L.params[j]!.scale,
        sigma: p.sigma / L.params[j]!.scale,
      });
  }
  const free = L.params.map((_, j) => j).filter((j) => !fixedMask[j]);
  return { L, base, free, fixedMask, priors };
}

function components(star: CheckedStar): number {
  return star.obs.reduce((n, m) => n + componentCount(m), 0);
}

/** The refusals that need no fit: no astrometry, too few measurements, one epoch. */
function refuseEarly(star: CheckedStar, ownParams: number): void {
  const ast = star.obs.filter((m) => m.kind !== 'radial-velocity');
  if (ast.length === 0) {
    throw new FitRefusal(
      'no-astrometry',
      `star ${star.name}: no astrometric measurement; radial velocities alone give a·sin i, not ` +
        `the orbit on the sky — add offsets or separations`,
      [star.name],
    );
  }
  const n = components(star);
  if (n < ownParams) {
    throw new FitRefusal(
      'too-few-measurements',
      `star ${star.name}: ${n} measurement components (${ast.length} astrometric ` +
        `epoch${ast.length === 1 ? ' counts' : 's count'} twice) for ${ownParams} free ` +
        `parameters of its orbit — at least ${ownParams} are needed`,
      [star.name],
    );
  }
  const { first, last } = epochExtent(ast.map((m) => m.jd));
  const span = last - first;
  const pMin = star.hints.periodYears ? star.hints.periodYears.min * JULIAN_YEAR_DAYS : 1;
  if (!(span >= 1e-3 * pMin)) {
    throw new FitRefusal(
      'single-phase',
      `star ${star.name}: all ${ast.length} astrometric epochs fall at one orbital phase (they ` +
        `span ${span.toFixed(3)} d); an orbit needs epochs spread along it`,
      [star.name],
    );
  }
}

/**
 * Velocities about the barycentre of one body only fix d/(1+q) (the secondary's) or d·q/(1+q) (the
 * primary's), not the distance and the mass ratio apart; a parallax (a prior or a fixed distance)
 * or a known q separates them, as do the other body's velocities. A primary that moves cannot have
 * q = 0.
 */
function refuseOneBody(b: Built, star: CheckedStar): void {
  const { L } = b;
  const jq = L.stars[0]!.slots.q;
  if (jq < 0) return;
  const bodies = new Set(
    star.obs.filter((m) => m.kind === 'radial-velocity').map((m) => m.component),
  );
  const held = (j: number) => b.fixedMask[j] || b.priors.some((p) => p.index === j);
  const q = L.params[jq]!.name;
  if (bodies.has('primary') && b.fixedMask[jq] && !(b.base[jq]! > 0))
    throw new FitRefusal(
      'singular',
      `star ${star.name}: ${q} is fixed at ${b.base[jq]}, but the primary's velocities say it ` +
        `moves (q = M₂/M₁ > 0) — free ${q}, or mark the velocities "relative" if the primary is ` +
        `a compact object at rest`,
      [q],
    );
  // No body's velocities (photocentre positions alone): refusePhotocentre speaks for q.
  if (bodies.size !== 1 || held(jq) || held(L.sys.d)) return;
  const body = [...bodies][0]!;
  throw new FitRefusal(
    'singular',
    `star ${star.name}: velocities of the ${body} alone fix ` +
      `${body === 'primary' ? 'd·q/(1+q)' : 'd/(1+q)'}, not the distance and the mass ratio ` +
      `apart — add the other body's velocities (a double-lined binary), a prior on distancePc (a ` +
      `parallax), or fix or give a prior to ${q}`,
    [q, 'distancePc'],
  );
}

/**
 * Photocentre positions scale the relative orbit by β − B (B = q/(1+q)): they need relative
 * positions to fix the orbit's size, and q from the velocities of a body, or q or β held, to tell
 * β from B.
 */
function refusePhotocentre(b: Built, star: CheckedStar): void {
  const { L } = b;
  const s = L.stars[0]!.slots;
  if (s.beta < 0) return;
  const beta = L.params[s.beta]!.name,
    q = L.params[s.q]!.name;
  if (!star.obs.some((m) => m.kind !== 'radial-velocity' && m.component === 'relative'))
    throw new FitRefusal(
      'singular',
      `star ${star.name}: photocentre positions give only a·(β − B), not the size of the orbit — ` +
        `add positions of the secondary relative to the primary (a resolved epoch)`,
      [beta],
    );
  const held = (j: number) => b.fixedMask[j] || b.priors.some((p) => p.index === j);
  const bodies = star.obs.some(
    (m) =>
      m.kind === 'radial-velocity' && (m.component === 'primary' || m.component === 'secondary'),
  );
  if (!bodies && !held(s.q) && !held(s.beta))
    throw new FitRefusal(
      'singular',
      `star ${star.name}: photocentre positions give β − q/(1+q), not ${beta} and ${q} apart — ` +
        `add velocities of a body, or fix or give a prior to one of them`,
      [beta, q],
    );
}

/** The light fraction that best scales the start's relative orbit onto the photocentre positions. */
function photocentreStart(L: Layout, t: Float64Array): number {
  const obs = L.stars[0]!.obs.filter((m) => m.component === 'photocentre');
  const c = predictBatch(
    starOrbit(L, t, 0),
    Float64Array.from(obs, (m) => m.jd),
  );
  let num = 0,
    den = 0;
  obs.forEach((m, i) => {
    num += m.value[0] * c.dRaMas[i]! + m.value[1] * c.dDecMas[i]!;
    den += c.dRaMas[i]! ** 2 + c.dDecMas[i]! ** 2;
  });
  const q = t[L.stars[0]!.slots.q]!;
  return Math.min(1, Math.max(0, (den > 0 ? num / den : 0) + q / (1 + q)));
}

/** Refuse when every epoch of a star sits within 0.5% of the orbit's phase (e.g. epochs one period apart). */
function refusePhases(
  name: string,
  jd: ArrayLike<number>,
  periodDays: number,
  periapsisJd: number,
): void {
  const ph = Array.from(jd, (t) => {
    const f = (t - periapsisJd) / periodDays;
    return f - Math.floor(f);
  }).sort((a, b) => a - b);
  let gap = 1 - ph[ph.length - 1]! + ph[0]!;
  for (let q = 1; q < ph.length; q++) gap = Math.max(gap, ph[q]! - ph[q - 1]!);
  if (1 - gap < 0.005) {
    throw new FitRefusal(
      'single-phase',
      `star ${name}: at a period of ${(periodDays / JULIAN_YEAR_DAYS).toPrecision(6)} yr all ` +
        `${ph.length} epochs fall at one orbital phase (within ${((1 - gap) * 100).toFixed(2)}% ` +
        `of the orbit); add epochs at other phases`,
      [name],
    );
  }
}

function refuseSinglePhase(L: Layout, theta: Float64Array): void {
  L.stars.forEach((s, k) => {
    const o = starOrbit(L, theta, k);
    refusePhases(s.name, s.jd, o.periodDays, o.periapsisJd);
  });
}

/** How LM takes its derivatives: analytic (the default), or by central differences (the benchmark's baseline). */
export type DerivativeMode = 'analytic' | 'finite-difference';

export function lmOn(
  b: Built,
  theta0: Float64Array,
  req: CheckedRequest,
  mode: DerivativeMode,
): { problem: Problem; lm: LmResult; theta: Float64Array } {
  for (let j = 0; j < theta0.length; j++) if (b.fixedMask[j]) theta0[j] = b.base[j]!;
  // Relativity factors start at general relativity's 1 (a grid node knows nothing of them).
  for (const j of [b.L.sys.fz, b.L.sys.fw]) if (j >= 0 && !b.fixedMask[j]) theta0[j] = 1;
  canonicalize(b.L, theta0);
  const analytic = makeProblem(b.L, theta0, b.free, b.priors);
  const problem = mode === 'analytic' ? analytic : finiteDifferenceProblem(analytic);
  const lm = levenbergMarquardt(
    problem,
    Float64Array.from(b.free, (j) => theta0[j]!),
    { loss: req.loss },
  );
  return { problem, lm, theta: problem.full(lm.x) };
}

/**
 * Move each star's T to the periapsis passage nearest the information-weighted centre of its
 * measurements (weights: each measurement's whitened ∂r/∂T², the information it carries on T), so
 * that T and its σ describe a passage the data cover. Exact: the model is unchanged, because T moves
 * by whole periods and ω₀ (referred to T) by as many precession steps.
 */
function nearDataPassages(r: ReturnType<typeof lmOn>): ReturnType<typeof lmOn> {
  const { problem, lm } = r;
  const { L, free } = problem;
  const { J } = problem.evaluate(lm.x, true);
  const nf = free.length;
  const theta = problem.full(lm.x);
  L.stars.forEach((s, k) => {
    const jT = free.indexOf(s.slots.T);
    if (jT < 0) return;
    let sw = 0,
      swt = 0,
      c = s.firstComponent;
    for (const m of s.obs) {
      const n = m.kind === 'radial-velocity' ? 1 : 2;
      let w = 0;
      for (let q = 0; q < n; q++) w += J![(c + q) * nf + jT]! ** 2;
      sw += w;
      swt += w * m.jd;
      c += n;
    }
    if (!(sw > 0)) return;
    const P = theta[s.slots.P]!;
    const turns = Math.round((swt / sw - theta[s.slots.T]!) / P);
    if (turns === 0) return;
    const o = starOrbit(L, theta, k);
    const step = o.relativity.precession ? prepare(o).precessionPerOrbitRad : 0;
    theta[s.slots.T] = theta[s.slots.T]! + turns * P;
    if (s.slots.arg >= 0) theta[s.slots.arg] = theta[s.slots.arg]! + turns * step;
  });
  const x = Float64Array.from(free, (j) => theta[j]!);
  return { problem, lm: { ...lm, x }, theta: problem.full(x) };
}

function covarianceOf(problem: Problem, lm: LmResult, req: CheckedRequest): number[][] {
  const { J } = problem.evaluate(lm.x, true);
  const names = problem.free.map((j) => problem.L.params[j]!.name);
  return covarianceFromJacobian(
    J!,
    problem.rows,
    problem.n,
    req.loss === 'huber' ? lm.weights : null,
    names,
  );
}

/** The start vector of a single-star layout from a grid node (exported for the benchmark). */
export function startFromNode(b: Built, node: GridNode): Float64Array {
  const { L } = b;
  const t = new Float64Array(L.params.length);
  const s = L.stars[0]!.slots;
  t[s.P] = node.periodDays;
  t[s.T] = node.periapsisJd;
  t[s.e] = node.e;
  if (s.A >= 0) {
    t[s.A] = node.A;
    t[s.B] = node.B;
    t[s.F] = node.F;
    t[s.G] = node.G;
  } else {
    const c = thieleInnesToCampbell(node);
    const flip = (node.signedDistancePc ?? 1) < 0 ? Math.PI : 0;
    if (s.a >= 0) t[s.a] = c.a;
    t[s.i] = c.iRad;
    t[s.node] = c.nodeRad + flip;
    t[s.arg] = c.argRad + flip;
  }
  const prior = (j: number) => b.priors.find((p) => p.index === j)?.mean;
  if (L.sys.d >= 0)
    t[L.sys.d] =
      node.signedDistancePc !== null ? Math.abs(node.signedDistancePc) : (prior(L.sys.d) ?? 1000);
  if (L.sys.gamma >= 0) t[L.sys.gamma] = node.gamma ?? 0;
  if (s.q >= 0) t[s.q] = node.massRatio ?? 1;
  if (s.beta >= 0) t[s.beta] = photocentreStart(L, t);
  if (L.sys.x0 >= 0) {
    t[L.sys.x0] = node.frame[0];
    t[L.sys.y0] = node.frame[1];
  }
  if (L.sys.vx >= 0) {
    t[L.sys.vx] = node.frame[2];
    t[L.sys.vy] = node.frame[3];
  }
  return t;
}

/**
 * Above this many measurements a star's grid search and multi-start LM use an even subset of this
 * size (`thinned`), and the best minimum found there is refined on all of them. Below it nothing
 * changes, so every reference check of the fit runs the full path.
 */
export const COARSE_EPOCHS = 1500;

/**
 * About `size` measurements spread evenly in time, each kind of each body (astrometry, velocities
 * of the relative orbit, the primary, the secondary) in proportion to its share and with at least
 * a few of each, so the subset has the full set's layout.
 */
export function thinned(obs: Observation[], size: number): Observation[] {
  const groups = new Map<string, Observation[]>();
  for (const m of obs) {
    const key = m.kind === 'radial-velocity' ? `rv ${m.component}` : 'astrometry';
    const g = groups.get(key);
    if (g) g.push(m);
    else groups.set(key, [m]);
  }
  return [...groups.values()].flatMap((g) => {
    g.sort((a, b) => a.jd - b.jd);
    const k = Math.min(g.length, Math.max(Math.round((size * g.length) / obs.length), 20));
    return Array.from({ length: k }, (_, q) => g[Math.floor(((q + 0.5) * g.length) / k)]!);
  });
}

/** Grid + LM for one star alone (its own distance and γ when it has velocities). */
export function solveStar(
  req: CheckedRequest,
  star: CheckedStar,
  strict: boolean,
  withCovariance = true,
  mode: DerivativeMode = 'analytic',
  coarseEpochs = COARSE_EPOCHS,
): Solution {
  const b = build(req, [star], strict);
  refuseEarly(star, 7);
  refuseOneBody(b, star);
  refusePhotocentre(b, star);
  refuseTooFew(b);
  const { periodDays, eccentricity } = searchRanges(b, star);
  // Data known to lie near the given start: one LM from it, no search.
  if (star.hints.startOnly && star.start)
    return finish(
      b,
      lmOn(b, startFromOrbit(b, star.start), req, mode),
      [periodDays],
      req,
      withCovariance,
    );
  // Many epochs: the search and the starts' LM run on an even subset, and only the best minimum
  // is refined on every measurement (the basin is the same; the grid's cost stops growing with n).
  const coarse =
    star.obs.length > coarseEpochs ? { ...star, obs: thinned(star.obs, coarseEpochs) } : null;
  const nodes = gridSearch((coarse ?? star).obs, {
    periodDays,
    eccentricity,
    frameOffset: req.frameOffset,
    frameDrift: req.frameDrift,
    frameEpochJd: b.L.frameEpochJd,
    keep: 5,
  });
  if (nodes.length === 0) {
    throw new FitRefusal(
      'no-start',
      `star ${star.name}: no orbit in the search ranges fits the measurements by linear least ` +
        `squares (too few distinct epochs, or fewer than two radial velocities)`,
      [star.name],
    );
  }
  const starts = nodes.map((node) => startFromNode(b, node));
  if (star.start) starts.push(withElements(b.L, 0, startFromNode(b, nodes[0]!), star.start));
  const bc = coarse ? build(req, [coarse], strict) : b;
  let best: ReturnType<typeof lmOn> | null = null;
  for (const t0 of starts) {
    const r = lmOn(bc, t0, req, mode);
    if (!best || r.lm.cost < best.lm.cost) best = r;
  }
  if (coarse) best = lmOn(b, Float64Array.from(best!.theta), req, mode);
  return finish(b, best!, [periodDays], req, withCovariance);
}

/** A single star's minimum, checked and dressed: passages near the data, and the covariance. */
function finish(
  b: Built,
  found: ReturnType<typeof lmOn>,
  periodRanges: RangeHint[],
  req: CheckedRequest,
  withCovariance: boolean,
): Solution {
  refuseSinglePhase(b.L, found.theta);
  const best = nearDataPassages(found);
  return {
    L: b.L,
    problem: best.problem,
    theta: best.theta,
    lm: best.lm,
    periodRanges,
    covariance: withCovariance ? covarianceOf(best.problem, best.lm, req) : [],
  };
}

/** The start vector of a single-star layout at a given orbit (`hints.start`): what a grid node would give. */
function startFromOrbit(b: Built, o: Orbit): Float64Array {
  const { L } = b;
  const t = thetaFromOrbit(L, o);
  const s = L.stars[0]!.slots;
  if (L.sys.d >= 0 && o.distancePc === null)
    t[L.sys.d] = b.priors.find((p) => p.index === L.sys.d)?.mean ?? 1000;
  if (s.q >= 0) t[s.q] = o.massRatio ?? 1;
  if (s.beta >= 0) t[s.beta] = o.lightFraction ?? photocentreStart(L, t);
  return t;
}

/**
 * The grid's period and eccentricity ranges: a fixed value alone (a fixed period is first checked
 * for phase coverage), else the star's hints, else half the epochs' span to twenty spans and
 * e ≤ 0.97.
 */
function searchRanges(
  b: Built,
  star: CheckedStar,
): { periodDays: RangeHint; eccentricity: RangeHint } {
  const { first, last } = epochExtent(star.obs.map((m) => m.jd));
  const span = Math.max(1, last - first);
  const fixedVal = (key: string) => {
    const j = b.L.params.findIndex((p) => p.key === key);
    return j >= 0 && b.fixedMask[j] ? b.base[j]! : null;
  };
  const pFix = fixedVal('periodYears'),
    eFix = fixedVal('eccentricity');
  if (pFix !== null)
    refusePhases(
      star.name,
      star.obs.map((m) => m.jd),
      pFix,
      0,
    );
  const hp = star.hints.periodYears;
  const periodDays =
    pFix !== null
      ? { min: pFix, max: pFix }
      : hp
        ? { min: hp.min * JULIAN_YEAR_DAYS, max: hp.max * JULIAN_YEAR_DAYS }
        : { min: span / 2, max: 20 * span };
  const eccentricity =
    eFix !== null ? { min: eFix, max: eFix } : (star.hints.eccentricity ?? { min: 0, max: 0.97 });
  return { periodDays, eccentricity };
}

/**
 * The full vector of a one-star layout at a known orbit: its elements, distance, γ and relativity
 * factors (the frame terms at 0). For forecasts, where the orbit is given rather than fitted.
 */
export function thetaFromOrbit(L: Layout, orbit: Orbit): Float64Array {
  const t = withElements(L, 0, new Float64Array(L.params.length), orbit);
  if (L.sys.d >= 0 && orbit.distancePc !== null) t[L.sys.d] = orbit.distancePc;
  if (L.sys.gamma >= 0) t[L.sys.gamma] = orbit.gammaKmS;
  if (L.sys.fz >= 0) t[L.sys.fz] = orbit.factors.redshiftFactor;
  if (L.sys.fw >= 0) t[L.sys.fw] = orbit.factors.precessionFactor;
  return t;
}

/** theta with star k's orbital elements taken from an orbit (the distance, γ and frame stay). */
function withElements(L: Layout, k: number, theta: Float64Array, o: Orbit): Float64Array {
  const t = Float64Array.from(theta);
  const s = L.stars[k]!.slots;
  t[s.P] = o.periodDays;
  t[s.T] = o.periapsisJd;
  t[s.e] = o.e;
  if (s.A >= 0) {
    const ti = campbellToThieleInnes(o.aMas, o.iRad, o.nodeRad, o.argRad);
    t[s.A] = ti.A;
    t[s.B] = ti.B;
    t[s.F] = ti.F;
    t[s.G] = ti.G;
    return t;
  }
  if (s.a >= 0) t[s.a] = o.aMas;
  t[s.i] = o.iRad;
  t[s.node] = o.nodeRad;
  t[s.arg] = o.argRad;
  return t;
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2]! : 0.5 * (s[s.length / 2 - 1]! + s[s.length / 2]!);
}

/** The fit of a request: one star alone, or all stars jointly around one primary. */
export function solve(req: CheckedRequest, mode: DerivativeMode = 'analytic'): Solution {
  if (req.stars.length === 1) return solveStar(req, req.stars[0]!, true, true, mode);
  // 1. The joint layout, refused at once when it has more free parameters than data.
  const b = build(req, req.stars, true);
  refuseTooFew(b);
  // 2. Each star alone, then a joint start from their medians (and one from the given orbits).
  const singles = req.stars.map((s) => solveStar(req, s, false, false, mode));
  const t = startFromSingles(b, singles);
  const starts: Float64Array[] = [t];
  if (req.stars.some((s) => s.start)) starts.push(startFromGiven(b, req, t));
  // 3. LM from each start; the lowest χ² whose covariance exists, else the lowest χ²'s refusal.
  const runs = starts.map((t0) => lmOn(b, t0, req, mode)).sort((x, y) => x.lm.cost - y.lm.cost);
  let firstError: unknown = null;
  for (const run of runs) {
    try {
      refuseSinglePhase(b.L, run.theta);
      const r = nearDataPassages(run);
      return {
        L: b.L,
        problem: r.problem,
        theta: r.theta,
        lm: r.lm,
        covariance: covarianceOf(r.problem, r.lm, req),
        periodRanges: singles.map((s) => s.periodRanges[0]!),
      };
    } catch (err) {
      firstError ??= err;
    }
  }
  throw firstError;
}

function refuseTooFew(b: Built): void {
  if (b.free.length > b.L.components + b.priors.length) {
    throw new FitRefusal(
      'too-few-measurements',
      `${b.L.components} measurement components and ${b.priors.length} priors for ` +
        `${b.free.length} free parameters — at least ${b.free.length} are needed`,
    );
  }
}

/**
 * A joint start from the single-star solutions: the distance (fixed, else the median of the
 * stars with velocities, else its prior's mean), each star's elements, the median of the masses
 * they imply at that distance, and the mean γ and frame terms.
 */
function startFromSingles(b: Built, singles: Solution[]): Float64Array {
  const { L } = b;
  const t = new Float64Array(L.params.length);
  const ds = singles.filter((s) => s.L.stars[0]!.hasRv).map((s) => s.theta[s.L.sys.d]!);
  const dPrior = b.priors.find((p) => p.index === L.sys.d)?.mean;
  const d0 = b.fixedMask[L.sys.d] ? b.base[L.sys.d]! : ds.length ? median(ds) : dPrior;
  if (d0 === undefined) {
    throw new FitRefusal(
      'singular',
      'the distance is not constrained: no star has radial velocities — add some, give distancePc a prior, or fix it',
      ['distancePc'],
    );
  }
  t[L.sys.d] = d0;
  const masses: number[] = [];
  singles.forEach((s, k) => {
    const o = starOrbit(s.L, s.theta, 0);
    const slots = L.stars[k]!.slots;
    t[slots.P] = o.periodDays;
    t[slots.T] = o.periapsisJd;
    t[slots.e] = o.e;
    t[slots.i] = o.iRad;
    t[slots.node] = o.nodeRad;
    t[slots.arg] = o.argRad;
    masses.push(massSolar(semiMajorAxisAu(o.aMas, d0), o.periodDays));
  });
  t[L.sys.M] = median(masses);
  const withRv = singles.filter((s) => s.L.sys.gamma >= 0);
  if (L.sys.gamma >= 0)
    t[L.sys.gamma] = withRv.reduce((a, s) => a + s.theta[s.L.sys.gamma]!, 0) / withRv.length;
  for (const key of ['x0', 'y0', 'vx', 'vy'] as const) {
    if (L.sys[key] >= 0)
      t[L.sys[key]] = singles.reduce((a, s) => a + s.theta[s.L.sys[key]]!, 0) / singles.length;
  }
  return t;
}

/** A joint start from the stars' starting orbits, with the distance, mass and γ they imply. */
function startFromGiven(b: Built, req: CheckedRequest, t: Float64Array): Float64Array {
  const { L } = b;
  const d0 = t[L.sys.d]!;
  let t2: Float64Array = Float64Array.from(t);
  req.stars.forEach((s, k) => {
    if (s.start) t2 = withElements(L, k, t2, s.start);
  });
  const given = req.stars.flatMap((s) => (s.start?.distancePc ? [s.start.distancePc] : []));
  const d2 = b.fixedMask[L.sys.d] ? d0 : given.length ? median(given) : d0;
  t2[L.sys.d] = d2;
  const implied = req.stars.flatMap((s) =>
    s.start ? [massSolar(semiMajorAxisAu(s.start.aMas, d2), s.start.periodDays)] : [],
  );
  t2[L.sys.M] = median(implied);
  const gammas = req.stars.flatMap((s) =>
    s.start?.distancePc !== undefined ? [s.start.gammaKmS] : [],
  );
  if (L.sys.gamma >= 0 && gammas.length) t2[L.sys.gamma] = median(gammas);
  return t2;
}
