/**
 * The demo's current solutions: the orbit engine's fits to the demo measurements (provenance
 * "fitted", with covariance). The Vesper Core stars are fitted one by one at the system's stated
 * distance (Ilex with its relativistic terms on), the Lantern Pair alone at its distance, the
 * Brindle Pair (double-lined) with its distance and mass ratio free, each
 * started from its entered orbit, as a stored fit is.
 *
 * The scenario is built relative to its anchor day, so a fit with its periapsis counted from that
 * day is the same on any day: the fits are kept in the repository (kept-fits.ts, written by
 * `npm run demo-fits`) and only shifted to the anchor at load, which keeps the first start quick.
 * test/store/demo-fits.test.ts re-fits and holds the kept values to the fresh ones.
 */
import {
  fitOrbits,
  type FitRequest,
  type StarHints,
  type StartInput,
} from '../../science/orbit/fit/index.ts';
import type { CampbellInput, OrbitInput } from '../../science/orbit/index.ts';
import { toCampbellInput, validateOrbit } from '../../science/orbit/index.ts';
import { parseEpoch } from '../../science/time/index.ts';
import type { MeasurementRow } from '../repos/measurements.ts';
import { describeKind } from '../../../descriptors/measurement-kinds.ts';
import { toInput } from '../fits.ts';
import type { DemoAnchor } from './scenario.ts';
import { KEPT_FITS } from './kept-fits.ts';

/** A demo star as the fits read it: its name, the orbit its measurements were drawn from, and those. */
export interface FitStar {
  name: string;
  orbit: OrbitInput;
  measurements: MeasurementRow[];
}

/**
 * A measurement as a kept fit saw it: its kind, its epoch in days from the anchor day's 0h UTC,
 * and its values in their kind's units (descriptors/measurement-kinds.ts order).
 */
export type KeptPoint = [kind: MeasurementRow['kind'], days: number, ...values: number[]];

