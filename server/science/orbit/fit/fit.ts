/**
 * Fit orbits to measurements: one star alone, or several stars around one primary jointly.
 * Pure: a request in, a result out; nothing is read or written.
 */
import { checkRequest } from './request.ts';
import { samplePosterior } from './posterior.ts';
import { assemble, type FitResult } from './result.ts';
import { solve } from './solve.ts';
import type { FitRequest } from './types.ts';

/**
 * Fit the request's stars (jointly when there are several: shared mass, distance, γ and frame).
 * @throws InputError for a malformed request (field, value, rule)
 * @throws FitRefusal when the data cannot constrain the model (what is missing is in the message)
 */
export function fitOrbits(request: FitRequest): FitResult {
  const req = checkRequest(request);
  const sol = solve(req);
  const rel = Object.values(req.relativity).some((v) => v);
  const result = assemble(
    sol,
    req,
    rel ? 'analytic (Keplerian part); relativistic terms by central differences' : 'analytic',
  );
  if (req.posterior) samplePosterior(sol, req, result);
  return result;
}
