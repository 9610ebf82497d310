/**
 * What a computation may cost, checked before any work: each job's size from its inputs
 * (measurements × ensembleSize × rounds, targets × samples, nights × targets …) against a bound, and
 * a refusal naming the field, the value and the bound when it is beyond. One place for every
 * bound; README's "Bounds on work" table lists them. The bounds keep a job well inside the pool's time
 * limit on a small server (about 100 s at the bound on a busy 2-core machine; measured with
 * test/bench/jobs.bench.ts and the fit benchmarks).
 */
import { InputError } from '../science/errors.ts';
import type { Runner, TaskArgs, TaskName } from './tasks.ts';

export const COST_BOUNDS = {
  /** Measurements in one fit, over all its stars. */
  fitMeasurements: 200_000,
  /** Posterior sampling: measurements × ensembleSize × rounds (model evaluations of one row). */
  posteriorEvaluations: 10_000_000,
  /** One night's sky: targets × samples per night (window search plus altitude curve). */
  nightSamples: 500_000,
  /** A season's sky: targets × nights × samples per night. */
  seasonSamples: 60_000_000,
  /** A season plan: site-nights × targets. */
  seasonPlanNightTargets: 200_000,
  /** A night schedule: candidates × slots of the night. */
  scheduleCandidateSlots: 200_000,
  /** Ephemeris: epochs × Monte Carlo draws (1 without). */
  ephemerisEvaluations: 20_000_000,
  /** Events: orbits in the interval × Monte Carlo draws (1 without). */
  eventOrbitDraws: 2_000_000,
  /** A season's Monte Carlo: draws × (planned epochs + targets). */
  seasonDrawEpochs: 10_000_000,
  /** A relativity forecast: measurements + planned epochs (a Fisher matrix over each, like a fit step). */
  forecastRows: 200_000,
  /** A campaign's flags: targets × sites × days ahead (visibility sampled about monthly, periapsis windows). */
  flagTargetSiteDays: 20_000_000,
} as const;

type Bound = keyof typeof COST_BOUNDS;

function refuse(field: string, value: unknown, cost: number, bound: Bound, what: string): never {
  throw new InputError(
    field,
    value,
    `makes ${what} ${Math.round(cost).toLocaleString('en')}, beyond the bound of ` +
      `${COST_BOUNDS[bound].toLocaleString('en')} (${bound}); ask for less`,
  );
}

function within(field: string, value: unknown, cost: number, bound: Bound, what: string): void {
  if (cost > COST_BOUNDS[bound]) refuse(field, value, cost, bound, what);
}

const num = (x: unknown, fallback: number): number =>
  typeof x === 'number' && Number.isFinite(x) && x > 0 ? x : fallback;
const MINUTES_PER_DAY = 1440;
/** The sampler's ensemble when the request leaves it to the fit: 4 per free parameter, ≥ 16 (posterior.ts). */
const TYPICAL_ENSEMBLE_SIZE = 40;

/** The cost check of each task; tasks missing here are cheap by construction. */
function costOfFit(req: TaskArgs<'fitOrbits'>[0]): void {
  const m = (req.stars ?? []).reduce((s, st) => s + (st.measurements?.length ?? 0), 0);
  within('stars.measurements', m, m, 'fitMeasurements', 'the measurements');
  if (!req.posterior) return;
  const rounds = num(req.posterior.rounds, 2000);
  const members = num(req.posterior.ensembleSize, TYPICAL_ENSEMBLE_SIZE);
  within(
    'posterior.rounds',
    req.posterior.rounds ?? rounds,
    m * members * rounds,
    'posteriorEvaluations',
    `measurements × ensembleSize × rounds = ${m} × ${members} × ${rounds} =`,
  );
}

function costOfEphemeris(...[, jd, options = {}]: TaskArgs<'ephemeris'>): void {
  const draws = options.monteCarlo?.draws ?? 1;
  within(
    'monteCarlo.draws',
    draws,
    jd.length * draws,
    'ephemerisEvaluations',
    `epochs × draws = ${jd.length} × ${draws} =`,
  );
}

