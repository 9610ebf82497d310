/**
 * The coming periapsis passage of a target as the plans see it: its date and the linear 1σ of that
 * date (from the events engine's passage, not the fitted element T, which may belong to an earlier
 * passage), the gradient of the date over the information model's parameters (so a planned epoch's
 * effect on that σ is one Kalman update), the ± k σ window, and the probability that the date falls
 * within a stated time of an epoch (the coverage).
 */
import { findEventLoci, parameterJacobian, relocateEvent, type Orbit } from '../orbit/index.ts';
import { jdToIso } from '../time/index.ts';
import type { InformationModel } from './information.ts';

export interface Passage {
  /** Date of the passage (observed time), JD and ISO 8601 UTC. */
  jd: number;
  date: string;
  /** Linear 1σ of the date from the model's covariance, days; null with the nominal prior. */
  sigmaDays: number | null;
  /** ∂(date)/∂θ over the model's parameters, days per unit. */
  gradient: Float64Array;
  /** The window [date − kσ, date + kσ] (at least ± half a day), JD. */
  windowStartJd: number;
  windowEndJd: number;
}

/**
 * Passages whose window meets [startJd, endJd], soonest first.
 * @param k half-width of the window in σ, (0, 10]
 * @param covariance the model's covariance (n×n, row-major), for σ
 */
export function passagesIn(
  model: InformationModel,
  covariance: Float64Array,
  startJd: number,
  endJd: number,
  k: number,
): Passage[] {
  const orbit = model.orbit;
  const n = model.parameters.length;
  const pad = Math.min(orbit.periodDays, 400);
  const { loci } = findEventLoci(orbit, startJd - pad, endJd + pad, { kinds: ['periapsis'] });
  const sigmas = model.parameters.map((name, j) => ({
    name,
    sigma: Math.sqrt(Math.max(0, covariance[j * n + j]!)),
  }));
  const dates = (o: Orbit) => loci.map((l) => relocateEvent(o, l) ?? Number.NaN);
  const jds = dates(orbit);
  const J = parameterJacobian(orbit, sigmas, dates);
  const out: Passage[] = [];
  loci.forEach((_, i) => {
    const gradient = Float64Array.from(J, (row) => row[i]!);
    const v = quadratic(covariance, n, gradient);
    const sigmaDays = model.nominalPrior ? null : Math.sqrt(v);
    const half = Math.max(0.5, k * (sigmaDays ?? 0));
    const jd = jds[i]!;
    if (jd + half < startJd || jd - half > endJd) return;
    out.push({
      jd,
      date: jdToIso(jd),
      sigmaDays,
      gradient,
      windowStartJd: jd - half,
      windowEndJd: jd + half,
    });
  });
  return out;
}

/** gᵀ C g. */
export function quadratic(cov: Float64Array, n: number, g: Float64Array): number {
  let s = 0;
  for (let a = 0; a < n; a++) {
    if (g[a] === 0) continue;
    for (let b = 0; b < n; b++) s += g[a]! * cov[a * n + b]! * g[b]!;
  }
  return Math.max(0, s);
}

/** Standard normal cumulative distribution (erfc by Numerical Recipes' Chebyshev fit, |error| < 1.2e-7). */
export function normalCdf(z: number): number {
  const x = Math.abs(z) / Math.SQRT2;
  const t = 1 / (1 + 0.5 * x);
  const erfc =
    t *
    Math.exp(
      -x * x -
        1.26551223 +
        t *
          (1.00002368 +
            t *
              (0.37409196 +
                t *
                  (0.09678418 +
                    t *
                      (-0.18628806 +
                        t *
                          (0.27886807 +
                            t *
                              (-1.13520398 +
                                t * (1.48851587 + t * (-0.82215223 + t * 0.17087277)))))))),
    );
  return z >= 0 ? 1 - erfc / 2 : erfc / 2;
}

/**
 * Probability that a date distributed N(mean, σ²) lies within `withinDays` of one of the epochs:
 * the normal measure of the union of [e − w, e + w]. With σ null or 0, 1 when the mean itself is
 * covered, else 0.
 */
export function coverageProbability(
  meanJd: number,
  sigmaDays: number | null,
  epochsJd: readonly number[],
  withinDays: number,
): number {
  const iv = epochsJd
    .map((e) => [e - withinDays, e + withinDays] as const)
    .sort((a, b) => a[0] - b[0]);
  const merged: [number, number][] = [];
  for (const [a, b] of iv) {
    const last = merged[merged.length - 1];
    if (last && a <= last[1]) last[1] = Math.max(last[1], b);
    else merged.push([a, b]);
  }
  if (!sigmaDays) return merged.some(([a, b]) => meanJd >= a && meanJd <= b) ? 1 : 0;
  return merged.reduce(
    (p, [a, b]) => p + normalCdf((b - meanJd) / sigmaDays) - normalCdf((a - meanJd) / sigmaDays),
    0,
  );
}
