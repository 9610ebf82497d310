/**
 * Predictions: where a star on a known orbit is on the sky, and how it moves, at given epochs.
 *
 * Batch first (Float64Array of JD in, a column of Float64Array per quantity out); the scalar
 * `predict` wraps it. Relativistic terms: their sizes are always reported when the distance is known;
 * they enter positions and the total radial velocity only when switched on for the orbit.
 */
import { AU_KM, C_KM_PER_S, DEG, JULIAN_YEAR_DAYS, SECONDS_PER_DAY, TWO_PI } from '../constants.ts';
import { jdToIso } from '../time/index.ts';
import { solveKepler, solveKeplerBatch, trueAnomalyFromEccentric } from './kepler.ts';
import { massParameterM3S2, photocentreShare, semiMajorAxisAu, velocityShare } from './physical.ts';
import {
  gravitationalRedshiftKmS,
  precessionPerOrbitRad,
  romerDelayDays,
  transverseDopplerKmS,
} from './relativity.ts';
import type { Orbit } from './types.ts';
import { AU_M } from '../constants.ts';

/** Columns of a batch prediction. 3-D and velocity columns are NaN when the orbit has no distance. */
export const PREDICTION_FIELDS = [
  'jd',
  'emissionJd',
  'meanAnomalyDeg',
  'eccentricAnomalyDeg',
  'trueAnomalyDeg',
  'dRaMas',
  'dDecMas',
  'separationMas',
  'positionAngleDeg',
  'vRaMasYr',
  'vDecMasYr',
  'separation3dAu',
  'speedKmS',
  'lineOfSightAu',
  'radialVelocityKmS',
  'keplerianRvKmS',
  'primaryRadialVelocityKmS',
  'secondaryRadialVelocityKmS',
  'photocentreDRaMas',
  'photocentreDDecMas',
  'romerDelayDays',
  'gravitationalRedshiftKmS',
  'transverseDopplerKmS',
  'precessionDeg',
] as const;
export type PredictionField = (typeof PREDICTION_FIELDS)[number];
export type PredictionColumns = Record<PredictionField, Float64Array>;

/** One prediction. Units are in the names; fields that need a distance are null without one. */
export interface Prediction {
  /** Observed instant (light reaching us), ISO 8601 UTC and JD. */
  epoch: string;
  jd: number;
  /**
   * True when `epoch` is an observed time with the light-time across the orbit (Rømer delay)
   * included; false when the orbit has the Rømer delay off, so that observed and emitted times are
   * the same clock.
   */
  lightTimeIncluded: boolean;
  /** When the light left the star (emission time), ISO 8601 UTC and JD: `epoch` minus the Rømer delay when it is on. */
  emissionEpoch: string;
  emissionJd: number;
  meanAnomalyDeg: number;
  eccentricAnomalyDeg: number;
  trueAnomalyDeg: number;
  /** Δα* = Δα·cos δ, east positive, mas. */
  dRaMas: number;
  /** Δδ, north positive, mas. */
  dDecMas: number;
  separationMas: number;
  /** Position angle, north through east, [0, 360) deg. */
  positionAngleDeg: number;
  vRaMasYr: number;
  vDecMasYr: number;
  separation3dAu: number | null;
  speedKmS: number | null;
  /** Line-of-sight position, au, positive behind the primary (away from us). */
  lineOfSightAu: number | null;
  /** Radial velocity with γ and every switched-on relativistic term, km/s, positive receding. */
  radialVelocityKmS: number | null;
  /** The Keplerian part alone (without γ), km/s. */
  keplerianRvKmS: number | null;
  /**
   * A binary of comparable masses (the orbit has a mass ratio q): the primary's velocity about the
   * barycentre, γ − q/(1+q)·v, with v the relative orbit's Keplerian velocity, km/s. Null without q
   * or a distance. No relativistic term: the barycentric model is Newtonian.
   */
  primaryRadialVelocityKmS: number | null;
  /** The secondary's velocity about the barycentre, γ + v/(1+q), km/s; null without q or a distance. */
  secondaryRadialVelocityKmS: number | null;
  /**
   * The photocentre of the unresolved pair from the barycentre, (β − B)·(Δα*, Δδ) with B = q/(1+q)
   * and β the light fraction, mas; null without both q and β.
   */
  photocentreDRaMas: number | null;
  photocentreDDecMas: number | null;
  /** Size of each relativistic term (included in the totals only when switched on). */
  romerDelayDays: number | null;
  gravitationalRedshiftKmS: number | null;
  transverseDopplerKmS: number | null;
  /** Schwarzschild precession of ω accumulated since the periapsis epoch T (by the angle swept), deg. */
  precessionDeg: number | null;
}