const CHECKS: { [K in TaskName]?: (...args: TaskArgs<K>) => void } = {
  forecastDetection(req) {
    const rows = req.measurements.length + req.plan.length;
    within(
      'measurements',
      req.measurements.length,
      rows,
      'forecastRows',
      `measurements + planned epochs = ${req.measurements.length} + ${req.plan.length} =`,
    );
  },
  computeFlags(targets, sites, options) {
    const lead = options?.leadDays ?? [];
    const days = num(lead[lead.length - 1], 365);
    within(
      'leadDays',
      days,
      targets.length * Math.max(1, sites.length) * days,
      'flagTargetSiteDays',
      `targets × sites × days ahead = ${targets.length} × ${sites.length} × ${Math.round(days)} =`,
    );
  },
  fitOrbits: costOfFit,
  fitPage: costOfFit,
  fitResidualsCsv: costOfFit,
  nightReport(_site, _date, targets, _limits, options = {}) {
    const step = num(options.stepMinutes, 5);
    const curve = num(options.curveStepMinutes, 10);
    const perTarget = MINUTES_PER_DAY / step + MINUTES_PER_DAY / curve;
    const field = step <= curve ? 'step' : 'curveStep';
    within(
      field,
      field === 'step' ? step : curve,
      targets.length * perTarget,
      'nightSamples',
      `targets × samples per night = ${targets.length} × ${Math.round(perTarget)} =`,
    );
  },
  seasonReport(_site, _year, targets, _limits, options = {}) {
    const step = num(options.stepMinutes, 5);
    const cost = targets.length * 366 * (MINUTES_PER_DAY / step);
    within(
      'stepMinutes',
      step,
      cost,
      'seasonSamples',
      `targets × nights × samples per night = ${targets.length} × 366 × ${Math.round(MINUTES_PER_DAY / step)} =`,
    );
  },
  seasonMonteCarlo(plan, _sites, targets, options) {
    const draws = num(options.draws, 1);
    const size = plan.epochs.length + targets.length;
    within(
      'draws',
      options.draws,
      draws * size,
      'seasonDrawEpochs',
      `draws × (planned epochs + targets) = ${draws} × ${size} =`,
    );
  },
  planSeason(startDate, endDate, sites, targets) {
    const days = Math.max(1, (Date.parse(endDate) - Date.parse(startDate)) / 86_400_000 + 1);
    const siteNights = sites.reduce((s, site) => s + (site.nights ? site.nights.length : days), 0);
    within(
      'endDate',
      endDate,
      siteNights * targets.length,
      'seasonPlanNightTargets',
      `site-nights × targets = ${Math.round(siteNights)} × ${targets.length} =`,
    );
  },
  scheduleNight(_site, _limits, _date, _targets, request) {
    const candidates = Array.isArray(request.candidates) ? request.candidates.length : 0;
    const slots = MINUTES_PER_DAY / num(request.slotMinutes, 5);
    within(
      'candidates',
      candidates,
      candidates * slots,
      'scheduleCandidateSlots',
      `candidates × slots = ${candidates} × ${Math.round(slots)} =`,
    );
  },
  ephemeris: costOfEphemeris,
  ephemerisCsv: costOfEphemeris,
  eventsWithUncertainty(orbit, startJd, endJd, options = {}) {
    const orbits = Math.max(1, (endJd - startJd) / orbit.periodDays);
    const draws = options.monteCarlo?.draws ?? 1;
    within(
      options.monteCarlo ? 'monteCarlo.draws' : 'end',
      options.monteCarlo ? draws : endJd,
      orbits * draws,
      'eventOrbitDraws',
      `orbits in the interval × draws = ${Math.round(orbits)} × ${draws} =`,
    );
  },
};

/** Check a job's cost (InputError → 422 when beyond its bound). */
export function checkCost<K extends TaskName>(name: K, ...args: TaskArgs<K>): void {
  (CHECKS[name] as ((...a: TaskArgs<K>) => void) | undefined)?.(...args);
}

/** `run` with every job costed first: nothing beyond a bound reaches a thread. */
export function costed(run: Runner): Runner {
  return (name, ...args) => {
    checkCost(name, ...args);
    return run(name, ...args);
  };
}
