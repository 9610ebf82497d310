/**
 * The demo's current solutions: the orbit engine's fits to the demo measurements (provenance
 * "fitted", with covariance). The Vesper Core stars are fitted one by one at the system's stated
 * distance (Ilex with its relativistic terms on), the Lantern Pair alone at its distance, each
 * started from its entered orbit, as a stored fit is.
 *
 * The scenario is built relative to its anchor day, so a fit with its periapsis counted from that
 * day is the same on any day: the fits are kept in the repository (kept-fits.ts, written by
 * `npm run demo-fits`) and only shifted to the anchor at load, which keeps the first start quick.
 * test/store/demo-fits.test.ts re-fits and holds the kept values to the fresh ones.
 */
import { fitOrbits, type FitRequest } from '../../science/orbit/fit/index.ts';
import type { CampbellInput, OrbitInput } from '../../science/orbit/index.ts';
import { toCampbellInput, validateOrbit } from '../../science/orbit/index.ts';
import { parseEpoch } from '../../science/time/index.ts';
import type { MeasurementRow } from '../repos/measurements.ts';
import { toInput } from '../fits.ts';
import type { DemoAnchor } from './scenario.ts';
import { KEPT_FITS } from './kept-fits.ts';

/** A demo star as the fits read it: its name, the orbit its measurements were drawn from, and those. */
export interface FitStar {
  name: string;
  orbit: OrbitInput;
  measurements: MeasurementRow[];
}

/** A fitted solution with its periapsis counted in days from the anchor day's 0h UTC. */
export interface KeptSolution {
  name: string;
  periapsisDaysFromAnchor: number;
  orbit: Omit<OrbitInput, 'elements'> & { elements: Omit<CampbellInput, 'periapsis'> };
}

/** One fit of the demo: its stars' solutions and its χ². */
export interface KeptFit {
  chi2: number;
  dof: number;
  stars: KeptSolution[];
}

export interface KeptFits {
  /** The anchor day the fits were made at (YYYY-MM-DD); any other anchor shifts them as a whole. */
  anchorDay: string;
  fits: KeptFit[];
}

/** The demo's fits: one per star, the headline star with its relativistic terms. */
export function demoFitRequests(stars: FitStar[]): { names: string[]; request: FitRequest }[] {
  const star = (s: FitStar) => ({
    name: s.name,
    measurements: s.measurements.map(toInput),
    // Search near the entered orbit only (as a stored fit's defaults do, but narrower, for a quick fit).
    hints: {
      periodYears: {
        min: 0.97 * s.orbit.elements.periodYears!,
        max: 1.03 * s.orbit.elements.periodYears!,
      },
      eccentricity: {
        min: Math.max(0, s.orbit.elements.eccentricity! - 0.05),
        max: Math.min(0.97, s.orbit.elements.eccentricity! + 0.05),
      },
      start: {
        elements: toCampbellInput(validateOrbit(s.orbit)),
        ...(s.orbit.distancePc ? { distancePc: s.orbit.distancePc } : {}),
        systemicVelocityKmS: s.orbit.systemicVelocityKmS ?? 0,
      },
    },
  });
  return stars.map((s) => {
    const relativity = s.orbit.relativity ?? {};
    const on = Object.values(relativity).some(Boolean);
    return {
      names: [s.name],
      request: on
        ? { stars: [star(s)], relativity: { ...relativity } }
        : { stars: [star(s)], fixed: { distancePc: s.orbit.distancePc! } },
    };
  });
}

/** The demo's fits run now, kept relative to the anchor (what `npm run demo-fits` writes). */
export function fitDemo(stars: FitStar[], anchor: DemoAnchor): KeptFits {
  const fits = demoFitRequests(stars).map(({ request }): KeptFit => {
    const result = fitOrbits(request);
    return {
      chi2: result.chi2,
      dof: result.dof,
      stars: result.stars.map((s) => {
        const { periapsis, ...elements } = s.orbit.elements as CampbellInput;
        return {
          name: s.name,
          periapsisDaysFromAnchor: parseEpoch(periapsis) - anchor.dayJd,
          orbit: { ...s.orbit, elements },
        };
      }),
    };
  });
  return { anchorDay: anchor.today, fits };
}

/** A kept fit's solutions as orbit inputs at this anchor, with the reference to store beside them. */
export function keptSolutions(kept: KeptFits, anchor: DemoAnchor, origin: string) {
  return kept.fits.map((fit) => ({
    reference: `${origin}: χ² = ${fit.chi2.toFixed(1)} for ${fit.dof} degrees of freedom`,
    solutions: fit.stars.map((s) => ({
      name: s.name,
      orbit: {
        ...s.orbit,
        elements: {
          ...s.orbit.elements,
          periapsis: `JD ${(anchor.dayJd + s.periapsisDaysFromAnchor).toFixed(6)}`,
        },
      } satisfies OrbitInput,
    })),
  }));
}

/**
 * The solutions to store as current: the kept fits shifted to the anchor (default), or fits run now.
 * @throws Error when the kept fits do not cover the scenario's stars (run `npm run demo-fits`)
 */
export function demoSolutions(stars: FitStar[], anchor: DemoAnchor, fitNow: boolean) {
  const out = fitNow
    ? keptSolutions(fitDemo(stars, anchor), anchor, 'demo fit at load')
    : keptSolutions(
        KEPT_FITS,
        anchor,
        'demo fit, kept relative to the anchor day (npm run demo-fits)',
      );
  const names = out.flatMap((f) => f.solutions.map((s) => s.name)).sort();
  const wanted = stars.map((s) => s.name).sort();
  if (names.join() !== wanted.join())
    throw new Error(
      `the kept demo fits cover ${names.join(', ')} but the scenario has ${wanted.join(', ')}: run npm run demo-fits`,
    );
  return out;
}
