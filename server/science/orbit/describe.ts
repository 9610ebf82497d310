/** What every orbit answer (HTTP or CLI) says about the orbit itself: both forms, physics, switches, factors. */
import { toCampbellInput, toThieleInnesInput } from './elements.ts';
import { physicalQuantities } from './physical.ts';
import type { Orbit } from './types.ts';

export function describeOrbit(orbit: Orbit) {
  return {
    campbell: toCampbellInput(orbit),
    thieleInnes: toThieleInnesInput(orbit),
    physical: orbit.distancePc === null ? null : physicalQuantities(orbit),
    relativity: orbit.relativity,
    relativityFactors: orbit.factors,
  };
}