/** A fitted solution with its periapsis counted in days from the anchor day's 0h UTC. */
export interface KeptSolution {
  name: string;
  /** The measurements it was fitted to, so a load can tell whether it still fits its own. */
  data: KeptPoint[];
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

/**
 * The demo's fits: one per star, the headline star with its relativistic terms. A star with a
 * solution in `from` (its kept fit at this anchor) starts there alone: its measurements differ
 * from the kept fit's by a few blocks, so the minimum is next to it and the search is not needed.
 */
function demoFitRequests(
  stars: FitStar[],
  from: Map<string, OrbitInput>,
): { names: string[]; request: FitRequest }[] {
  const star = (s: FitStar) => ({
    name: s.name,
    measurements: s.measurements.map(toInput),
    hints: from.has(s.name) ? startAt(from.get(s.name)!) : searchNear(s.orbit),
  });
  return stars.map((s) => {
    const relativity = s.orbit.relativity ?? {};
    const on = Object.values(relativity).some(Boolean);
    // A double-lined visual binary gives its own distance (the orbital parallax): left free.
    const doubleLined = s.measurements.some((m) => m.component !== 'relative');
    return {
      names: [s.name],
      request: on
        ? { stars: [star(s)], relativity: { ...relativity } }
        : doubleLined
          ? { stars: [star(s)] }
          : { stars: [star(s)], fixed: { distancePc: s.orbit.distancePc! } },
    };
  });
}

/** An orbit as a fit's start. */
function startOf(orbit: OrbitInput): StartInput {
  return {
    elements: toCampbellInput(validateOrbit(orbit)),
    ...(orbit.distancePc ? { distancePc: orbit.distancePc } : {}),
    systemicVelocityKmS: orbit.systemicVelocityKmS ?? 0,
    ...(orbit.massRatio !== undefined ? { massRatio: orbit.massRatio } : {}),
  };
}

/** Search near the entered orbit only (as a stored fit's defaults do, but narrower, for a quick fit). */
function searchNear(orbit: OrbitInput): StarHints {
  const { periodYears, eccentricity } = orbit.elements as CampbellInput;
  return {
    periodYears: { min: 0.97 * periodYears, max: 1.03 * periodYears },
    eccentricity: {
      min: Math.max(0, eccentricity - 0.05),
      max: Math.min(0.97, eccentricity + 0.05),
    },
    start: startOf(orbit),
  };
}

/** One LM from a kept solution, no search. */
function startAt(orbit: OrbitInput): StarHints {
  return { start: startOf(orbit), startOnly: true };
}

/**
 * The demo's fits run now, kept relative to the anchor (what `npm run demo-fits` writes); stars
 * with a solution in `from` start from it alone (demoFitRequests).
 */
export function fitDemo(
  stars: FitStar[],
  anchor: DemoAnchor,
  from = new Map<string, OrbitInput>(),
): KeptFits {
  const fits = demoFitRequests(stars, from).map(({ request }): KeptFit => {
    const result = fitOrbits(request);
    return {
      chi2: result.chi2,
      dof: result.dof,
      stars: result.stars.map((s) => {
        const { periapsis, ...elements } = s.orbit.elements as CampbellInput;
        return {
          name: s.name,
          data: stars.find((t) => t.name === s.name)!.measurements.map((m) => keptPoint(m, anchor)),
          periapsisDaysFromAnchor: parseEpoch(periapsis) - anchor.dayJd,
          orbit: { ...s.orbit, elements },
        };
      }),
    };
  });
  return { anchorDay: anchor.today, fits };
}

/** A stored measurement as a kept fit records it. */
function keptPoint(m: MeasurementRow, anchor: DemoAnchor): KeptPoint {
  const row = m as unknown as Record<string, number>;
  const values = describeKind(m.kind).values.map((v) => row[v.field]!);
  return [m.kind, m.epochJd - anchor.dayJd, ...values];
}

/** Epochs within this of the kept ones: the blocks follow each night's darkness, by minutes. */
const SAME_EPOCH_DAYS = 0.05;
/** Values within this fraction of their σ of the kept ones. */
const SAME_VALUE_SIGMA = 0.05;

/**
 * Whether a star's measurements at this anchor are, to the tolerances above, the ones its kept fit
 * was made from. They are not when a limit closes different blocks (the Moon keeps its own
 * calendar, not the anchor's), and then the star is fitted at load instead.
 */
function sameData(kept: KeptPoint[], rows: MeasurementRow[], anchor: DemoAnchor): boolean {
  if (kept.length !== rows.length) return false;
  return rows.every((m, i) => {
    const [kind, days, ...values] = kept[i]!;
    const [, nowDays, ...nowValues] = keptPoint(m, anchor);
    if (kind !== m.kind || Math.abs(days - nowDays) > SAME_EPOCH_DAYS) return false;
    return describeKind(m.kind).values.every((v, k) => {
      let d = nowValues[k]! - values[k]!;
      if (v.field === 'positionAngleDeg') d -= 360 * Math.round(d / 360);
      return Math.abs(d) <= SAME_VALUE_SIGMA * (m as unknown as Record<string, number>)[v.sigma]!;
    });
  });
}

/** A kept fit's solutions as orbit inputs at this anchor, with the reference to store beside them. */
function keptSolutions(kept: KeptFits, anchor: DemoAnchor, origin: string) {
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

const KEPT_ORIGIN = 'demo fit, kept relative to the anchor day (npm run demo-fits)';
const AT_LOAD = 'demo fit at load, started from the kept fit';

/**
 * The solutions to store as current, fit by fit: the kept one shifted to the anchor where its stars'
 * measurements are the ones it was made from, otherwise the fit run now; `fitNow` runs them all.
 * @throws Error when the kept fits do not cover the scenario's stars (run `npm run demo-fits`)
 */
export function demoSolutions(stars: FitStar[], anchor: DemoAnchor, fitNow: boolean) {
  const keptNames = KEPT_FITS.fits.flatMap((f) => f.stars.map((s) => s.name)).sort();
  const wanted = stars.map((s) => s.name).sort();
  if (!fitNow && keptNames.join() !== wanted.join())
    throw new Error(
      `the kept demo fits cover ${keptNames.join(', ')} but the scenario has ${wanted.join(', ')}: ` +
        `run npm run demo-fits`,
    );
  const fits = fitNow ? [] : KEPT_FITS.fits;
  const still = fits.filter((f) =>
    f.stars.every((k) =>
      sameData(k.data, stars.find((s) => s.name === k.name)!.measurements, anchor),
    ),
  );
  const keptStars = new Set(still.flatMap((f) => f.stars.map((s) => s.name)));
  const fresh = stars.filter((s) => !keptStars.has(s.name));
  // A star whose measurements moved starts from its kept fit at this anchor (fitNow: searches).
  const starts = new Map(
    keptSolutions({ anchorDay: KEPT_FITS.anchorDay, fits }, anchor, KEPT_ORIGIN).flatMap((f) =>
      f.solutions.map((s) => [s.name, s.orbit] as const),
    ),
  );
  return [
    ...keptSolutions({ anchorDay: KEPT_FITS.anchorDay, fits: still }, anchor, KEPT_ORIGIN),
    ...(fresh.length > 0 ? keptSolutions(fitDemo(fresh, anchor, starts), anchor, AT_LOAD) : []),
  ];
}