/** Per-orbit constants, computed once per batch. */
export interface Prepared {
  orbit: Orbit;
  n: number; // mean motion, rad/day
  sq: number; // √(1 − e²)
  cn: number;
  sn: number;
  ci: number;
  si: number;
  aAu: number; // NaN without a distance
  gm: number; // m³/s², NaN without a distance
  /** Δω per orbit × the precession factor, rad; 0 without a distance. */
  precessionPerOrbitRad: number;
}

export function prepare(orbit: Orbit): Prepared {
  const hasD = orbit.distancePc !== null;
  const aAu = hasD ? semiMajorAxisAu(orbit.aMas, orbit.distancePc!) : Number.NaN;
  const gm = hasD ? massParameterM3S2(aAu, orbit.periodDays) : Number.NaN;
  return {
    orbit,
    n: TWO_PI / orbit.periodDays,
    sq: Math.sqrt(1 - orbit.e * orbit.e),
    cn: Math.cos(orbit.nodeRad),
    sn: Math.sin(orbit.nodeRad),
    ci: Math.cos(orbit.iRad),
    si: Math.sin(orbit.iRad),
    aAu,
    gm,
    precessionPerOrbitRad: hasD
      ? orbit.factors.precessionFactor * precessionPerOrbitRad(gm, aAu * AU_M, orbit.e)
      : 0,
  };
}

export function allocateColumns(n: number): PredictionColumns {
  const out = {} as PredictionColumns;
  for (const f of PREDICTION_FIELDS) out[f] = new Float64Array(n);
  return out;
}

/**
 * The true anomaly counted on across orbits from the passage T (rad): 2π·k + ν in orbit k. E may be
 * reduced to one turn or not; the turn is read from the emission time tEm.
 */
export function continuousTrueAnomaly(p: Prepared, tEm: number, E: number): number {
  const o = p.orbit;
  const turnsOfE = Math.round((p.n * (tEm - o.periapsisJd) - (E - o.e * Math.sin(E))) / TWO_PI);
  const Etotal = E + turnsOfE * TWO_PI;
  const k = Math.round(Etotal / TWO_PI);
  return k * TWO_PI + trueAnomalyFromEccentric(Etotal - k * TWO_PI, o.e);
}

/**
 * Schwarzschild advance of ω accumulated since T (rad): Δω·ν_total/2π, the angle swept, so that it
 * happens where the orbit turns fastest (near periapsis), as in the first post-Newtonian motion.
 */
function precessionSinceT(p: Prepared, tEm: number, E: number): number {
  return p.precessionPerOrbitRad === 0
    ? 0
    : (p.precessionPerOrbitRad * continuousTrueAnomaly(p, tEm, E)) / TWO_PI;
}

/** Argument of periapsis at emission time tEm (rad), with precession when switched on. */
function argAt(p: Prepared, tEm: number, E: number): number {
  return p.orbit.relativity.precession
    ? p.orbit.argRad + precessionSinceT(p, tEm, E)
    : p.orbit.argRad;
}

/** Line-of-sight position (au) at emission time tEm with eccentric anomaly E. */
function lineOfSightAu(p: Prepared, tEm: number, E: number): number {
  const w = argAt(p, tEm, E);
  return (
    p.aAu * p.si * ((Math.cos(E) - p.orbit.e) * Math.sin(w) + p.sq * Math.sin(E) * Math.cos(w))
  );
}

/** Emission time and E for an observed time: t_obs = t_em + z(t_em)/c when Rømer delay is on. */
export function emissionState(p: Prepared, tObs: number): { tEm: number; E: number } {
  const o = p.orbit;
  let tEm = tObs;
  let E = solveKepler(p.n * (tEm - o.periapsisJd), o.e);
  if (!o.relativity.romer) return { tEm, E };
  for (let it = 0; it < 8; it++) {
    const next = tObs - romerDelayDays(lineOfSightAu(p, tEm, E));
    const done = Math.abs(next - tEm) < 1e-10;
    tEm = next;
    E = solveKepler(p.n * (tEm - o.periapsisJd), o.e);
    if (done) break;
  }
  return { tEm, E };
}

/** Observed time of emission time tEm with eccentric anomaly E. */
export function observedTime(p: Prepared, tEm: number, E: number): number {
  return p.orbit.relativity.romer ? tEm + romerDelayDays(lineOfSightAu(p, tEm, E)) : tEm;
}

