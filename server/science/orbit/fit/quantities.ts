/**
 * What a fit reports for each star, in interface units, as one function of the parameter vector:
 * the Campbell elements and Thiele–Innes constants (whichever were fitted, the other derived), and
 * with a distance the physical quantities (mass by Kepler's third law, periapsis in au and in
 * Schwarzschild radii, K) and the next periapsis date. The covariance and the sampler's
 * percentiles of every quantity both come from this one function.
 */
import { C_M_PER_S, DEG, GM_SUN_M3_PER_S2, JULIAN_YEAR_DAYS, AU_M } from '../../constants.ts';
import { campbellToThieleInnes, mod } from '../elements.ts';
import { binaryShares, massParameterM3S2, semiAmplitudeKmS, semiMajorAxisAu } from '../physical.ts';
import { observedTime, prepare } from '../predict.ts';
import { type Layout, starOrbit } from './layout.ts';

export interface QuantityDesc {
  name: string;
  unit: string;
  angle: boolean;
}

const ELEMENTS: QuantityDesc[] = [
  { name: 'periodYears', unit: 'yr', angle: false },
  { name: 'periapsisDays', unit: 'JD (σ in days)', angle: false },
  { name: 'eccentricity', unit: '', angle: false },
  { name: 'semiMajorAxisArcsec', unit: 'arcsec', angle: false },
  { name: 'inclinationDeg', unit: 'deg', angle: false },
  { name: 'ascendingNodeDeg', unit: 'deg', angle: true },
  { name: 'argPeriapsisDeg', unit: 'deg', angle: true },
  { name: 'aArcsec', unit: 'arcsec', angle: false },
  { name: 'bArcsec', unit: 'arcsec', angle: false },
  { name: 'fArcsec', unit: 'arcsec', angle: false },
  { name: 'gArcsec', unit: 'arcsec', angle: false },
  { name: 'nextPeriapsisJd', unit: 'JD (σ in days)', angle: false },
];
const PHYSICAL: QuantityDesc[] = [
  { name: 'distancePc', unit: 'pc', angle: false },
  { name: 'systemicVelocityKmS', unit: 'km/s', angle: false },
  { name: 'semiMajorAxisAu', unit: 'au', angle: false },
  { name: 'massSolar', unit: 'M☉', angle: false },
  { name: 'periapsisAu', unit: 'au', angle: false },
  { name: 'periapsisSchwarzschildRadii', unit: 'R_s', angle: false },
  { name: 'semiAmplitudeKmS', unit: 'km/s', angle: false },
];

/** A binary of comparable masses: its mass ratio, and with a distance each body's mass and K. */
const MASS_RATIO: QuantityDesc = { name: 'massRatio', unit: 'M₂/M₁', angle: false };
const BINARY: QuantityDesc[] = [
  { name: 'primaryMassSolar', unit: 'M☉', angle: false },
  { name: 'secondaryMassSolar', unit: 'M☉', angle: false },
  { name: 'primarySemiAmplitudeKmS', unit: 'km/s', angle: false },
  { name: 'secondarySemiAmplitudeKmS', unit: 'km/s', angle: false },
];

/** The photocentre's light fraction. */
const LIGHT: QuantityDesc = { name: 'lightFraction', unit: 'L₂/(L₁+L₂)', angle: false };

/** The names (in order) of the quantities `starQuantities` returns (the same for every star of a fit). */
export function quantityNames(L: Layout): QuantityDesc[] {
  const d = L.sys.d >= 0;
  const q = L.stars.some((s) => s.slots.q >= 0);
  return [
    ...ELEMENTS,
    ...(d ? PHYSICAL : []),
    ...(q ? [MASS_RATIO, ...(d ? BINARY : [])] : []),
    ...(L.stars.some((s) => s.slots.beta >= 0) ? [LIGHT] : []),
  ];
}

/**
 * The quantities of star k at theta.
 * @param cycle the periapsis passage counted as "next": T + cycle·P (held fixed for derivatives)
 */
export function starQuantities(
  L: Layout,
  theta: ArrayLike<number>,
  k: number,
  cycle: number,
): Float64Array {
  const o = starOrbit(L, theta, k);
  const ti = campbellToThieleInnes(o.aMas / 1000, o.iRad, o.nodeRad, o.argRad);
  const tNext = o.periapsisJd + cycle * o.periodDays;
  const next = observedTime(prepare(o), tNext, 0);
  const out = [
    o.periodDays / JULIAN_YEAR_DAYS,
    o.periapsisJd,
    o.e,
    o.aMas / 1000,
    o.iRad / DEG,
    mod(o.nodeRad, 2 * Math.PI) / DEG,
    mod(o.argRad, 2 * Math.PI) / DEG,
    ti.A,
    ti.B,
    ti.F,
    ti.G,
    next,
  ];
  if (L.sys.d >= 0) {
    const d = o.distancePc!;
    const aAu = semiMajorAxisAu(o.aMas, d);
    const gm = massParameterM3S2(aAu, o.periodDays);
    const rsAu = (2 * gm) / (C_M_PER_S * C_M_PER_S) / AU_M;
    const kRel = semiAmplitudeKmS(aAu, o.periodDays, o.e, o.iRad);
    out.push(
      d,
      o.gammaKmS,
      aAu,
      gm / GM_SUN_M3_PER_S2,
      aAu * (1 - o.e),
      (aAu * (1 - o.e)) / rsAu,
      kRel,
    );
    const jq = L.stars[k]!.slots.q;
    if (jq >= 0) {
      const b = binaryShares(gm / GM_SUN_M3_PER_S2, kRel, theta[jq]!);
      out.push(theta[jq]!, b.primaryMassSolar, b.secondaryMassSolar, b.primaryKmS, b.secondaryKmS);
    }
  } else if (L.stars[k]!.slots.q >= 0) out.push(theta[L.stars[k]!.slots.q]!);
  if (L.stars[k]!.slots.beta >= 0) out.push(theta[L.stars[k]!.slots.beta]!);
  return Float64Array.from(out);
}

/** The passage after asOf: the smallest integer k with T + kP ≥ asOf. */
export function nextCycle(L: Layout, theta: ArrayLike<number>, k: number, asOfJd: number): number {
  const s = L.stars[k]!.slots;
  return Math.ceil((asOfJd - theta[s.T]!) / theta[s.P]!);
}
