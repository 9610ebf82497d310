/** What every orbit answer (HTTP or CLI) says about the orbit itself: both forms, physics, switches, factors. */
import { toCampbellInput, toThieleInnesInput } from './elements.ts';
import { binaryShares, physicalQuantities } from './physical.ts';
import type { Orbit } from './types.ts';

/** A binary of comparable masses: q, β and, with a distance, each body's mass and semi-amplitude. */
function describeBinary(orbit: Orbit) {
  if (orbit.massRatio === null) return null;
  const q = orbit.massRatio;
  const phys = orbit.distancePc === null ? null : physicalQuantities(orbit);
  const shares = phys ? binaryShares(phys.massSolar, phys.semiAmplitudeKmS, q) : null;
  return {
    massRatio: q,
    lightFraction: orbit.lightFraction,
    primaryMassSolar: shares?.primaryMassSolar ?? null,
    secondaryMassSolar: shares?.secondaryMassSolar ?? null,
    primarySemiAmplitudeKmS: shares?.primaryKmS ?? null,
    secondarySemiAmplitudeKmS: shares?.secondaryKmS ?? null,
  };
}

export function describeOrbit(orbit: Orbit) {
  return {
    campbell: toCampbellInput(orbit),
    thieleInnes: toThieleInnesInput(orbit),
    physical: orbit.distancePc === null ? null : physicalQuantities(orbit),
    relativity: orbit.relativity,
    relativityFactors: orbit.factors,
    binary: describeBinary(orbit),
  };
}