/** Write every column at index i for the state at emission time tEm, eccentric anomaly E, observed at tObs. */
export function writeState(
  p: Prepared,
  tObs: number,
  tEm: number,
  E: number,
  c: PredictionColumns,
  i: number,
): void {
  // Hot kernel (once per epoch and orbit, inside batch predictions and every fit evaluation):
  // one straight pass, no allocation. Steps: 1. position in the orbital plane and its rate;
  // 2. ω with the precession swept so far, Thiele–Innes constants, sky offsets; 3. anomalies and
  // position angle into the columns; 4. sky velocities with ω̇ and the light-time clock; 5. the
  // photocentre; 6. with a distance, the 3-D quantities and the radial velocity with its terms.
  const o = p.orbit;
  const e = o.e;
  // 1. The orbital plane: X, Y and their rates.
  const cosE = Math.cos(E),
    sinE = Math.sin(E);
  const X = cosE - e,
    Y = p.sq * sinE;
  const Edot = p.n / (1 - e * cosE); // rad/day
  const Xd = -sinE * Edot,
    Yd = p.sq * cosE * Edot; // per day
  // 2. ω with the precession swept since T; A, B, F, G and the offsets.
  const dOmega = precessionSinceT(p, tEm, E);
  const w = o.relativity.precession ? o.argRad + dOmega : o.argRad;
  const cw = Math.cos(w),
    sw = Math.sin(w);
  const a = o.aMas;
  const A = a * (cw * p.cn - sw * p.sn * p.ci);
  const B = a * (cw * p.sn + sw * p.cn * p.ci);
  const F = a * (-sw * p.cn - cw * p.sn * p.ci);
  const G = a * (-sw * p.sn + cw * p.cn * p.ci);
  const dDec = A * X + F * Y;
  const dRa = B * X + G * Y;
  // 3. Anomalies in [0, 2π) and the position angle in [0°, 360°).
  let M = (E - e * sinE) % TWO_PI;
  if (M < 0) M += TWO_PI;
  let nu = trueAnomalyFromEccentric(E, e);
  if (nu < 0) nu += TWO_PI;
  let Ered = E % TWO_PI;
  if (Ered < 0) Ered += TWO_PI;
  let pa = Math.atan2(dRa, dDec) / DEG;
  if (pa < 0) pa += 360;
  c.jd[i] = tObs;
  c.emissionJd[i] = tEm;
  c.meanAnomalyDeg[i] = M / DEG;
  c.eccentricAnomalyDeg[i] = Ered / DEG;
  c.trueAnomalyDeg[i] = nu / DEG;
  c.dRaMas[i] = dRa;
  c.dDecMas[i] = dDec;
  c.separationMas[i] = Math.hypot(dRa, dDec);
  c.positionAngleDeg[i] = pa;
  // 4. Sky velocities.
  const aAu = p.aAu;
  // ω turns with ν when precession is on: ω̇ = (Δω/2π)·ν̇, ν̇ = n√(1−e²)/(1 − e cos E)². In the
  // orbital plane the velocity is then R(ω)·(Ẋ − ω̇Y, Ẏ + ω̇X): ∂A/∂ω = F, ∂F/∂ω = −A (B, G alike).
  const wd = o.relativity.precession
    ? ((p.precessionPerOrbitRad / TWO_PI) * p.n * p.sq) / ((1 - e * cosE) * (1 - e * cosE))
    : 0;
  const Xp = Xd - wd * Y,
    Yp = Yd + wd * X;
  // Light-time compresses the observed clock: dt_em/dt_obs = 1/(1 + v_z/c).
  const zdotAuDay = aAu * p.si * (Xp * sw + Yp * cw);
  const vzKmS = (zdotAuDay * AU_KM) / SECONDS_PER_DAY;
  const clock = o.relativity.romer ? 1 / (1 + vzKmS / C_KM_PER_S) : 1;
  c.vRaMasYr[i] = (B * Xp + G * Yp) * JULIAN_YEAR_DAYS * clock;
  c.vDecMasYr[i] = (A * Xp + F * Yp) * JULIAN_YEAR_DAYS * clock;
  // 5. The photocentre of an unresolved pair, (β − B) times the relative offset.
  const q = o.massRatio ?? Number.NaN;
  const light = photocentreShare(q, o.lightFraction ?? Number.NaN).share;
  c.photocentreDRaMas[i] = light * dRa;
  c.photocentreDDecMas[i] = light * dDec;
  if (o.distancePc === null) {
    c.separation3dAu[i] = c.speedKmS[i] = c.lineOfSightAu[i] = c.radialVelocityKmS[i] = Number.NaN;
    c.keplerianRvKmS[i] = c.romerDelayDays[i] = c.gravitationalRedshiftKmS[i] = Number.NaN;
    c.transverseDopplerKmS[i] = c.precessionDeg[i] = Number.NaN;
    c.primaryRadialVelocityKmS[i] = c.secondaryRadialVelocityKmS[i] = Number.NaN;
    return;
  }
  // 6. With a distance: r, z, speed, each body's velocity, and the relativistic terms.
  const rAu = aAu * (1 - e * cosE);
  const zAu = aAu * p.si * (X * sw + Y * cw);
  const speed = (aAu * Math.hypot(Xp, Yp) * AU_KM) / SECONDS_PER_DAY;
  const gr = o.factors.redshiftFactor * gravitationalRedshiftKmS(p.gm, rAu * AU_M);
  const td = o.factors.redshiftFactor * transverseDopplerKmS(speed);
  c.separation3dAu[i] = rAu;
  c.speedKmS[i] = speed;
  c.lineOfSightAu[i] = zAu;
  c.keplerianRvKmS[i] = vzKmS;
  c.primaryRadialVelocityKmS[i] = o.gammaKmS + velocityShare('primary', q)[0] * vzKmS;
  c.secondaryRadialVelocityKmS[i] = o.gammaKmS + velocityShare('secondary', q)[0] * vzKmS;
  c.radialVelocityKmS[i] =
    o.gammaKmS +
    vzKmS +
    (o.relativity.gravitationalRedshift ? gr : 0) +
    (o.relativity.transverseDoppler ? td : 0);
  c.romerDelayDays[i] = romerDelayDays(zAu);
  c.gravitationalRedshiftKmS[i] = gr;
  c.transverseDopplerKmS[i] = td;
  c.precessionDeg[i] = dOmega / DEG;
}

/**
 * Predict at many observed epochs.
 * @param jd observed epochs, Julian Date (UTC)
 * @returns one Float64Array per field of PREDICTION_FIELDS, same length as jd
 */
export function predictBatch(
  orbit: Orbit,
  jd: Float64Array,
  out: PredictionColumns = allocateColumns(jd.length),
): PredictionColumns {
  const p = prepare(orbit);
  if (orbit.relativity.romer) {
    // Each epoch has its own light-time fixed point.
    for (let i = 0; i < jd.length; i++) {
      const tObs = jd[i]!;
      const { tEm, E } = emissionState(p, tObs);
      writeState(p, tObs, tEm, E, out, i);
    }
    return out;
  }
  // Without light time, one batch Kepler solve serves every epoch (the anomaly columns are scratch space).
  const M = out.meanAnomalyDeg;
  for (let i = 0; i < jd.length; i++) M[i] = p.n * (jd[i]! - orbit.periapsisJd);
  const E = solveKeplerBatch(M, orbit.e, out.eccentricAnomalyDeg);
  for (let i = 0; i < jd.length; i++) writeState(p, jd[i]!, jd[i]!, E[i]!, out, i);
  return out;
}

/** Row i of a batch as a Prediction object; `lightTime`: whether the orbit has the Rømer delay on. */
export function rowOf(c: PredictionColumns, i: number, lightTime: boolean): Prediction {
  const opt = (x: number) => (Number.isNaN(x) ? null : x);
  return {
    epoch: jdToIso(c.jd[i]!),
    jd: c.jd[i]!,
    lightTimeIncluded: lightTime,
    emissionEpoch: jdToIso(c.emissionJd[i]!),
    emissionJd: c.emissionJd[i]!,
    meanAnomalyDeg: c.meanAnomalyDeg[i]!,
    eccentricAnomalyDeg: c.eccentricAnomalyDeg[i]!,
    trueAnomalyDeg: c.trueAnomalyDeg[i]!,
    dRaMas: c.dRaMas[i]!,
    dDecMas: c.dDecMas[i]!,
    separationMas: c.separationMas[i]!,
    positionAngleDeg: c.positionAngleDeg[i]!,
    vRaMasYr: c.vRaMasYr[i]!,
    vDecMasYr: c.vDecMasYr[i]!,
    separation3dAu: opt(c.separation3dAu[i]!),
    speedKmS: opt(c.speedKmS[i]!),
    lineOfSightAu: opt(c.lineOfSightAu[i]!),
    radialVelocityKmS: opt(c.radialVelocityKmS[i]!),
    keplerianRvKmS: opt(c.keplerianRvKmS[i]!),
    primaryRadialVelocityKmS: opt(c.primaryRadialVelocityKmS[i]!),
    secondaryRadialVelocityKmS: opt(c.secondaryRadialVelocityKmS[i]!),
    photocentreDRaMas: opt(c.photocentreDRaMas[i]!),
    photocentreDDecMas: opt(c.photocentreDDecMas[i]!),
    romerDelayDays: opt(c.romerDelayDays[i]!),
    gravitationalRedshiftKmS: opt(c.gravitationalRedshiftKmS[i]!),
    transverseDopplerKmS: opt(c.transverseDopplerKmS[i]!),
    precessionDeg: opt(c.precessionDeg[i]!),
  };
}

/** Scalar wrapper: the prediction at one observed epoch (JD). */
export function predict(orbit: Orbit, jd: number): Prediction {
  return rowOf(predictBatch(orbit, Float64Array.of(jd)), 0, orbit.relativity.romer);
}
